/**
 * A sweep with --uncertainty: every row carries the standard uncertainties of the headline results at its own
 * point, equal to a linear propagation of that point alone (relative tolerances scale with the swept value), and
 * the CSV gets the uncertainty.<result> columns after the results.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { dimensionOfPath, scenarioFromRaw, validateScenario } from '../../src/scenario/load.js';
import { parsePath, setPath } from '../../src/scenario/paths.js';
import { runShot } from '../../src/solve/shot.js';
import { makeSweepPlan } from '../../src/study/plan.js';
import { propagateLinear } from '../../src/study/propagate.js';
import { UNCERTAINTY_COLUMNS } from '../../src/study/rows.js';
import { runSweep } from '../../src/study/sweep.js';
import { TWO_GROUP_FILE } from './fixtures.js';

describe('sweep --uncertainty', () => {
  it('each row holds the σ of a linear propagation at that point; the CSV has the uncertainty columns', async () => {
    const raw = JSON.parse(readFileSync(TWO_GROUP_FILE, 'utf8')) as Record<string, unknown>;
    const scenario = scenarioFromRaw({ ...raw, tolerances: [{ path: 'bank[*].voltage', normal: '1 %', common: true }, { path: 'armature.mass', uniform: '0.5 g' }] });
    const out = join(mkdtempSync(join(tmpdir(), 'railpulse-sweep-u-')), 'study');
    const plan = makeSweepPlan({ scenario, source: { file: TWO_GROUP_FILE, sha256: 'x' }, vary: ['bank[0].voltage=2kV,4kV'], dimensionOf: dimensionOfPath, out, uncertainty: true });
    const summary = await runSweep(plan, { jobs: 1, validate: (s) => validateScenario(s) });
    expect(summary.failed).toBe(0);
    const rows = readFileSync(join(out, 'points.jsonl'), 'utf8').trimEnd().split('\n').map((line) => JSON.parse(line) as Record<string, any>);
    for (const row of rows) {
      const point = structuredClone(scenario);
      setPath(point, parsePath('bank[0].voltage')!, row['bank[0].voltage']);
      const alone = propagateLinear(point, runShot, { probeSpread: false })!;
      for (const [key, sigma] of Object.entries(alone.standardUncertainty)) {
        if (sigma === null) expect(row.uncertainty[key]).toBeNull();
        else expect(row.uncertainty[key] / sigma).toBeCloseTo(1, 9);
      }
    }
    expect(rows[1]!.uncertainty.muzzleVelocity).not.toBe(rows[0]!.uncertainty.muzzleVelocity);
    const header = readFileSync(join(out, 'points.csv'), 'utf8').split('\n')[0]!.split(',');
    // right after the shot's results, before the verdicts
    const at = header.indexOf(UNCERTAINTY_COLUMNS[0]!);
    expect(header.slice(at, at + UNCERTAINTY_COLUMNS.length)).toEqual(UNCERTAINTY_COLUMNS);
    expect(header[at + UNCERTAINTY_COLUMNS.length]).toBe('verdict');
    const csvRow = readFileSync(join(out, 'points.csv'), 'utf8').split('\n')[1]!.split(',');
    expect(Number(csvRow[at])).toBe(rows[0]!.uncertainty.muzzleVelocity);
  }, 120_000);
});
