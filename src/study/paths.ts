/**
 * Scenario paths such as `bank[1].voltage` or `armature.mass`: read, write and list the numbers a study may
 * vary. Pure and free of src/units (the sweep worker imports it, and must not pull in mathjs).
 */
import type { Scenario } from '../scenario/types.js';

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

function editDistance(a: string, b: string): number {
  const previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i += 1) {
    let diagonal = previous[0]!;
    previous[0] = i;
    for (let j = 1; j <= b.length; j += 1) {
      const above = previous[j]!;
      const cost = a[i - 1]!.toLowerCase() === b[j - 1]!.toLowerCase() ? 0 : 1;
      previous[j] = Math.min(above + 1, previous[j - 1]! + 1, diagonal + cost);
      diagonal = above;
    }
  }
  return previous[b.length]!;
}

/** The closest known path, if it is close enough to be a likely typo. */
export function closestPath(path: string, known: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const candidate of known) {
    const distance = editDistance(path, candidate);
    if (distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return best !== undefined && bestDistance <= Math.max(2, Math.floor(path.length / 3)) ? best : undefined;
}
