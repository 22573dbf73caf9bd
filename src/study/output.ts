/**
 * Files of a study directory: the manifest (study.json), points.csv and points.jsonl. Files are created
 * atomically and never overwritten; the points files only grow, one flushed batch at a time.
 */
import { closeSync, existsSync, ftruncateSync, linkSync, openSync, readdirSync, readSync, renameSync, unlinkSync, writeFileSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { createHash } from 'node:crypto';
import { InputError } from '../core/errors.js';
import type { BankHazard } from '../checks/hazard.js';
import type { DesignKind } from './design.js';

export const MANIFEST_FILE = 'study.json';
export const CSV_FILE = 'points.csv';
export const JSONL_FILE = 'points.jsonl';
export const MANIFEST_FORMAT = 'railpulse-study/1';

export interface ShardSpec {
  /** 1-based */
  index: number;
  count: number;
}

export interface StudyManifest {
  format: typeof MANIFEST_FORMAT;
  scenario: { file: string; name: string; sha256: string };
  vary: { path: string; spec: string }[];
  design: { kind: DesignKind; samples: number | null; seed: number };
  /** points in the whole design (all shards) */
  points: number;
  /** null for a whole study; a shard runs the indices with index % count == index − 1 */
  shard: (ShardSpec & { rule: string }) | null;
  columns: string[];
  created: string;
  /** the shard directories a merged study was joined from */
  mergedFrom?: string[];
  /**
   * The bank at the design's extremes (each group's largest count, capacitance and charge voltage over the varied
   * values): an upper bound on what any point stores, for the safety banner of the study page.
   */
  safety?: BankHazard;
}

export const SHARD_RULE = 'index % count == shard - 1';

/** What must agree between a run and its resume, and between shards being merged. */
export function studyIdentity(manifest: StudyManifest): string {
  const { scenario, vary, design, points, columns } = manifest;
  return JSON.stringify({ sha256: scenario.sha256, vary, design, points, columns });
}

export function identityHash(manifest: StudyManifest): string {
  return createHash('sha256').update(studyIdentity(manifest)).update(JSON.stringify(manifest.shard)).digest('hex').slice(0, 8);
}

export function slugify(text: string): string {
  const slug = text.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 40);
  return slug || 'study';
}

/** studies/<yyyy-mm-dd>_<slug>_<hash>: the same study on the same day lands in the same place (so --resume finds it). */
export function defaultStudyDir(manifest: StudyManifest, now: Date, root = 'studies'): string {
  const date = now.toISOString().slice(0, 10);
  const shard = manifest.shard ? `_shard${manifest.shard.index}of${manifest.shard.count}` : '';
  return join(root, `${date}_${slugify(manifest.scenario.name)}${shard}_${identityHash(manifest)}`);
}

/** Write a new file atomically; refuses (EEXIST) to replace an existing one. */
export function writeNewFileAtomic(path: string, data: string): void {
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}.tmp`);
  writeFileSync(temporary, data, { flag: 'wx' });
  try {
    linkSync(temporary, path);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') throw new InputError(path, 'exists already; railpulse never overwrites a generated file');
    // File systems without hard links: rename is still atomic; the existence check above is the guard.
    if (existsSync(path)) throw error;
    renameSync(temporary, path);
    return;
  } finally {
    if (existsSync(temporary)) unlinkSync(temporary);
  }
}

export function isMissingOrEmptyDir(dir: string): boolean {
  return !existsSync(dir) || readdirSync(dir).length === 0;
}

/**
 * Call `visit` for every complete line of a file (without its newline), with the byte offset just after it.
 * Returns that offset for the last complete line (a truncated last line is not visited). Reads in chunks, so
 * memory stays flat for any file size. `visit` returns false to stop early.
 */
export function forEachLine(path: string, visit: (line: string, end: number) => boolean | void): number {
  const fd = openSync(path, 'r');
  const chunk = Buffer.alloc(4 << 20);
  let carry = Buffer.alloc(0);
  let offset = 0;
  let lastEnd = 0;
  try {
    for (;;) {
      const read = readSync(fd, chunk, 0, chunk.length, offset);
      if (read === 0) break;
      offset += read;
      const buffer = carry.length > 0 ? Buffer.concat([carry, chunk.subarray(0, read)]) : chunk.subarray(0, read);
      const base = offset - buffer.length;
      let start = 0;
      for (let newline = buffer.indexOf(10, start); newline >= 0; newline = buffer.indexOf(10, start)) {
        lastEnd = base + newline + 1;
        if (visit(buffer.toString('utf8', start, newline), lastEnd) === false) return lastEnd;
        start = newline + 1;
      }
      carry = Buffer.from(buffer.subarray(start));
    }
  } finally {
    closeSync(fd);
  }
  return lastEnd;
}

export function truncateFile(path: string, length: number): void {
  const fd = openSync(path, 'r+');
  try {
    ftruncateSync(fd, length);
  } finally {
    closeSync(fd);
  }
}

/** Appends to the points files; every call is written through before it returns. */
export interface PointsWriter {
  append(csv: string, json: string): void;
  close(): void;
}

export function openPointsWriter(dir: string): PointsWriter {
  const csv = openSync(join(dir, CSV_FILE), 'a');
  const json = openSync(join(dir, JSONL_FILE), 'a');
  return {
    // CSV first: on resume, points.jsonl is the record, and CSV rows beyond it are cut back.
    append(csvText, jsonText) {
      if (csvText) writeSync(csv, csvText);
      if (jsonText) writeSync(json, jsonText);
    },
    close() {
      closeSync(csv);
      closeSync(json);
    },
  };
}

/** The index in a JSONL row, read without parsing the whole line. */
export function rowIndex(line: string): number | undefined {
  const match = /^\{"index":(\d+)[,}]/.exec(line);
  return match ? Number(match[1]) : undefined;
}

/** The complete lines of a file, one at a time (a truncated last line is left out). */
export function* readLines(path: string): Generator<string> {
  const fd = openSync(path, 'r');
  const chunk = Buffer.alloc(1 << 20);
  let carry = Buffer.alloc(0);
  let offset = 0;
  try {
    for (;;) {
      const read = readSync(fd, chunk, 0, chunk.length, offset);
      if (read === 0) return;
      offset += read;
      const buffer = carry.length > 0 ? Buffer.concat([carry, chunk.subarray(0, read)]) : chunk.subarray(0, read);
      let start = 0;
      for (let newline = buffer.indexOf(10, start); newline >= 0; newline = buffer.indexOf(10, start)) {
        yield buffer.toString('utf8', start, newline);
        start = newline + 1;
      }
      carry = Buffer.from(buffer.subarray(start));
    }
  } finally {
    closeSync(fd);
  }
}
