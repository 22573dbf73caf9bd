/**
 * Join the outputs of the shards of one study into the files a single-machine run would have written:
 * the same points.jsonl lines byte for byte, and points.csv rebuilt from them by the same formatter.
 */
import { existsSync, mkdirSync, renameSync, rmSync, openSync, closeSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../core/errors.js';
import { CSV_FILE, JSONL_FILE, MANIFEST_FILE, forEachLine, isMissingOrEmptyDir, readLines, rowIndex, studyIdentity, writeNewFileAtomic, type StudyManifest } from './output.js';
import { csvHeader, csvLine, EFFECT_COLUMNS, rowLayout, UNCERTAINTY_COLUMNS, VERDICTS_PREFIX, type RowLayout } from './rows.js';
import { readManifest, shardPositions } from './sweep.js';

export interface MergeSummary {
  outDir: string;
  points: number;
  shards: number;
  manifest: StudyManifest;
}

export function layoutFromManifest(manifest: StudyManifest, where: string): RowLayout {
  const groupCount = manifest.columns.filter((column) => /^modules\[\d+\]\.label$/.test(column)).length;
  const checkIds = manifest.columns.filter((column) => column.startsWith(VERDICTS_PREFIX)).map((column) => column.slice(VERDICTS_PREFIX.length));
  const effects = EFFECT_COLUMNS.filter((column) => manifest.columns.includes(column));
  const layout = rowLayout(manifest.vary.map((axis) => axis.path), groupCount, checkIds, manifest.columns.includes(UNCERTAINTY_COLUMNS[0]!), effects);
  if (JSON.stringify(layout.columns) !== JSON.stringify(manifest.columns)) {
    throw new InputError(where, 'its columns are not those this version of railpulse writes; merge with the version that ran it');
  }
  return layout;
}

function differences(a: StudyManifest, b: StudyManifest): string {
  const parts: string[] = [];
  if (a.scenario.sha256 !== b.scenario.sha256) parts.push('scenario file (sha256)');
  if (JSON.stringify(a.vary) !== JSON.stringify(b.vary)) parts.push('--vary');
  if (JSON.stringify(a.design) !== JSON.stringify(b.design)) parts.push('design/samples/seed');
  if (a.points !== b.points) parts.push('point count');
  return parts.join(', ') || 'columns';
}

interface Stream {
  dir: string;
  lines: Generator<string>;
  line: string | undefined;
  index: number;
}

function advance(stream: Stream): void {
  const next = stream.lines.next();
  const previous = stream.index;
  stream.line = next.done ? undefined : next.value;
  if (stream.line === undefined) return;
  const index = rowIndex(stream.line);
  if (index === undefined) throw new InputError(join(stream.dir, JSONL_FILE), `a row after index ${previous} has no index`);
  if (index <= previous) throw new InputError(join(stream.dir, JSONL_FILE), `index ${index} follows ${previous}; rows are not in index order`);
  stream.index = index;
}

/** Complete rows in a shard's points.jsonl (a row cut short by a kill is not one). */
function completeRows(dir: string): number {
  const path = join(dir, JSONL_FILE);
  if (!existsSync(path)) return 0;
  let rows = 0;
  forEachLine(path, () => {
    rows += 1;
  });
  return rows;
}

/** "3, 7, 11, … 99" for the indices a shard lacks (its rows are a prefix of its round-robin positions). */
function missingList(first: number, step: number, from: number, to: number): string {
  const shown: number[] = [];
  for (let k = from; k < to && shown.length < 4; k += 1) shown.push(first + k * step);
  const last = first + (to - 1) * step;
  return to - from > shown.length ? `${shown.join(', ')}, … ${last}` : shown.join(', ');
}

/**
 * Before anything is merged, say which shard lacks which points (a cancelled, failed or timed-out array task), and
 * which shards of the split are not among the folders given: the user resubmits exactly those and merges again.
 */
function checkShardCoverage(dirs: readonly string[], manifests: readonly StudyManifest[]): void {
  const problems: string[] = [];
  const byIndex = new Map<number, string>();
  let count: number | null = null;
  manifests.forEach((manifest, i) => {
    const shard = manifest.shard;
    const dir = dirs[i]!;
    if (!shard) return;
    if (count !== null && shard.count !== count) throw new InputError(dir, `is shard ${shard.index} of ${shard.count}, the others are of ${count}; merge the shards of one split`);
    count = shard.count;
    const other = byIndex.get(shard.index);
    if (other !== undefined) throw new InputError(dir, `is shard ${shard.index}/${shard.count} like ${other}; give each shard once`);
    byIndex.set(shard.index, dir);
    const positions = shardPositions(manifest.points, shard);
    const rows = completeRows(dir);
    if (rows < positions.length) {
      problems.push(`shard ${shard.index}/${shard.count} (${dir}) has ${rows} of its ${positions.length} points, lacking ${positions.length - rows} (indices ${missingList(positions.first, positions.step, rows, positions.length)})`);
    }
  });
  if (count !== null) {
    const absent: number[] = [];
    for (let index = 1; index <= count; index += 1) if (!byIndex.has(index)) absent.push(index);
    if (absent.length > 0) problems.push(`shard${absent.length === 1 ? '' : 's'} ${absent.map((index) => `${index}/${count}`).join(', ')} ${absent.length === 1 ? 'is' : 'are'} not among the folders given`);
  }
  if (problems.length > 0) {
    throw new InputError('merge', `${problems.join('; ')}. Finish them (run the same sweep command again, or resubmit those array tasks: a shard continues where it stopped) and merge again`);
  }
}

export function merge(dirs: readonly string[], outDir: string): MergeSummary {
  if (dirs.length === 0) throw new InputError('merge', 'give the study directories to merge');
  const manifests = dirs.map((dir) => readManifest(dir));
  const first = manifests[0]!;
  manifests.forEach((manifest, i) => {
    if (studyIdentity(manifest) !== studyIdentity(first)) {
      throw new InputError(dirs[i]!, `is a different study from ${dirs[0]} (${differences(first, manifest)} differ)`);
    }
  });
  const layout = layoutFromManifest(first, dirs[0]!);
  checkShardCoverage(dirs, manifests);
  if (!isMissingOrEmptyDir(outDir)) throw new InputError('--out', `${outDir} exists and is not empty; railpulse never overwrites a study`);
  mkdirSync(outDir, { recursive: true });

  const streams: Stream[] = dirs.map((dir) => {
    const path = join(dir, JSONL_FILE);
    if (!existsSync(path)) throw new InputError(dir, `has no ${JSONL_FILE}`);
    const stream: Stream = { dir, lines: readLines(path), line: undefined, index: -1 };
    advance(stream);
    return stream;
  });
  const temporary = { csv: join(outDir, `.${CSV_FILE}.tmp`), json: join(outDir, `.${JSONL_FILE}.tmp`) };
  const csvFd = openSync(temporary.csv, 'wx');
  const jsonFd = openSync(temporary.json, 'wx');
  try {
    writeSync(csvFd, csvHeader(layout));
    let expected = 0;
    let lastDir = '';
    let csvText = '';
    let jsonText = '';
    for (;;) {
      let next: Stream | undefined;
      for (const stream of streams) if (stream.line !== undefined && (!next || stream.index < next.index)) next = stream;
      if (!next) break;
      if (next.index < expected) throw new InputError(next.dir, `point ${next.index} is also in ${lastDir}; every point must be in exactly one shard`);
      if (next.index > expected) throw new InputError('merge', `point ${expected} is in none of the shards (${dirs.join(', ')})`);
      if (next.index >= first.points) throw new InputError(next.dir, `point ${next.index} is beyond the study's ${first.points} points`);
      jsonText += `${next.line}\n`;
      csvText += csvLine(layout, JSON.parse(next.line!) as Record<string, unknown>);
      if (jsonText.length > 1 << 20) {
        writeSync(csvFd, csvText);
        writeSync(jsonFd, jsonText);
        csvText = jsonText = '';
      }
      lastDir = next.dir;
      expected += 1;
      advance(next);
    }
    if (expected < first.points) throw new InputError('merge', `point ${expected} is in none of the shards (${dirs.join(', ')})`);
    writeSync(csvFd, csvText);
    writeSync(jsonFd, jsonText);
  } catch (error) {
    closeSync(csvFd);
    closeSync(jsonFd);
    rmSync(temporary.csv, { force: true });
    rmSync(temporary.json, { force: true });
    throw error;
  }
  closeSync(csvFd);
  closeSync(jsonFd);
  const manifest: StudyManifest = { ...first, shard: null, created: new Date().toISOString(), mergedFrom: [...dirs] };
  writeNewFileAtomic(join(outDir, MANIFEST_FILE), `${JSON.stringify(manifest, null, 2)}\n`);
  renameSync(temporary.json, join(outDir, JSONL_FILE));
  renameSync(temporary.csv, join(outDir, CSV_FILE));
  return { outDir, points: first.points, shards: dirs.length, manifest };
}
