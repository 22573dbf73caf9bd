/**
 * From command-line choices to a SweepPlan: parse --vary, build the design, the manifest and the output directory.
 * No I/O (the directory is only named here; sweep.ts creates it).
 */
import { InputError } from '../core/errors.js';
import type { Scenario } from '../scenario/types.js';
import { makeDesign, type DesignKind } from './design.js';
import { MANIFEST_FORMAT, SHARD_RULE, defaultStudyDir, type ShardSpec, type StudyManifest } from './output.js';
import { isReadAtLoad, setPath } from '../scenario/paths.js';
import { pointScenario } from './batch.js';
import { studyLayout } from './rows.js';
import { parseVaries, type Axis, type DimensionOf } from './spec.js';
import { bankHazard, type BankHazard } from '../checks/hazard.js';
import type { SweepPlan } from './sweep.js';

export interface SweepChoices {
  scenario: Scenario;
  /** the scenario file as given, and the sha256 of its bytes */
  source: { file: string; sha256: string };
  vary: string[];
  design?: DesignKind;
  samples?: number;
  seed?: number;
  shard?: ShardSpec | null;
  out?: string;
  resume?: boolean;
  dimensionOf: DimensionOf;
  now?: Date;
  /** where default study directories go (default `studies`) */
  studiesRoot?: string;
  /** add the standard uncertainties of the headline results at every point */
  uncertainty?: boolean;
  /**
   * the scenario file as written: with it, rail and armature geometry and materials may be varied, each point being
   * read again from the file with its values (they are turned into L′, R′, mass… when a file is read)
   */
  raw?: Record<string, unknown>;
}

/** `--shard i/n`: 1 ≤ i ≤ n. */
export function parseShard(text: string): ShardSpec {
  const match = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  const index = Number(match?.[1]);
  const count = Number(match?.[2]);
  if (!match || count < 1 || index < 1 || index > count) {
    throw new InputError('--shard', `expected i/n with 1 ≤ i ≤ n (e.g. 2/8 for the second of eight shards), got "${text}"`);
  }
  return { index, count };
}

/** A whole number option (--samples, --seed, --jobs). */
export function parseWholeNumber(option: string, text: string, min: number): number {
  const value = Number(text);
  if (!/^\s*\d+\s*$/.test(text) || !Number.isSafeInteger(value) || value < min) {
    throw new InputError(option, `expected a whole number ≥ ${min}, got "${text}"`);
  }
  return value;
}

/** The bank with each group at its largest count, capacitance and charge voltage over the design: an upper bound. */
export function designSafety(scenario: Scenario, axes: readonly Axis[]): BankHazard {
  const largest = (path: string, base: number): number => {
    const axis = axes.find((a) => a.path === path);
    return axis ? Math.max(axis.max, ...axis.values) : base;
  };
  const bank = scenario.bank.map((group, i) => ({
    count: largest(`bank[${i}].count`, group.count),
    capacitance: largest(`bank[${i}].capacitance`, group.capacitance),
    voltage: largest(`bank[${i}].voltage`, group.voltage),
  }));
  return bankHazard(bank, scenario.limits);
}

export function makeSweepPlan(choices: SweepChoices): SweepPlan {
  const axes = parseVaries(choices.vary, choices.scenario, choices.dimensionOf, { readAgain: choices.raw !== undefined });
  const design = makeDesign(axes, { kind: choices.design ?? 'grid', samples: choices.samples, seed: choices.seed ?? 1 });
  const shard = choices.shard ?? null;
  if (shard && shard.count > design.count) {
    throw new InputError('--shard', `${shard.count} shards for ${design.count} points would leave shards empty`);
  }
  const manifest: StudyManifest = {
    format: MANIFEST_FORMAT,
    scenario: { file: choices.source.file, name: choices.scenario.name, sha256: choices.source.sha256 },
    vary: axes.map((axis) => ({ path: axis.path, spec: axis.spec })),
    design: { kind: design.kind, samples: design.kind === 'grid' ? null : design.count, seed: design.seed },
    points: design.count,
    shard: shard ? { ...shard, rule: SHARD_RULE } : null,
    columns: studyLayout(choices.scenario, axes.map((axis) => axis.path), choices.uncertainty ?? false).columns,
    created: (choices.now ?? new Date()).toISOString(),
    safety: designSafety(choices.scenario, axes),
  };
  const outDir = choices.out ?? defaultStudyDir(manifest, choices.now ?? new Date(), choices.studiesRoot);
  const readAgain = choices.raw !== undefined && axes.some((axis) => isReadAtLoad(axis.path));
  return { scenario: choices.scenario, ...(readAgain ? { raw: choices.raw } : {}), design, manifest, outDir, resume: choices.resume ?? false };
}

/**
 * Check each axis's values one at a time against the scenario's range checks, so a value that can never be valid
 * (a negative mass, a zero inductance) is one clear error before anything runs. Combinations that are invalid
 * together are recorded per point instead.
 */
export function checkAxes(plan: SweepPlan, validate: (scenario: Scenario) => void): void {
  for (const axis of plan.design.axes) {
    // Each range check is an interval, so a range's ends decide for every value between them; a list's values
    // are checked one by one (a list is as long as a command line).
    const values = plan.design.kind === 'grid' && axis.kind === 'list' ? axis.values : [axis.min, axis.max];
    const probe = structuredClone(plan.scenario);
    for (const value of values) {
      try {
        // a value read at load is checked by reading the file with it (the geometry's own checks, L′ from it)
        if (plan.raw && isReadAtLoad(axis.path)) pointScenario(plan.scenario, plan.raw, [axis.path], [axis.steps], Float64Array.of(value));
        else {
          setPath(probe, axis.steps, value);
          validate(probe);
        }
      } catch (error) {
        if (!(error instanceof InputError)) throw error;
        throw new InputError('--vary', `${axis.path} = ${value} (SI) is not allowed: ${error.problem}`);
      }
    }
  }
}
