/**
 * The calibrated scenario file: the user's scenario JSON as written, with each fitted value replaced by its
 * SI number (sections created when the file left them to their defaults, e.g. no `friction` section), the
 * name marked "(calibrated)" and a description line saying against which file, on which date, which
 * values were fitted. Pure: the caller writes the text and checks it loads.
 */
import { parsePath } from '../scenario/paths.js';

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

type Node = Record<string | number, unknown>;

/** Set `value` at a scenario path in a parsed JSON object, creating missing (or null) sections. */
export function setRawPath(raw: Record<string, unknown>, path: string, value: number): void {
  const steps = parsePath(path);
  if (!steps) throw new RangeError(`not a scenario path: ${path}`);
  let node: Node = raw;
  for (let k = 0; k < steps.length - 1; k++) {
    const step = steps[k]!;
    const next = node[step];
    if (typeof next !== 'object' || next === null) {
      // only sections can be missing: list items (bank[n]) exist, or the fit could not have read them
      if (typeof step === 'number' || typeof steps[k + 1] === 'number') throw new RangeError(`no list item at ${path}`);
      node[step] = {};
    }
    node = node[step] as Node;
  }
  node[steps[steps.length - 1]!] = value;
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
