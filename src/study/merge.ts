/**
 * Join the outputs of the shards of one study into the files a single-machine run would have written:
 * the same points.jsonl lines byte for byte, and points.csv rebuilt from them by the same formatter.
 */
import { existsSync, mkdirSync, renameSync, rmSync, openSync, closeSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../core/errors.js';
import { CSV_FILE, JSONL_FILE, MANIFEST_FILE, isMissingOrEmptyDir, readLines, rowIndex, studyIdentity, writeNewFileAtomic, type StudyManifest } from './output.js';
import { csvHeader, csvLine, rowLayout, VERDICTS_PREFIX, type RowLayout } from './rows.js';
import { readManifest } from './sweep.js';

export interface MergeSummary {
  outDir: string;
  points: number;
  shards: number;
  manifest: StudyManifest;
}

export function layoutFromManifest(manifest: StudyManifest, where: string): RowLayout {
  const groupCount = manifest.columns.filter((column) => /^modules\[\d+\]\.label$/.test(column)).length;
  const checkIds = manifest.columns.filter((column) => column.startsWith(VERDICTS_PREFIX)).map((column) => column.slice(VERDICTS_PREFIX.length));
  const layout = rowLayout(manifest.vary.map((axis) => axis.path), groupCount, checkIds);
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
