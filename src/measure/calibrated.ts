/**
 * The calibrated scenario file: the user's scenario JSON as written, with each fitted value replaced by its
 * SI number (sections created when the file left them to their defaults, e.g. no `friction` section), the
 * name marked "(calibrated)" and a description line saying against which file, on which date, which
 * values were fitted. With the record's SHA-256 it also carries the `calibration` section that later commands
 * propagate (src/scenario/uncertainty.ts): the fitted paths, values and covariance (cov_ij = r_ij σ_i σ_j, from
 * the fit's uncertainties and correlations), the record, its SHA-256 and the date. A parameter fitted onto a
 * bound has no uncertainty: it is listed under `onBound`. The calibration replaces an earlier one, and a
 * tolerance written for a value now calibrated is dropped (the calibration gives its uncertainty).
 * Pure: the caller writes the text and checks it loads.
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
  /** SHA-256 of the measurement file's bytes; with it the file carries a `calibration` section */
  measurementSha256?: string;
  /** 'pathA|pathB' → correlation of the fitted values (each pair once, either order) */
  correlations?: Record<string, number>;
  /** χ²/ν of the fit */
  chiSquaredReduced?: number;
}

/** The `calibration` section of a calibrated scenario. */
export function calibrationSection(note: CalibrationNote & { measurementSha256: string }): Record<string, unknown> {
  const entries = Object.entries(note.fitted);
  const withSigma = entries.filter(([, f]) => Number.isFinite(f.uncertainty));
  const correlation = (a: string, b: string): number => (a === b ? 1 : note.correlations?.[`${a}|${b}`] ?? note.correlations?.[`${b}|${a}`] ?? 0);
  const covariance = withSigma.map(([a, fa]) => withSigma.map(([b, fb]) => correlation(a, b) * fa.uncertainty * fb.uncertainty));
  // exactly symmetric, whatever order the correlations were listed in
  covariance.forEach((row, i) => row.forEach((_, j) => j < i && (row[j] = covariance[j]![i]!)));
  const section: Record<string, unknown> = {
    parameters: withSigma.map(([path]) => path),
    values: withSigma.map(([, f]) => f.value),
    covariance,
    record: note.measurementFile,
    recordSha256: note.measurementSha256,
    date: note.date,
    scenario: note.scenarioFile,
  };
  if (note.chiSquaredReduced !== undefined && Number.isFinite(note.chiSquaredReduced)) section.chiSquaredReduced = note.chiSquaredReduced;
  const onBound = entries.filter(([, f]) => !Number.isFinite(f.uncertainty)).map(([path]) => path);
  if (onBound.length > 0) section.onBound = onBound;
  return section;
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
  if (note.measurementSha256 !== undefined) {
    const section = calibrationSection({ ...note, measurementSha256: note.measurementSha256 });
    if ((section.parameters as string[]).length > 0) copy.calibration = section;
    else delete copy.calibration;
    if (Array.isArray(copy.tolerances)) {
      const pathOf = (entry: unknown): unknown => (typeof entry === 'object' && entry !== null ? (entry as { path?: unknown }).path : undefined);
      const kept = copy.tolerances.filter((entry) => !(typeof pathOf(entry) === 'string' && (pathOf(entry) as string) in note.fitted));
      if (kept.length > 0) copy.tolerances = kept;
      else delete copy.tolerances;
    }
  } else {
    delete copy.calibration; // an earlier calibration no longer describes the refitted values
  }
  const line = calibrationLine(note);
  copy.description = typeof copy.description === 'string' && copy.description !== '' ? `${copy.description} — ${line}` : line;
  return copy;
}
