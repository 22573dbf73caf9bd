/**
 * mathjs, the unit reader, loaded on first use. Setting it up costs more than the rest of a `run` start-up, and
 * most scenarios never need it (their values are plain numbers or simple "number unit" strings, read by
 * fastQuantity.ts), so nothing imports it at module load.
 *
 * Loaded synchronously, because the scenario loaders are synchronous: from the bundled CLI, the CommonJS bundle
 * dist/unit-library.cjs beside it (only mathjs's `unit`, built by scripts/build.mjs); from the sources (tests,
 * benchmarks), the mathjs package itself.
 */
import { createRequire } from 'node:module';
import type { Unit } from 'mathjs';

export type { Unit };

/** Set by the bundler (scripts/build.mjs `define`) in the bundled CLI; undefined when running the sources. */
declare const RAILPULSE_BUNDLED_UNIT_LIBRARY: string | undefined;

type UnitFunction = (text: string) => Unit;

let unitFunction: UnitFunction | null = null;

/** Has the unit library been loaded in this process? (the start-up benchmark and its test ask) */
export function unitLibraryLoaded(): boolean {
  return unitFunction !== null;
}

/** mathjs's `unit(text)`, loading the library on the first call. */
export function mathUnit(text: string): Unit {
  if (!unitFunction) {
    const require = createRequire(import.meta.url);
    const library = typeof RAILPULSE_BUNDLED_UNIT_LIBRARY === 'string' ? RAILPULSE_BUNDLED_UNIT_LIBRARY : 'mathjs';
    unitFunction = (require(library) as { unit: UnitFunction }).unit;
  }
  return unitFunction(text);
}
