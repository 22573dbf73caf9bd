/**
 * Regression guard: every demo scenario gives the results captured in the fixture (headline figures, energy
 * ledger, modules, checks, status, uncertainty) within 1e-8 relative. Speed work on the solver, the unit reader or
 * the start-up must not move a result; a change of the model that moves them regenerates the fixture on purpose
 * (test/regression/capture-demo-results.ts) and says why in its commit.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { FIXTURE, demoFiles, demoResults, differences, type DemoResults } from './demo-results.js';

const RELATIVE = 1e-8;
const fixture = JSON.parse(readFileSync(FIXTURE, 'utf8')) as Record<string, DemoResults>;

describe('demo results stay as captured', () => {
  it('the fixture covers every demo scenario', () => {
    expect(Object.keys(fixture).sort()).toEqual(demoFiles());
  });
  for (const file of demoFiles()) {
    it(file, async () => {
      const now = await demoResults(file);
      expect(differences(fixture[file], now, RELATIVE)).toEqual([]);
    });
  }
  it('the comparison notices a change beyond 1e-8 relative (and tolerates one within)', () => {
    const base = { v: 856.890638627389, e: { losses: [1, 2] }, s: 'exited' };
    expect(differences(base, { ...base, v: 856.890638627389 * (1 + 5e-9) }, RELATIVE)).toEqual([]);
    expect(differences(base, { ...base, v: 856.890638627389 * (1 + 2e-8) }, RELATIVE)).toHaveLength(1);
    expect(differences(base, { ...base, e: { losses: [1, 2.0000001] } }, RELATIVE)).toEqual(['e.losses[1]: expected 2, got 2.0000001']);
    expect(differences(base, { ...base, s: 'stalled' }, RELATIVE)).toHaveLength(1);
  });
});
