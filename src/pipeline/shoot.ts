/**
 * One shot of a loaded scenario, end to end: simulate, assess (checks, warnings, derived rail figures) and
 * stamp its provenance, once. Every command that shows or files a shot reads this one value.
 */
import { assessShot, type Assessment } from '../checks/assess.js';
import { provenanceOf, type RunEnvironment, type ShotProvenance } from '../output/provenance.js';
import type { LoadedScenario } from '../scenario/load.js';
import type { Scenario } from '../scenario/types.js';
import { runShot } from '../solve/shot.js';
import type { Shot } from '../solve/types.js';
import { InputError } from '../core/errors.js';

export interface AssessedShot {
  /** the scenario file as read */
  loaded: LoadedScenario;
  /** the scenario simulated: the loaded one, or a variant of it (e.g. sampled like a measurement) */
  scenario: Scenario;
  shot: Shot;
  assessment: Assessment;
  provenance: ShotProvenance;
}

export interface ShootOptions {
  /** simulate this variant of the loaded scenario instead (same file, same provenance) */
  scenario?: Scenario;
  /** record waveforms (default true); figures and checks do not need them */
  waveforms?: boolean;
  /** where the shot runs, for its provenance (default: this Node process, now) */
  environment?: RunEnvironment;
}

/** Run `work`; a problem it reports without a file (a solver failure) is attributed to the scenario file. */
export function inFile<T>(file: string, work: () => T): T {
  try {
    return work();
  } catch (error) {
    if (error instanceof InputError && !error.file) throw new InputError(error.where, error.problem, file);
    throw error;
  }
}

export function shoot(loaded: LoadedScenario, options: ShootOptions = {}): AssessedShot {
  const scenario = options.scenario ?? loaded.scenario;
  const shot = inFile(loaded.file, () => runShot(scenario, { waveforms: options.waveforms ?? true }));
  return { loaded, scenario, shot, assessment: assessShot(scenario, shot), provenance: provenanceOf(shot, loaded.sha256, options.environment) };
}

/**
 * The results object of `run --json`: the shot's figures (SI), its checks, its status (the worst of the checks and
 * the warnings, with the warnings themselves) and, from geometry, railsDerived.
 */
export function resultsJson(assessed: AssessedShot): Record<string, unknown> {
  const { railsDerived, checks, status, warnings } = assessed.assessment;
  return { ...assessed.shot.results, checks, status, warnings, ...(railsDerived ? { railsDerived } : {}) };
}
