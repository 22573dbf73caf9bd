/**
 * Run a batch of study points and format their rows. Shared by the worker threads and the in-process runner;
 * worker-safe (imports no units and no mathjs).
 */
import { assessShot } from '../checks/assess.js';
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import { isReadAtLoad, parsePath, setPath, setRawPath, type PathStep } from '../scenario/paths.js';
import { scenarioFromRaw } from '../scenario/load.js';
import { csvLine, jsonLine, rowObject, studyLayout, type RowLayout } from './rows.js';
import { HEADLINE_KEYS, type Headline, type RunShot } from './headline.js';
import { propagateModel } from './propagate.js';
import { uncertaintyModel } from './uncertainInputs.js';
import { validateScenario } from '../scenario/validate.js';
import { InputError } from '../core/errors.js';

export type { RunShot } from './headline.js';

/** What a runner needs once: the SI scenario (parsed in the main thread) and the varied paths. */
export interface BatchContext {
  scenario: Scenario;
  paths: string[];
  /** propagate the scenario's tolerances and calibration at every point (linear, 1 + 2k shots a point) */
  uncertainty?: boolean;
  /**
   * check each point's scenario (validateScenario) where the point runs, so the main thread does no per-point work;
   * a point that fails is recorded with its reason
   */
  validate?: boolean;
  /** the scenario file as written, when a varied path is read at load (see pointScenario) */
  raw?: Record<string, unknown>;
}

export interface BatchRequest {
  /** sequence number of the batch within the run (for the reorder buffer) */
  sequence: number;
  indices: number[];
  /** indices.length × paths.length SI values, row-major */
  values: Float64Array;
  /** per point: null, or why the point is not a valid scenario (checked in the main thread) */
  invalid: (string | null)[];
}

export interface BatchResult {
  sequence: number;
  count: number;
  failed: number;
  csv: string;
  json: string;
}

export interface BatchRunner {
  layout: RowLayout;
  run(request: BatchRequest): BatchResult;
}

/** The standard uncertainties at one point (its own values: relative spreads scale with them); null without inputs. */
function pointUncertainty(scenario: Scenario, shot: Shot, runShot: RunShot): Headline {
  const model = uncertaintyModel(scenario);
  if (!model) return Object.fromEntries(HEADLINE_KEYS.map((key) => [key, null])) as Headline;
  return propagateModel(scenario, model, runShot, { nominal: shot, probeSpread: false }).standardUncertainty;
}

/** Why a point's scenario is not valid, or null; anything but a user-facing problem is a bug and propagates. */
export function validationProblem(scenario: Scenario, validate: (scenario: Scenario) => void = validateScenario): string | null {
  try {
    validate(scenario);
    return null;
  } catch (error) {
    if (error instanceof InputError) return error.message;
    throw error;
  }
}

/**
 * The scenario of one point. Rail and armature geometry and materials are turned into L′, R′, the diffusion cells,
 * the armature's mass and resistance when a file is read, so with such a path (and `raw`, the file as written) the
 * point is the file read again with those values (SI numbers, as a file may give them); the other paths are then set
 * on it. Otherwise a fresh copy of the SI scenario with the values set: the solver must never see another point's
 * values. Throws InputError when the point's file does not read (its geometry's checks).
 */
export function pointScenario(scenario: Scenario, raw: Record<string, unknown> | undefined, paths: readonly string[], steps: readonly PathStep[][], values: ArrayLike<number>): Scenario {
  const readAgain = raw !== undefined && paths.some(isReadAtLoad);
  let point: Scenario;
  if (readAgain) {
    const copy = structuredClone(raw);
    paths.forEach((path, d) => {
      if (isReadAtLoad(path)) setRawPath(copy, path, values[d]!);
    });
    point = scenarioFromRaw(copy);
  } else point = structuredClone(scenario);
  steps.forEach((step, d) => {
    if (!readAgain || !isReadAtLoad(paths[d]!)) setPath(point, step, values[d]!);
  });
  return point;
}

export function makeBatchRunner(context: BatchContext, runShot: RunShot): BatchRunner {
  const layout = studyLayout(context.scenario, context.paths, context.uncertainty ?? false);
  const steps: PathStep[][] = context.paths.map((path) => parsePath(path)!);
  const dimensions = steps.length;
  return {
    layout,
    run(request) {
      let csv = '';
      let json = '';
      let failed = 0;
      request.indices.forEach((index, k) => {
        const values = request.values.subarray(k * dimensions, (k + 1) * dimensions);
        const invalid = request.invalid[k] ?? null;
        let row;
        let scenario: Scenario | null = null;
        let readProblem: string | null = null;
        if (invalid === null) {
          try {
            scenario = pointScenario(context.scenario, context.raw, context.paths, steps, values);
          } catch (error) {
            if (!(error instanceof InputError)) throw error;
            readProblem = error.message;
          }
        }
        const problem = invalid ?? readProblem ?? (scenario && context.validate ? validationProblem(scenario) : null);
        if (problem !== null || !scenario) {
          row = rowObject(layout, index, values, null, problem ?? 'invalid point');
        } else {
          try {
            const shot = runShot(scenario, { waveforms: false });
            // the same assessment every command reads: the point's verdicts are the record's verdicts
            const uncertainty = layout.uncertainty ? pointUncertainty(scenario, shot, runShot) : undefined;
            row = rowObject(layout, index, values, shot.results, undefined, assessShot(scenario, shot), uncertainty);
          } catch (error) {
            row = rowObject(layout, index, values, null, error instanceof Error ? error.message : String(error));
          }
        }
        if ('error' in row) failed += 1;
        csv += csvLine(layout, row);
        json += jsonLine(row);
      });
      return { sequence: request.sequence, count: request.indices.length, failed, csv, json };
    },
  };
}
