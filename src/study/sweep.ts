/**
 * Run a study's points on worker threads and stream their rows, in index order, to points.csv and points.jsonl.
 *
 * Memory stays flat: at most 2 batches a worker are in flight, and finished batches wait in a reorder buffer only
 * until the batches before them are written. Each batch is written through as soon as it is next in order, so a
 * kill loses only the batches in flight; --resume picks up after the last complete row.
 */
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError, withFileProblems } from '../core/errors.js';
import type { Scenario } from '../scenario/types.js';
import { validationProblem, type BatchContext, type BatchRequest, type BatchResult } from './batch.js';
import type { Design } from './design.js';
import {
  CSV_FILE,
  JSONL_FILE,
  MANIFEST_FILE,
  MANIFEST_FORMAT,
  forEachLine,
  isMissingOrEmptyDir,
  openPointsWriter,
  rowIndex,
  studyIdentity,
  truncateFile,
  writeNewFileAtomic,
  type ShardSpec,
  type StudyManifest,
} from './output.js';
import { setPath } from '../scenario/paths.js';
import { makeWorkerPool, type PointRunner } from './pool.js';
import { silentProgress, type ProgressSink } from './progress.js';
import { csvHeader, csvLine, studyLayout, UNCERTAINTY_COLUMNS, type RowLayout } from './rows.js';

export interface SweepPlan {
  /** the base scenario, SI, parsed once in the main thread */
  scenario: Scenario;
  /** the scenario file as written, when an axis is read at load (geometry, materials): each point reads it again */
  raw?: Record<string, unknown>;
  design: Design;
  manifest: StudyManifest;
  outDir: string;
  resume: boolean;
}

export interface SweepOptions {
  /** worker threads (default: os.availableParallelism()) */
  jobs?: number;
  /** points a message (default: up to 64, fewer for small studies so every worker gets work) */
  batchSize?: number;
  /** SI range checks of a changed scenario, in the main thread; a point that fails is recorded with its reason */
  validate?: (scenario: Scenario) => void;
  /** validateScenario on every point where it runs (in the workers, not the main thread); the same rows as `validate` */
  validatePoints?: boolean;
  /** how batches are run (default: a pool of dist/sweep-worker.mjs threads) */
  makeRunner?: (context: BatchContext, jobs: number) => PointRunner;
  progress?: (pointsToRun: number) => ProgressSink;
  /** stop dispatching; the batches in flight are finished and written */
  signal?: AbortSignal;
}

export interface SweepSummary {
  outDir: string;
  /** points of this shard (all points when unsharded) */
  points: number;
  /** rows found already written (resume) */
  resumedFrom: number;
  /** the folder held this study already, so it was continued without --resume */
  autoResumed: boolean;
  /** rows written by this run */
  ran: number;
  /** rows with an error (this run) */
  failed: number;
  complete: boolean;
  interrupted: boolean;
  seconds: number;
}

/** The indices a shard runs: index % count == shard − 1 (round-robin, so every shard samples the whole design). */
export function shardPositions(points: number, shard: ShardSpec | null): { first: number; step: number; length: number } {
  const first = shard ? shard.index - 1 : 0;
  const step = shard ? shard.count : 1;
  return { first, step, length: points > first ? Math.ceil((points - first) / step) : 0 };
}

export function defaultWorkerUrl(): URL {
  // Bundled: the worker sits beside dist/railpulse.mjs. From sources (tests, tsx): the built one in dist/.
  const beside = new URL('./sweep-worker.mjs', import.meta.url);
  if (existsSync(fileURLToPath(beside))) return beside;
  return new URL('../../dist/sweep-worker.mjs', import.meta.url);
}

export async function runSweep(plan: SweepPlan, options: SweepOptions = {}): Promise<SweepSummary> {
  const started = performance.now();
  const uncertainty = plan.manifest.columns.includes(UNCERTAINTY_COLUMNS[0]!);
  const layout = studyLayout(plan.scenario, plan.design.axes.map((axis) => axis.path), uncertainty);
  const positions = shardPositions(plan.design.count, plan.manifest.shard);
  // A folder that holds this very study (a requeued or resubmitted cluster task, a second run of the same command)
  // is continued, never refused and never overwritten; one that holds anything else is refused.
  const autoResumed = !plan.resume && holdsSameStudy(plan);
  const resumedFrom = plan.resume || autoResumed ? resumeStudyDir(plan, layout, positions) : createStudyDir(plan, layout);
  const remaining = positions.length - resumedFrom;
  const summary: SweepSummary = { outDir: plan.outDir, points: positions.length, resumedFrom, autoResumed, ran: 0, failed: 0, complete: remaining === 0, interrupted: false, seconds: 0 };
  if (remaining === 0) return summary;

  const requestedJobs = options.jobs ?? availableParallelism();
  const batchSize = options.batchSize ?? Math.max(1, Math.min(64, Math.ceil(remaining / (requestedJobs * 4))));
  const jobs = Math.max(1, Math.min(requestedJobs, Math.ceil(remaining / batchSize)));
  const context: BatchContext = { scenario: plan.scenario, paths: layout.paths, uncertainty, validate: options.validatePoints ?? false, ...(plan.raw ? { raw: plan.raw } : {}) };
  const runner = (options.makeRunner ?? ((ctx, n) => makeWorkerPool(defaultWorkerUrl(), ctx, n)))(context, jobs);
  const progress = options.progress?.(remaining) ?? silentProgress;
  const writer = openPointsWriter(plan.outDir);
  const makeBatch = batchMaker(plan, positions, options.validate);
  try {
    await new Promise<void>((resolve, reject) => {
      let nextPosition = resumedFrom;
      let sequence = 0;
      let nextToWrite = 0;
      let inFlight = 0;
      let failure: Error | undefined;
      const ready = new Map<number, BatchResult>();
      const stopping = (): boolean => failure !== undefined || (options.signal?.aborted ?? false);
      const settle = (): void => {
        if (inFlight > 0) return;
        if (failure) reject(failure);
        else if (nextPosition >= positions.length || stopping()) resolve();
      };
      const onResult = (result: BatchResult): void => {
        inFlight -= 1;
        ready.set(result.sequence, result);
        for (let next = ready.get(nextToWrite); next; next = ready.get(nextToWrite)) {
          writer.append(next.csv, next.json);
          ready.delete(nextToWrite);
          nextToWrite += 1;
          summary.ran += next.count;
          summary.failed += next.failed;
        }
        progress.update(summary.ran);
        pump();
      };
      const onError = (error: Error): void => {
        inFlight -= 1;
        failure ??= error;
        settle();
      };
      const pump = (): void => {
        while (!stopping() && inFlight < runner.concurrency * 2 && nextPosition < positions.length) {
          const count = Math.min(batchSize, positions.length - nextPosition);
          const request = makeBatch(sequence, nextPosition, count);
          sequence += 1;
          nextPosition += count;
          inFlight += 1;
          runner.submit(request).then(onResult, onError);
        }
        settle();
      };
      options.signal?.addEventListener('abort', settle, { once: true });
      pump();
    });
  } finally {
    writer.close();
    await runner.close();
  }
  summary.complete = resumedFrom + summary.ran === positions.length;
  // a stop that came after the last batch was dispatched interrupted nothing
  summary.interrupted = (options.signal?.aborted ?? false) && !summary.complete;
  summary.seconds = (performance.now() - started) / 1000;
  return summary;
}

function batchMaker(plan: SweepPlan, positions: { first: number; step: number }, validate?: (scenario: Scenario) => void) {
  const axes = plan.design.axes;
  // A scratch copy for the range checks: every point sets every varied path, so it never needs resetting.
  const probe = structuredClone(plan.scenario);
  return (sequence: number, startPosition: number, count: number): BatchRequest => {
    const indices: number[] = [];
    const values = new Float64Array(count * axes.length);
    const invalid: (string | null)[] = [];
    for (let k = 0; k < count; k += 1) {
      const index = positions.first + (startPosition + k) * positions.step;
      const point = plan.design.point(index);
      indices.push(index);
      values.set(point, k * axes.length);
      invalid.push(validate ? checkPoint(probe, axes.map((axis) => axis.steps), point, validate) : null);
    }
    return { sequence, indices, values, invalid };
  };
}

function checkPoint(probe: Scenario, steps: Parameters<typeof setPath>[1][], point: number[], validate: (scenario: Scenario) => void): string | null {
  steps.forEach((step, d) => setPath(probe, step, point[d]!));
  return validationProblem(probe, validate);
}

/** Whether the output folder holds a study with the same identity and shard as this one. */
function holdsSameStudy(plan: SweepPlan): boolean {
  if (isMissingOrEmptyDir(plan.outDir) || !existsSync(join(plan.outDir, MANIFEST_FILE))) return false;
  let onDisk: StudyManifest;
  try {
    onDisk = readManifest(plan.outDir);
  } catch {
    return false;
  }
  return sameStudy(onDisk, plan.manifest);
}

function sameStudy(a: StudyManifest, b: StudyManifest): boolean {
  return studyIdentity(a) === studyIdentity(b) && JSON.stringify(a.shard) === JSON.stringify(b.shard);
}

function createStudyDir(plan: SweepPlan, layout: RowLayout): number {
  if (!isMissingOrEmptyDir(plan.outDir)) {
    const holds = existsSync(join(plan.outDir, MANIFEST_FILE)) ? 'holds a different study (scenario, --vary, design, seed or shard differ)' : 'exists and is not a study folder';
    throw new InputError('--out', `${plan.outDir} ${holds}; give another --out`);
  }
  withFileProblems(plan.outDir, () => mkdirSync(plan.outDir, { recursive: true }), 'cannot create the study folder');
  writeNewFileAtomic(join(plan.outDir, MANIFEST_FILE), `${JSON.stringify(plan.manifest, null, 2)}\n`);
  writeNewFileAtomic(join(plan.outDir, CSV_FILE), csvHeader(layout));
  writeNewFileAtomic(join(plan.outDir, JSONL_FILE), '');
  return 0;
}

export function readManifest(dir: string): StudyManifest {
  const path = join(dir, MANIFEST_FILE);
  if (!existsSync(path)) throw new InputError(dir, `no ${MANIFEST_FILE} here; not a railpulse study directory`);
  let manifest: unknown;
  try {
    manifest = JSON.parse(readFileSync(path, 'utf8'));
  } catch {
    throw new InputError(path, 'is not valid JSON');
  }
  if (typeof manifest !== 'object' || manifest === null || (manifest as StudyManifest).format !== MANIFEST_FORMAT) {
    throw new InputError(path, `is not a railpulse study manifest (${MANIFEST_FORMAT})`);
  }
  return manifest as StudyManifest;
}

/** Check the study on disk is this study, cut any partly written row, and return how many rows are complete. */
function resumeStudyDir(plan: SweepPlan, layout: RowLayout, positions: { first: number; step: number; length: number }): number {
  const onDisk = readManifest(plan.outDir);
  if (!sameStudy(onDisk, plan.manifest)) {
    throw new InputError('--resume', `${plan.outDir} holds a different study (scenario, --vary, design, seed or shard differ)`);
  }
  const jsonPath = join(plan.outDir, JSONL_FILE);
  const csvPath = join(plan.outDir, CSV_FILE);
  if (!existsSync(jsonPath)) writeNewFileAtomic(jsonPath, '');
  let done = 0;
  const end = forEachLine(jsonPath, (line) => {
    const expected = positions.first + done * positions.step;
    const index = rowIndex(line);
    if (index !== expected || done >= positions.length) {
      throw new InputError(jsonPath, `row ${done + 1} has index ${index ?? '?'}, expected ${expected}; the file was changed, so it cannot be resumed`);
    }
    done += 1;
  });
  truncateFile(jsonPath, end);
  reconcileCsv(csvPath, jsonPath, layout, done);
  return done;
}

/** Make points.csv hold the header and exactly the rows of points.jsonl (CSV is written first, so it may be ahead). */
function reconcileCsv(csvPath: string, jsonPath: string, layout: RowLayout, rows: number): void {
  if (!existsSync(csvPath)) writeNewFileAtomic(csvPath, '');
  let lines = 0;
  const end = forEachLine(csvPath, () => {
    lines += 1;
    return lines < rows + 1;
  });
  truncateFile(csvPath, end);
  if (lines >= rows + 1) return;
  const writer = openPointsWriter(join(csvPath, '..'));
  try {
    if (lines === 0) writer.append(csvHeader(layout), '');
    const have = Math.max(0, lines - 1);
    let row = 0;
    let text = '';
    forEachLine(jsonPath, (line) => {
      if (row >= have) text += csvLine(layout, JSON.parse(line) as Record<string, unknown>);
      row += 1;
      if (text.length > 1 << 20) {
        writer.append(text, '');
        text = '';
      }
      return row < rows;
    });
    writer.append(text, '');
  } finally {
    writer.close();
  }
}
