/**
 * Study designs: which points a sweep runs, each with a fixed index so a point can be named, sharded and resumed.
 *
 * - grid: every combination of every axis's values, row-major (the first --vary changes slowest, the last fastest).
 * - lhs: a Latin hypercube of `samples` points over each axis's [min, max] (log axes in log space): each axis's range
 *   is cut into `samples` equal strata and every stratum holds exactly one point.
 * - random: `samples` independent uniform points over the same ranges.
 * Both sampled designs are fixed by `seed`.
 */
import { InputError } from '../core/errors.js';
import type { Axis } from './spec.js';
import { counterUniform, mulberry32 } from './prng.js';

export type DesignKind = 'grid' | 'lhs' | 'random';
export const DESIGN_KINDS: readonly DesignKind[] = ['grid', 'lhs', 'random'];

export interface DesignOptions {
  kind: DesignKind;
  /** number of points for lhs/random (not used by grid) */
  samples?: number;
  seed: number;
}

export interface Design {
  kind: DesignKind;
  axes: Axis[];
  count: number;
  seed: number;
  /** the SI values of the point with this index, one per axis */
  point(index: number): number[];
}

/** More points than this is surely a typo (and would not fit a points file anyway). */
export const MAX_POINTS = 100_000_000;

export function makeDesign(axes: Axis[], options: DesignOptions): Design {
  if (!DESIGN_KINDS.includes(options.kind)) throw new InputError('--design', `expected one of ${DESIGN_KINDS.join(', ')}, got "${options.kind}"`);
  if (!Number.isInteger(options.seed) || options.seed < 0 || options.seed > 0xffffffff) {
    throw new InputError('--seed', `expected a whole number from 0 to 4294967295, got ${options.seed}`);
  }
  if (options.kind === 'grid') {
    if (options.samples !== undefined) throw new InputError('--samples', 'only the lhs and random designs take --samples (a grid runs every combination)');
    return gridDesign(axes, options.seed);
  }
  const samples = options.samples;
  if (samples === undefined) throw new InputError('--samples', `the ${options.kind} design needs --samples N`);
  if (!Number.isInteger(samples) || samples < 1 || samples > MAX_POINTS) {
    throw new InputError('--samples', `expected a whole number from 1 to ${MAX_POINTS}, got ${samples}`);
  }
  return options.kind === 'lhs' ? latinHypercube(axes, samples, options.seed) : randomDesign(axes, samples, options.seed);
}

function gridDesign(axes: Axis[], seed: number): Design {
  const sizes = axes.map((axis) => axis.values.length);
  const count = sizes.reduce((product, size) => product * size, 1);
  if (count > MAX_POINTS) throw new InputError('--vary', `the grid has ${count} points (more than ${MAX_POINTS}); use --design lhs --samples N`);
  return {
    kind: 'grid',
    axes,
    count,
    seed,
    point(index) {
      const values = new Array<number>(axes.length);
      let rest = index;
      for (let d = axes.length - 1; d >= 0; d -= 1) {
        const size = sizes[d]!;
        values[d] = axes[d]!.values[rest % size]!;
        rest = Math.floor(rest / size);
      }
      return values;
    },
  };
}

/** Map a unit fraction u ∈ [0, 1) onto an axis's range. */
export function valueAt(axis: Axis, u: number): number {
  if (axis.min === axis.max) return axis.min;
  if (axis.integer) return Math.min(axis.max, axis.min + Math.floor(u * (axis.max - axis.min + 1)));
  if (axis.kind === 'log') return Math.exp(Math.log(axis.min) + u * (Math.log(axis.max) - Math.log(axis.min)));
  return axis.min + u * (axis.max - axis.min);
}

function latinHypercube(axes: Axis[], samples: number, seed: number): Design {
  // The strata permutations must be drawn together, so the unit fractions are kept (8 bytes a value).
  const random = mulberry32(seed);
  const dimensions = axes.length;
  const fractions = new Float64Array(samples * dimensions);
  const order = new Uint32Array(samples);
  for (let d = 0; d < dimensions; d += 1) {
    for (let i = 0; i < samples; i += 1) order[i] = i;
    for (let i = samples - 1; i > 0; i -= 1) {
      const j = Math.floor(random() * (i + 1));
      const swap = order[i]!;
      order[i] = order[j]!;
      order[j] = swap;
    }
    for (let i = 0; i < samples; i += 1) fractions[i * dimensions + d] = (order[i]! + random()) / samples;
  }
  return {
    kind: 'lhs',
    axes,
    count: samples,
    seed,
    point: (index) => axes.map((axis, d) => valueAt(axis, fractions[index * dimensions + d]!)),
  };
}

function randomDesign(axes: Axis[], samples: number, seed: number): Design {
  return {
    kind: 'random',
    axes,
    count: samples,
    seed,
    point: (index) => axes.map((axis, d) => valueAt(axis, counterUniform(seed, index, d))),
  };
}
