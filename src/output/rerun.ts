/**
 * Compare the results of a re-run with those archived in a report: does the record still reproduce?
 */
import type { ShotResults } from '../solve/types.js';

export interface Difference {
  path: string;
  archived: unknown;
  now: unknown;
}

export interface Reproduction {
  identical: boolean;
  /** every figure within the tolerance */
  matches: boolean;
  compared: number;
  largestRelativeDifference: number;
  differences: Difference[];
}

function leaves(value: unknown, prefix: string, out: Map<string, unknown>): Map<string, unknown> {
  if (value !== null && typeof value === 'object') {
    for (const [key, child] of Object.entries(value)) {
      leaves(child, Array.isArray(value) ? `${prefix}[${key}]` : prefix ? `${prefix}.${key}` : key, out);
    }
  } else {
    out.set(prefix, value);
  }
  return out;
}

/**
 * Figures match when they agree to `relative` of their size; energies (whose small parts such as the ledger
 * residual are rounding-level) are compared on the scale of the stored energy.
 */
export function compareResults(archived: ShotResults, now: ShotResults, relative = 1e-9): Reproduction {
  const a = leaves(archived, '', new Map());
  const b = leaves(now, '', new Map());
  const energyScale = Math.abs(archived.energy?.initial ?? 0);
  const differences: Difference[] = [];
  let largest = 0;
  let identical = true;
  for (const path of new Set([...a.keys(), ...b.keys()])) {
    const x = a.get(path);
    const y = b.get(path);
    if (x === y) continue;
    identical = false;
    if (typeof x === 'number' && typeof y === 'number') {
      const scale = path.startsWith('energy.') ? Math.max(energyScale, Math.abs(x), Math.abs(y)) : Math.max(Math.abs(x), Math.abs(y));
      const difference = scale === 0 ? 0 : Math.abs(x - y) / scale;
      largest = Math.max(largest, difference);
      if (difference <= relative) continue;
    }
    differences.push({ path, archived: x, now: y });
  }
  return { identical, matches: differences.length === 0, compared: a.size, largestRelativeDifference: largest, differences };
}
