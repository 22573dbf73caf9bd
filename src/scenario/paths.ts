/**
 * Scenario paths such as `bank[1].voltage` or `armature.mass`: read, write and list the numbers that studies
 * vary and fits free. Pure and free of src/units (the sweep worker imports it, and must not pull in mathjs).
 */
import type { Scenario } from './types.js';
import { InputError } from '../core/errors.js';
import { didYouMean } from './suggest.js';

export type PathStep = string | number;

/** Split `bank[1].crowbar.drop` into ['bank', 1, 'crowbar', 'drop']; null if the text is not a path. */
export function parsePath(path: string): PathStep[] | null {
  const steps: PathStep[] = [];
  const pattern = /([A-Za-z_][A-Za-z0-9_]*)|\[(\d+)\]|(\.)/y;
  let expectName = true;
  let position = 0;
  while (position < path.length) {
    pattern.lastIndex = position;
    const match = pattern.exec(path);
    if (!match) return null;
    if (match[1] !== undefined) {
      if (!expectName) return null;
      steps.push(match[1]);
      expectName = false;
    } else if (match[2] !== undefined) {
      if (expectName) return null;
      steps.push(Number(match[2]));
    } else {
      if (expectName) return null;
      expectName = true;
    }
    position = pattern.lastIndex;
  }
  return steps.length > 0 && !expectName ? steps : null;
}

export function formatPath(steps: readonly PathStep[]): string {
  return steps.map((step, i) => (typeof step === 'number' ? `[${step}]` : i === 0 ? step : `.${step}`)).join('');
}

type Container = Record<string | number, unknown>;

function isContainer(value: unknown): value is Container {
  return typeof value === 'object' && value !== null;
}

/** The value at a path, or undefined when any step is missing. */
export function getPath(root: unknown, steps: readonly PathStep[]): unknown {
  let node: unknown = root;
  for (const step of steps) {
    if (!isContainer(node)) return undefined;
    if (typeof step === 'number' && !Array.isArray(node)) return undefined;
    if (typeof step === 'string' && Array.isArray(node)) return undefined;
    if (!Object.prototype.hasOwnProperty.call(node, step)) return undefined;
    node = node[step];
  }
  return node;
}

/** Set a number at an existing path (the path was checked when the study was specified). */
export function setPath(root: Scenario, steps: readonly PathStep[], value: number): void {
  let node: unknown = root;
  for (let i = 0; i < steps.length - 1; i += 1) node = (node as Container)[steps[i]!];
  (node as Container)[steps[steps.length - 1]!] = value;
}

/** Every numeric leaf of a scenario, as path strings (for did-you-mean messages). */
export function listNumericPaths(root: unknown, prefix: PathStep[] = []): string[] {
  if (typeof root === 'number') return [formatPath(prefix)];
  if (Array.isArray(root)) return root.flatMap((item, i) => listNumericPaths(item, [...prefix, i]));
  if (isContainer(root)) return Object.keys(root).flatMap((key) => listNumericPaths(root[key], [...prefix, key]));
  return [];
}

/** The closest known path, if it is close enough to be a likely typo. */
export function closestPath(path: string, known: readonly string[]): string | undefined {
  return didYouMean(path, [...known]);
}

function stepsOf(path: string): PathStep[] {
  const steps = parsePath(path);
  if (!steps) throw new InputError(path, 'expected a parameter path like bank[0].esr or feed.inductance');
  return steps;
}

/** The number at a path of a scenario; InputError naming the path if there is none. */
export function getScenarioPath(scenario: Scenario, path: string): number {
  const value = getPath(scenario, stepsOf(path));
  if (value === undefined) throw new InputError(path, 'no such parameter in the scenario');
  if (typeof value !== 'number') throw new InputError(path, 'is not a number in the scenario, so it cannot be fitted');
  return value;
}

/** A new Scenario with one number replaced; the input is not modified (untouched sections are shared). */
export function setScenarioPath(scenario: Scenario, path: string, value: number): Scenario {
  getScenarioPath(scenario, path); // same checks and messages as reading
  const steps = stepsOf(path);
  const replace = (node: unknown, depth: number): unknown => {
    if (depth === steps.length) return value;
    const step = steps[depth]!;
    if (Array.isArray(node)) return node.map((item, i) => (i === step ? replace(item, depth + 1) : item));
    const record = node as Container;
    return { ...record, [step]: replace(record[step], depth + 1) };
  };
  return replace(scenario, 0) as Scenario;
}

type RawNode = Record<string | number, unknown>;

/** Set `value` at a scenario path in a parsed JSON object, creating missing (or null) sections; undefined removes the key. */
export function setRawPath(raw: Record<string, unknown>, path: string, value: unknown): void {
  const steps = parsePath(path);
  if (!steps) throw new RangeError(`not a scenario path: ${path}`);
  let node: RawNode = raw;
  for (let k = 0; k < steps.length - 1; k++) {
    const step = steps[k]!;
    const next = node[step];
    if (typeof next !== 'object' || next === null) {
      if (value === undefined) return; // nothing to remove
      // only sections can be missing: list items (bank[n]) exist, or the fit could not have read them
      if (typeof step === 'number' || typeof steps[k + 1] === 'number') throw new RangeError(`no list item at ${path}`);
      node[step] = {};
    }
    node = node[step] as RawNode;
  }
  const last = steps[steps.length - 1]!;
  if (value === undefined) delete node[last];
  else node[last] = value;
}

/**
 * Why setting this number of a loaded scenario would not do what its name says, or null. Some values are turned
 * into model inputs when the file is read (derived from geometry and materials, the rails' diffusion cells), and
 * some are not read in every configuration; a sweep axis, a fitted parameter or a tolerance on them would change
 * nothing, or something else than the user means. Studies, fits and uncertainty all ask this one function.
 */
/** Rail and armature geometry and materials: read into model inputs when the file is read (see inertPathProblem). */
export function isReadAtLoad(path: string): boolean {
  return /^(rails|armature)\.(geometry|material)\b/.test(path);
}

export function inertPathProblem(scenario: Scenario, path: string, options: { readAgain?: boolean } = {}): string | null {
  if (path === 'rails.resistanceGradient' && scenario.rails?.diffusion) {
    return 'follows current diffusion during the shot here (rails from geometry and material, rails.resistanceModel "diffusion"), and this number is only its uniform-current floor; for a constant R′ to vary, fit or give a tolerance on, set rails.resistanceModel to "quarter-period" or give rails.resistanceGradient as a number without a material';
  }
  if (/^(rails|armature)\.(derived|diffusion)\b/.test(path) || /^heating\b/.test(path)) {
    return 'is derived from the geometry and materials when the file is read, not an input';
  }
  const loadInput = /^(rails|armature)\.(geometry|material)\b/.exec(path);
  // (absent from this scenario: the caller's "no such value" says so; a sweep reads each point's file again)
  if (loadInput && !options.readAgain && (scenario as unknown as Record<string, Record<string, unknown> | undefined>)[loadInput[1]!]?.[loadInput[2]!] !== undefined) {
    const section = loadInput[1]!;
    const derived = section === 'rails' ? 'rails.inductanceGradient (and rails.resistanceGradient where R′ is constant)' : 'armature.mass and armature.resistance';
    return `is turned into model inputs when the file is read (${section === 'rails' ? 'L′, R′ and the diffusion cells' : 'the armature\'s mass and resistance'}), so changing it here would not change the shot; vary ${derived} instead, or write one scenario file per ${path.includes('material') ? 'material' : 'geometry'} and compare them`;
  }
  if (path === 'armature.transition.action' && scenario.armature?.transition) {
    return 'is worked out from armature.transition.specificAction × contactArea² and not read by the shot: vary one of those';
  }
  if (path === 'solver.diffusionRate') return "sets up the rails' diffusion cells when the file is read; write it in the scenario file";
  if (path === 'drag.dragCoefficient' && scenario.drag?.model === 'strong-shock') {
    return 'is not read by the strong-shock drag model (its pressure is (γ+1)/2·ρ0·v²: vary drag.heatCapacityRatio or drag.gasDensity)';
  }
  return null;
}
