/**
 * The design page's simulator: the same loader, shot, assessment and record as `railpulse run`, with no file,
 * process or network access, so it runs in the browser. A scenario here is its JSON object as the user writes
 * it (quantities with units); every change reloads it through the CLI's loader, so a bad entry gets the CLI's
 * message.
 */
import type { RunEnvironment } from '../output/provenance.js';
import { shotRecordInput } from '../pipeline/recordInput.js';
import { resultsJson, shoot, type AssessedShot } from '../pipeline/shoot.js';
import { buildShotRecord } from '../report/shot-record.js';
import { loadScenarioText, type LoadedScenario } from '../scenario/load.js';
import { runShot } from '../solve/shot.js';
import { recordUncertainty, shotUncertainty } from '../study/shotUncertainty.js';

/** Where the page runs, in the provenance's `nodeVersion` slot (a page has no Node: it names the browser). */
export type PageEnvironment = RunEnvironment;

/** The text Save scenario writes: the object as two-space JSON with a final newline (what `run` then reads). */
export function scenarioText(raw: Record<string, unknown>): string {
  return `${JSON.stringify(raw, null, 2)}\n`;
}

/** Load the text as `run` loads a file (the name only appears in messages). Throws the loader's InputError. */
export function loadDesign(raw: Record<string, unknown>, file: string): LoadedScenario {
  return loadScenarioText(scenarioText(raw), file);
}

/** One shot of a loaded scenario, as `run` computes it: the pipeline's `shoot`, stamped with the page's browser. */
export function designShot(loaded: LoadedScenario, environment: PageEnvironment): AssessedShot {
  return shoot(loaded, { environment });
}

/** The results object of `run --json`. */
export function designResults(assessed: AssessedShot): Record<string, unknown> {
  return resultsJson(assessed);
}

/**
 * The shot record `railpulse run` files for the saved scenario: with the linear propagation of its tolerances
 * when it has some (as `run` does by default; no Monte Carlo, which `run` does only when asked).
 */
export async function designRecord(assessed: AssessedShot, plotlySource: string): Promise<string> {
  const uncertainty = await shotUncertainty(assessed, { runShot, waveforms: true });
  return buildShotRecord(shotRecordInput(assessed, undefined, uncertainty ? recordUncertainty(assessed, uncertainty) : undefined), plotlySource);
}
