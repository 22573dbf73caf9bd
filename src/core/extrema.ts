/**
 * Largest and smallest of a list by a loop. `Math.max(...values)` passes every value as an argument, and past
 * about 10^5 values that overflows the call stack: lists whose length comes from input (samples, rows, groups,
 * sweep values) use these instead.
 */

/** The largest value (of `pick(value)` when given); -Infinity for an empty list, as Math.max() gives. */
export function largest<T = number>(values: ArrayLike<T>, pick?: (value: T) => number): number {
  let best = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const value = pick ? pick(values[i]!) : (values[i] as unknown as number);
    if (value > best || Number.isNaN(value)) best = value;
    if (Number.isNaN(best)) return NaN;
  }
  return best;
}

/** The smallest value (of `pick(value)` when given); Infinity for an empty list, as Math.min() gives. */
export function smallest<T = number>(values: ArrayLike<T>, pick?: (value: T) => number): number {
  let best = Infinity;
  for (let i = 0; i < values.length; i++) {
    const value = pick ? pick(values[i]!) : (values[i] as unknown as number);
    if (value < best || Number.isNaN(value)) best = value;
    if (Number.isNaN(best)) return NaN;
  }
  return best;
}
