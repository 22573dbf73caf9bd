/**
 * Values a loaded scenario does not read as written (derived at load, or unused by the chosen model) cannot be
 * swept, fitted or given a tolerance: each entry point refuses them with one line naming the path, exit 2.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadScenarioFile } from '../../src/scenario/load.js';
import { inertPathProblem } from '../../src/scenario/paths.js';
import { railsDerivedJson } from '../../src/checks/shotChecks.js';
import { railpulse } from '../measure/cli-fixture.js';

const dir = mkdtempSync(join(tmpdir(), 'railpulse-inert-'));
const geometry = JSON.parse(readFileSync('scenarios/geometry-shot.json', 'utf8')) as Record<string, unknown>;
delete geometry.$schema;

function write(name: string, scenario: unknown): string {
  const file = join(dir, name);
  writeFileSync(file, JSON.stringify(scenario));
  return file;
}

describe('paths a study, a fit or a tolerance may not move', () => {
  it('R′ under current diffusion is only the floor; with a constant R′ it is an input', () => {
    const diffusing = loadScenarioFile('scenarios/geometry-shot.json').scenario;
    expect(inertPathProblem(diffusing, 'rails.resistanceGradient')).toMatch(/uniform-current floor/);
    const constant = loadScenarioFile(write('quarter.json', { ...geometry, rails: { ...(geometry.rails as object), resistanceModel: 'quarter-period' } })).scenario;
    expect(inertPathProblem(constant, 'rails.resistanceGradient')).toBeNull();
    expect(inertPathProblem(diffusing, 'rails.inductanceGradient')).toBeNull();
    expect(inertPathProblem(diffusing, 'solver.diffusionRate')).toMatch(/when the file is read/);
  });

  it('geometry and materials are read once, when the file is read: moving them later would change no result', () => {
    const loaded = loadScenarioFile('scenarios/geometry-shot.json').scenario;
    for (const path of ['rails.geometry.separation', 'rails.geometry.height', 'rails.material.resistivity', 'armature.geometry.length', 'armature.material.density']) {
      expect(inertPathProblem(loaded, path), path).toMatch(/when the file is read.*would not change the shot/);
    }
    expect(inertPathProblem(loaded, 'rails.geometry.separation')).toMatch(/vary rails\.inductanceGradient/);
    expect(inertPathProblem(loaded, 'armature.geometry.length')).toMatch(/vary armature\.mass and armature\.resistance/);
    const transition = loadScenarioFile(
      write('transition.json', { ...geometry, armature: { ...(geometry.armature as object), transition: { specificAction: 1e12, contactArea: 1e-4, arcDrop: 60 } } }),
    ).scenario;
    expect(inertPathProblem(transition, 'armature.transition.action')).toMatch(/specificAction × contactArea²/);
    expect(inertPathProblem(transition, 'armature.transition.specificAction')).toBeNull();
    // without the section there is nothing to refuse: the caller's "no such value" answers
    expect(inertPathProblem(loaded, 'armature.transition.action')).toBeNull();
    const plain = loadScenarioFile('scenarios/bench-shot.json').scenario;
    expect(inertPathProblem(plain, 'rails.geometry.height')).toBeNull();
    // what they become is an input: the shot reads it as set
    for (const path of ['rails.inductanceGradient', 'armature.mass', 'armature.resistance', 'rails.length']) expect(inertPathProblem(loaded, path), path).toBeNull();
    // a sweep reads each point's file again (test/study/geometry-sweep.test.ts); a fit and a tolerance refuse them
    expect(inertPathProblem(loaded, 'rails.geometry.separation', { readAgain: true })).toBeNull();
    const fit = railpulse(['fit', 'scenarios/geometry-shot.json', join(dir, 'none.csv'), '--free', 'rails.geometry.separation']);
    expect(fit.status).toBe(2);
    expect(fit.stderr.trim().split('\n')).toHaveLength(1);
    expect(fit.stderr).toMatch(/--free: rails\.geometry\.separation is turned into model inputs/);
    const tolerance = write('geometry-tolerance.json', { ...geometry, tolerances: [{ path: 'rails.geometry.height', normal: '0.1 mm' }] });
    const run = railpulse(['run', tolerance, '--json', '--no-report']);
    expect(run.status).toBe(2);
    expect(run.stderr.trim().split('\n')).toHaveLength(1);
    expect(run.stderr).toMatch(/rails\.geometry\.height: is turned into model inputs/);
  });

  it('the strong-shock drag model does not read a drag coefficient', () => {
    const shock = loadScenarioFile(write('shock.json', { ...geometry, drag: { model: 'strong-shock', gasDensity: '1.2 kg/m^3', boreArea: '1.5 cm^2' } })).scenario;
    expect(inertPathProblem(shock, 'drag.dragCoefficient')).toMatch(/not read by the strong-shock/);
    expect(inertPathProblem(shock, 'drag.gasDensity')).toBeNull();
  });

  it('sweep, fit and a tolerance refuse R′ under diffusion with one line and exit 2', () => {
    const sweep = railpulse(['sweep', 'scenarios/geometry-shot.json', '--vary', 'rails.resistanceGradient=0.3mohm/m,0.5mohm/m', '--out', join(dir, 'study')]);
    expect(sweep.status).toBe(2);
    expect(sweep.stderr.trim().split('\n')).toHaveLength(1);
    expect(sweep.stderr).toMatch(/--vary: rails\.resistanceGradient follows current diffusion/);
    const fit = railpulse(['fit', 'scenarios/geometry-shot.json', join(dir, 'none.csv'), '--free', 'rails.resistanceGradient']);
    expect(fit.status).toBe(2);
    expect(fit.stderr).toMatch(/--free: rails\.resistanceGradient follows current diffusion/);
    const tolerance = write('tolerance.json', { ...geometry, tolerances: [{ path: 'rails.resistanceGradient', normal: '5 %' }] });
    const run = railpulse(['run', tolerance, '--json', '--no-report']);
    expect(run.status).toBe(2);
    expect(run.stderr.trim().split('\n')).toHaveLength(1);
    expect(run.stderr).toMatch(/rails\.resistanceGradient.*uniform-current floor/);
  });

  it('railsDerived says where R′ came from: diffusion, the quarter-period constant, a given number, or none', () => {
    const rails = geometry.rails as Record<string, unknown>;
    const model = (extra: Record<string, unknown>, drop: string[] = []) => {
      const r = { ...rails, ...extra };
      for (const key of drop) delete r[key];
      return railsDerivedJson(loadScenarioFile(write(`r${Object.keys(extra).join('-')}${drop.join('-')}.json`, { ...geometry, rails: r })).scenario)!;
    };
    // before a shot there is no loss-equivalent R′ under diffusion
    expect(model({})).toMatchObject({ resistanceModel: 'diffusion', resistanceGradient: null });
    const quarter = model({ resistanceModel: 'quarter-period' });
    expect(quarter.resistanceModel).toBe('quarter-period');
    expect(quarter.resistanceGradient).toBeGreaterThan(quarter.resistanceGradientDC!);
    expect(model({ resistanceGradient: '0.4 mohm/m' })).toMatchObject({ resistanceModel: 'given', resistanceGradient: 0.0004 });
    expect(model({}, ['material'])).toMatchObject({ resistanceModel: 'none', resistanceGradient: 0 });
  });
});
