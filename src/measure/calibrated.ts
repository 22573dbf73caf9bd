/**
 * The calibrated scenario file: the user's scenario JSON as written, with each fitted value replaced by its
 * SI number (sections created when the file left them to their defaults, e.g. no `friction` section), the
 * name marked "(calibrated)" and a description line saying against which file, on which date, which
 * values were fitted. Pure: the caller writes the text and checks it loads.
 */
import { setRawPath } from '../scenario/paths.js';

export interface CalibrationNote {
  /** the scenario file that was calibrated */
  scenarioFile: string;
  /** the measurement file (or files) it was calibrated against */
  measurementFile: string;
  /** ISO date of the calibration */
  date: string;
  /** path → fitted value and one standard uncertainty (SI) */
  fitted: Record<string, { value: number; uncertainty: number }>;
}

/** One line for the description: what was fitted, against what, when. */
export function calibrationLine(note: CalibrationNote): string {
  const values = Object.entries(note.fitted)
    .map(([path, f]) => `${path} = ${f.value.toPrecision(6)}${Number.isFinite(f.uncertainty) ? ` ± ${f.uncertainty.toPrecision(2)}` : ' (on a bound)'}`)
    .join(', ');
  return `Calibrated by railpulse fit against ${note.measurementFile} on ${note.date.slice(0, 10)} from ${note.scenarioFile}: ${values} (SI, 1σ).`;
}

/** The calibrated scenario object; `raw` is not modified. */
export function calibratedScenarioRaw(raw: Record<string, unknown>, note: CalibrationNote): Record<string, unknown> {
  const copy = structuredClone(raw);
  for (const [path, f] of Object.entries(note.fitted)) setRawPath(copy, path, f.value);
  const name = typeof copy.name === 'string' ? copy.name : 'shot';
  if (!/\(calibrated\)$/.test(name)) copy.name = `${name} (calibrated)`;
  const line = calibrationLine(note);
  copy.description = typeof copy.description === 'string' && copy.description !== '' ? `${copy.description} — ${line}` : line;
  return copy;
}
