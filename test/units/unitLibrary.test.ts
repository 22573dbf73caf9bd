/**
 * The demo scenarios load, run and propagate their tolerances without the unit library (mathjs) being loaded:
 * their values are all read by the fast reader. A value it declines still loads mathjs and reads the same.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadScenarioFile } from '../../src/scenario/load.js';
import { shoot } from '../../src/pipeline/shoot.js';
import { runShot } from '../../src/solve/shot.js';
import { shotUncertainty } from '../../src/study/shotUncertainty.js';
import { DIMENSIONS, toSI } from '../../src/units/quantity.js';
import { unitLibraryLoaded } from '../../src/units/unitLibrary.js';
import { demoFiles, SCENARIO_DIR } from '../regression/demo-results.js';

describe('the unit library is loaded only when a value needs it', () => {
  it('not for the demo scenarios', async () => {
    for (const file of demoFiles()) {
      const loaded = loadScenarioFile(join(SCENARIO_DIR, file));
      await shotUncertainty(shoot(loaded, { waveforms: false }), { runShot, waveforms: false });
    }
    expect(unitLibraryLoaded()).toBe(false);
  });
  it('for a value the fast reader declines (a unit outside its table), read as mathjs reads it', () => {
    // 1 in = 0.0254 m exactly (international inch, NIST SP 811 appendix B)
    expect(toSI('2 in', DIMENSIONS.length)).toBeCloseTo(0.0508, 15);
    expect(unitLibraryLoaded()).toBe(true);
  });
});
