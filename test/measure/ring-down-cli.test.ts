/**
 * Ring-down through the real command line: a bank of two groups fired 150 µs apart into a shorted load, its
 * current and the voltage across the short recorded as a scope export (the model's own shot at known values,
 * seeded noise). With two groups the module's and the feed's values are separable (the parallel groups
 * share the feed), so `fit` finds module and feed L and R; `--carry-into` writes them into a launch scenario
 * of the same bank. And the bad inputs of a ring-down: one line naming the file or option, exit code 2.
 */
import { readFileSync, rmSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { interpolateSorted } from '../../src/core/interpolate.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { railpulse, railpulseAsync, type CliResult } from './cli-fixture.js';
import { seededNormal } from './random.js';
import { refusalLine } from './one-line.js';

const module = (inductance: string, resistance: string, trigger: string) => ({ label: `G ${trigger}`, capacitance: '500 uF', voltage: '3 kV', esr: '2 mohm', inductance, resistance, trigger });
const ringDown = (moduleL: string, moduleR: string, feedL: string, feedR: string) => ({
  name: 'two-group ring-down (invented)',
  bank: [module(moduleL, moduleR, '0 us'), module('4 uH', '3 mohm', '150 us')],
  feed: { inductance: feedL, resistance: feedR },
  load: { kind: 'short', inductance: '20 nH' },
});
const TRUTH = { 'bank[0].inductance': 4.4e-6, 'bank[0].resistance': 4.5e-3, 'feed.inductance': 0.35e-6, 'feed.resistance': 1.2e-3 };
const LAUNCH = {
  name: 'two-group launch (invented)',
  bank: [module('4 uH', '3 mohm', '0 us'), module('4 uH', '3 mohm', '150 us')].map((g) => ({ ...g, voltage: '8 kV' })),
  feed: { inductance: '0.25 uH', resistance: '0.8 mohm' },
  rails: { length: '0.8 m', inductanceGradient: '0.45 uH/m' },
  armature: { mass: '10 g' },
};

let dir: string;
const file = (name: string): string => join(dir, name);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-ring-'));
  const shot = runShot(scenarioFromRaw(ringDown('4.4 uH', '4.5 mohm', '0.35 uH', '1.2 mohm')));
  const w = shot.waveforms!;
  const times = Array.from({ length: 800 }, (_, k) => k / 1e6); // 1 µs grid: both triggers are on it
  const current = interpolateSorted(w.t, w.current, times);
  const voltage = interpolateSorted(w.t, w.breechVoltage, times);
  const normal = seededNormal(4);
  const rows = times.map((t, k) => `${(t * 1e6).toFixed(1)},${((current[k]! + 30 * normal()) / 1e3).toFixed(5)},${(voltage[k]! + 0.05 * normal()).toFixed(4)}`);
  writeFileSync(file('ring.csv'), ['t [us],I [kA],V_breech [V]', ...rows].join('\n') + '\n');
  writeFileSync(file('ring.json'), JSON.stringify(ringDown('4 uH', '3 mohm', '0.25 uH', '0.8 mohm')));
  writeFileSync(file('launch.json'), JSON.stringify(LAUNCH));
  writeFileSync(file('launch-b.json'), JSON.stringify(LAUNCH));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('railpulse run and fit on a ring-down into a shorted load', () => {
  it('run: the shot ends "discharged" with every module off, no armature motion', () => {
    const result = railpulse(['run', file('ring.json'), '--json', '--no-report']);
    expect(result.status).toBe(0);
    const results = JSON.parse(result.stdout) as { outcome: string; finalPosition: number; muzzleVelocity: number; checks: { id: string }[] };
    expect(results.outcome).toBe('discharged');
    expect(results.finalPosition).toBe(0);
    expect(results.muzzleVelocity).toBe(0);
    // only the bank's checks apply to a ring-down
    expect(results.checks.map((c) => c.id).filter((id) => /rail|armature|contact|acceleration/.test(id))).toEqual([]);
  });

  it('fit: module and feed L and R within 4σ of the values the record was made with, and carried into the launch scenario', () => {
    const result = railpulse(['fit', file('ring.json'), file('ring.csv'), '--free', 'bank[0].inductance', '--free', 'bank[0].resistance', '--free', 'feed.inductance', '--free', 'feed.resistance', '--carry-into', file('launch.json'), '--json', '--no-report']);
    expect(result.stderr).not.toMatch(/internal error/);
    expect(result.status).toBe(0);
    const fit = JSON.parse(result.stdout) as { parameters: Record<string, { value: number; uncertainty: number }>; correlations: Record<string, number>; samples: { excluded: number[] } };
    for (const [path, value] of Object.entries(TRUTH)) {
      const p = fit.parameters[path]!;
      expect(Math.abs(p.value - value), path).toBeLessThan(4 * p.uncertainty);
    }
    for (const r of Object.values(fit.correlations)) expect(Math.abs(r)).toBeLessThan(0.95);
    // both trigger instants lie on the grid and are left out
    expect(fit.samples.excluded).toEqual(expect.arrayContaining([0, 150e-6]));
    expect(result.stderr).toContain(`carried into: ${file('launch.calibrated.json')}`);
    const carried = JSON.parse(readFileSync(file('launch.calibrated.json'), 'utf8')) as typeof LAUNCH & { bank: Record<string, unknown>[]; feed: Record<string, unknown> };
    expect(carried.bank[0]!.inductance).toBe(fit.parameters['bank[0].inductance']!.value);
    expect(carried.feed.resistance).toBe(fit.parameters['feed.resistance']!.value);
    expect(carried.bank[1]!.inductance).toBe('4 uH'); // not fitted: left as written
    expect(carried.rails.length).toBe('0.8 m');
    const run = railpulse(['run', file('launch.calibrated.json'), '--json', '--no-report']);
    expect(run.status).toBe(0);
    expect((JSON.parse(run.stdout) as { outcome: string }).outcome).toBe('exited');
  });

  it('--carry-to-all-groups: a value fitted for one group goes to every group of the launch', () => {
    const result = railpulse(['fit', file('ring.json'), file('ring.csv'), '--free', 'bank[0].resistance', '--carry-into', file('launch-b.json'), '--carry-to-all-groups', '--no-report']);
    expect(result.status).toBe(0);
    const carried = JSON.parse(readFileSync(file('launch-b.calibrated.json'), 'utf8')) as { bank: { resistance: unknown }[] };
    expect(carried.bank[1]!.resistance).toBe(carried.bank[0]!.resistance);
    expect(typeof carried.bank[0]!.resistance).toBe('number');
  });
});

describe('ring-down bad input: one line naming the file, path or option, exit 2', () => {
  const cases: Record<string, Promise<CliResult>> = {};
  beforeAll(() => {
    writeFileSync(file('with-rails.json'), JSON.stringify({ ...ringDown('4 uH', '3 mohm', '0.25 uH', '0.8 mohm'), rails: { length: '1 m', inductanceGradient: '0.4 uH/m' } }));
    writeFileSync(file('with-heating.json'), JSON.stringify({ ...ringDown('4 uH', '3 mohm', '0.25 uH', '0.8 mohm'), heating: 'adiabatic' }));
    writeFileSync(file('with-limit.json'), JSON.stringify({ ...ringDown('4 uH', '3 mohm', '0.25 uH', '0.8 mohm'), limits: { peakAcceleration: '1e5 m/s^2' } }));
    writeFileSync(file('no-rails.json'), JSON.stringify({ name: 'launch without rails', bank: LAUNCH.bank, feed: LAUNCH.feed, armature: LAUNCH.armature }));
    writeFileSync(file('muzzle.csv'), 't [us],I [kA],V_muzzle [V]\n0,0,0\n1,1,1\n2,2,2\n');
    // a time base off by milliseconds: the whole record lies after the model's end (1 µs)
    writeFileSync(file('late.csv'), 't [us],I [kA]\n5000,0\n5001,0.2\n5002,0.5\n');
    writeFileSync(file('late-ring.json'), JSON.stringify({ ...ringDown('4 uH', '3 mohm', '0.25 uH', '0.8 mohm'), solver: { endTime: '1 us' } }));
    cases.rails = railpulseAsync(['run', file('with-rails.json')]);
    cases.limit = railpulseAsync(['run', file('with-limit.json')]);
    cases.heating = railpulseAsync(['run', file('with-heating.json')]);
    cases.noRails = railpulseAsync(['run', file('no-rails.json')]);
    cases.muzzle = railpulseAsync(['overlay', file('ring.json'), file('muzzle.csv')]);
    cases.free = railpulseAsync(['fit', file('ring.json'), file('ring.csv'), '--free', 'rails.inductanceGradient']);
    cases.unusable = railpulseAsync(['fit', file('late-ring.json'), file('late.csv'), '--free', 'bank[0].inductance', '--no-report']);
    cases.unusableOverlay = railpulseAsync(['overlay', file('late-ring.json'), file('late.csv'), '--no-report']);
  });
  const oneLine = (name: string): Promise<string> => refusalLine(cases[name]!);

  it('a shorted load given rails (a launch-only key)', async () => {
    expect(await oneLine('rails')).toMatch(new RegExp(`${file('with-rails.json')}: rails: is a launch-only key: this scenario fires the bank into a shorted load`));
  });
  it('a shorted load given a launch-only check limit', async () => {
    expect(await oneLine('limit')).toMatch(/with-limit\.json: limits\.peakAcceleration: is a launch-only limit/);
  });
  it('a shorted load given adiabatic heating (it heats rails and an armature the short does not have)', async () => {
    expect(await oneLine('heating')).toMatch(/with-heating\.json: heating: heats the rails and the armature, which a shorted load/);
  });
  it('a launch without rails still names the missing key', async () => {
    expect(await oneLine('noRails')).toMatch(/no-rails\.json: rails: missing required key/);
  });
  it('a ring-down record with a muzzle voltage column', async () => {
    expect(await oneLine('muzzle')).toMatch(/muzzle\.csv: has a V_muzzle column, but the scenario fires into a shorted load/);
  });
  it('fitting a rail parameter of a ring-down', async () => {
    expect(await oneLine('free')).toMatch(/--free: rails\.inductanceGradient is a launch parameter/);
  });
  it('a record with no usable sample after the switching rule', async () => {
    expect(await oneLine('unusable')).toMatch(/late\.csv: no usable samples/);
    expect(await oneLine('unusableOverlay')).toMatch(/late\.csv: no usable samples: 3 of 3 lie outside the model's span/);
  });
});
