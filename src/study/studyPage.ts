/**
 * study.html of a study folder: the points read back from points.jsonl (thinned for plotting), drawn by the
 * study page of src/report, written once (never over an existing file).
 */
import { join } from 'node:path';
import { buildStudyReport, STUDY_FIGURES, type StudyPlotData } from '../report/study.js';
import { JSONL_FILE, readLines, writeNewFileAtomic, type StudyManifest } from './output.js';

export const STUDY_REPORT_FILE = 'study.html';
const MAX_PLOTTED = 20_000;

/** Read the points (thinned) a study report plots. */
export function readStudyPlotData(dir: string, manifest: StudyManifest): StudyPlotData {
  const paths = manifest.vary.map((axis) => axis.path);
  const stride = Math.max(1, Math.ceil(manifest.points / MAX_PLOTTED));
  const data: StudyPlotData = { paths, axes: paths.map(() => []), figures: {}, failed: [], reasons: [], shown: 0, total: 0, failures: 0 };
  for (const figure of STUDY_FIGURES) data.figures[figure.key] = [];
  let row = 0;
  for (const line of readLines(join(dir, JSONL_FILE))) {
    const point = JSON.parse(line) as Record<string, unknown>;
    const failed = typeof point.error === 'string' || point.outcome !== 'exited';
    data.total += 1;
    if (failed) data.failures += 1;
    if (row++ % stride !== 0) continue;
    paths.forEach((path, d) => data.axes[d]!.push(Number(point[path])));
    for (const figure of STUDY_FIGURES) {
      const value = point[figure.key];
      data.figures[figure.key]!.push(typeof value === 'number' && Number.isFinite(value) ? value * figure.scale : null);
    }
    data.failed.push(failed);
    data.reasons.push(typeof point.error === 'string' ? point.error : failed ? String(point.outcome) : '');
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
