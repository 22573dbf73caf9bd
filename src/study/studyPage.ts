/**
 * study.html of a study folder: the points read back from points.jsonl (thinned for plotting), drawn by the
 * study page of src/report, written once (never over an existing file). Each point keeps its outcome (exited,
 * stalled, timed out, error) and its status from the row's verdicts, which the sweep took from the assessment every
 * command reads.
 */
import { join } from 'node:path';
import { buildStudyReport, STUDY_FIGURES, type PointOutcome, type StudyPlotData } from '../report/study.js';
import { JSONL_FILE, readLines, writeNewFileAtomic, type StudyManifest } from './output.js';
import { VERDICT_COLUMN } from './rows.js';

export const STUDY_REPORT_FILE = 'study.html';
const MAX_PLOTTED = 20_000;

function outcomeOf(point: Record<string, unknown>): PointOutcome {
  if (typeof point.error === 'string') return 'error';
  return point.outcome === 'exited' || point.outcome === 'stalled' || point.outcome === 'timeout' ? point.outcome : 'error';
}

/** Read the points (thinned) a study report plots. */
export function readStudyPlotData(dir: string, manifest: StudyManifest): StudyPlotData {
  const paths = manifest.vary.map((axis) => axis.path);
  const stride = Math.max(1, Math.ceil(manifest.points / MAX_PLOTTED));
  const data: StudyPlotData = {
    paths,
    index: [],
    axes: paths.map(() => []),
    figures: {},
    outcome: [],
    verdict: [],
    failing: [],
    reasons: [],
    shown: 0,
    total: 0,
    outcomes: { exited: 0, stalled: 0, timeout: 0, error: 0 },
    verdicts: { pass: 0, warn: 0, fail: 0 },
    storedEnergy: null,
  };
  for (const figure of STUDY_FIGURES) data.figures[figure.key] = [];
  let row = 0;
  for (const line of readLines(join(dir, JSONL_FILE))) {
    const point = JSON.parse(line) as Record<string, unknown>;
    const outcome = outcomeOf(point);
    const verdict = point[VERDICT_COLUMN];
    data.total += 1;
    data.outcomes[outcome] += 1;
    if (verdict === 'pass' || verdict === 'warn' || verdict === 'fail') data.verdicts[verdict] += 1;
    const stored = (point.energy as { initial?: unknown } | undefined)?.initial;
    if (typeof stored === 'number' && Number.isFinite(stored)) {
      data.storedEnergy = data.storedEnergy ? { min: Math.min(data.storedEnergy.min, stored), max: Math.max(data.storedEnergy.max, stored) } : { min: stored, max: stored };
    }
    if (row++ % stride !== 0) continue;
    data.index.push(Number(point.index));
    paths.forEach((path, d) => data.axes[d]!.push(Number(point[path])));
    for (const figure of STUDY_FIGURES) {
      const value = point[figure.key];
      data.figures[figure.key]!.push(typeof value === 'number' && Number.isFinite(value) ? value : null);
    }
    data.outcome.push(outcome);
    data.verdict.push(verdict === 'pass' || verdict === 'warn' || verdict === 'fail' ? verdict : '');
    const verdicts = (point.verdicts ?? {}) as Record<string, unknown>;
    data.failing.push(Object.keys(verdicts).filter((id) => verdicts[id] === 'fail'));
    data.reasons.push(typeof point.error === 'string' ? point.error : '');
    data.shown += 1;
  }
  return data;
}

/** Write study.html into a finished (or merged) study directory. */
export function writeStudyReport(dir: string, manifest: StudyManifest): string {
  const path = join(dir, STUDY_REPORT_FILE);
  writeNewFileAtomic(path, buildStudyReport(manifest, readStudyPlotData(dir, manifest)));
  return path;
}
