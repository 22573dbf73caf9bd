/**
 * The results of every demo scenario, as `run --json --no-report` computes them: the shot's figures, ledger,
 * modules, checks and status (with and without waveforms recorded), and the linear uncertainty propagation.
 * Shared by the regression test and by the script that captures its fixture.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { loadScenarioFile } from '../../src/scenario/load.js';
import { resultsJson, shoot } from '../../src/pipeline/shoot.js';
import { runShot } from '../../src/solve/shot.js';
import { shotUncertainty, uncertaintyJson } from '../../src/study/shotUncertainty.js';

export const SCENARIO_DIR = 'scenarios';
export const FIXTURE = 'test/regression/fixtures/demo-results.json';

/** Every scenario file in scenarios/ except the schema. */
export function demoFiles(): string[] {
  return readdirSync(SCENARIO_DIR)
    .filter((f) => f.endsWith('.json') && !f.includes('schema'))
    .sort();
}

export interface DemoResults {
  /** results with waveforms off (as --json --no-report and sweeps run a shot) */
  results: Record<string, unknown>;
  /** results with waveforms recorded (as a record is written) */
  withWaveforms: Record<string, unknown>;
  /** the --json `uncertainty` key, or null for a scenario without tolerances */
  uncertainty: Record<string, unknown> | null;
}

const plain = (value: unknown): Record<string, unknown> =>
  JSON.parse(JSON.stringify(value, (_, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v))) as Record<string, unknown>;

export async function demoResults(file: string): Promise<DemoResults> {
  const loaded = loadScenarioFile(join(SCENARIO_DIR, file));
  const off = shoot(loaded, { waveforms: false });
  const on = shoot(loaded, { waveforms: true });
  const uncertainty = await shotUncertainty(off, { runShot, waveforms: false });
  return {
    results: plain(resultsJson(off)),
    withWaveforms: plain(resultsJson(on)),
    uncertainty: uncertainty ? plain(uncertaintyJson(uncertainty)) : null,
  };
}

/**
 * Paths where `actual` differs from `expected`: numbers by more than `relative` of the larger magnitude, anything
 * else by value. An empty list means they agree.
 */
export function differences(expected: unknown, actual: unknown, relative: number, path = ''): string[] {
  if (typeof expected === 'number' && typeof actual === 'number') {
    const scale = Math.max(Math.abs(expected), Math.abs(actual));
    return Math.abs(expected - actual) <= relative * scale ? [] : [`${path}: expected ${expected}, got ${actual}`];
  }
  if (Array.isArray(expected) && Array.isArray(actual)) {
    if (expected.length !== actual.length) return [`${path}: expected ${expected.length} entries, got ${actual.length}`];
    return expected.flatMap((e, k) => differences(e, actual[k], relative, `${path}[${k}]`));
  }
  if (expected && actual && typeof expected === 'object' && typeof actual === 'object' && !Array.isArray(expected) && !Array.isArray(actual)) {
    const keys = new Set([...Object.keys(expected), ...Object.keys(actual)]);
    return [...keys].flatMap((k) =>
      differences((expected as Record<string, unknown>)[k], (actual as Record<string, unknown>)[k], relative, path ? `${path}.${k}` : k),
    );
  }
  return expected === actual ? [] : [`${path}: expected ${JSON.stringify(expected)}, got ${JSON.stringify(actual)}`];
}
