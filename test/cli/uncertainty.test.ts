/**
 * The uncertainty of a shot through the real commands: `run --json` carries the `uncertainty` key (the six
 * standard uncertainties in SI), a Monte Carlo on request, a calibration written by `fit` is propagated by `run`,
 * and every malformed uncertainty input is one line naming its path with exit code 2.
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'railpulse-uncertainty-'));
const bench = JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8')) as Record<string, unknown>;
const HEADLINE = ['muzzleVelocity', 'exitTime', 'peakCurrent', 'efficiency', 'peakAcceleration', 'actionIntegral'];

function railpulse(args: string[]) {
  return spawnSync(process.execPath, ['bin/railpulse.js', ...args], { encoding: 'utf8', timeout: 240_000 });
}

function scenarioFile(name: string, extra: Record<string, unknown>): string {
  const file = join(dir, `${name}.json`);
  writeFileSync(file, JSON.stringify({ ...bench, ...extra }, null, 2));
  return file;
}

describe('run with tolerances and a calibration', () => {
  it('run --json on the staggered demo holds the standard uncertainty of each headline result (SI) and how it was found', () => {
    const result = railpulse(['run', 'scenarios/staggered-bank.json', '--json', '--no-report']);
    expect(result.status).toBe(0);
    const json = JSON.parse(result.stdout) as Record<string, any>;
    for (const key of HEADLINE) {
      expect(json.uncertainty[key], key).toBeGreaterThan(0);
      expect(json.uncertainty[key], key).toBeLessThan(0.2 * Math.abs(json[key]));
      const [low, high] = json.uncertainty.interval[key];
      // the 95 % interval is ±1.959964σ (tables of the normal distribution)
      expect((high - low) / (2 * 1.959963985 * json.uncertainty[key])).toBeCloseTo(1, 8);
    }
    expect(json.uncertainty.inputs).toHaveLength(12);
    expect(json.uncertainty.shots).toBe(1 + 4 * 12 - 1); // the nominal shot is the run's own
    expect(json.uncertainty.outcome).toBe('exited');
  });

  it('--monte-carlo N --seed S adds percentiles and outcome shares; the same seed gives the same numbers', () => {
    const file = scenarioFile('tolerant', { tolerances: [{ path: 'bank[0].capacitance', uniform: '5 %' }, { path: 'rails.inductanceGradient', normal: '2 %' }], target: { muzzleVelocity: '400 m/s' } });
    const once = railpulse(['run', file, '--json', '--no-report', '--monte-carlo', '60', '--seed', '5', '--jobs', '2']);
    expect(once.status).toBe(0);
    const mc = (JSON.parse(once.stdout) as Record<string, any>).uncertainty.monteCarlo;
    expect(mc.ran).toBe(60);
    expect(mc.seed).toBe(5);
    expect(Object.values(mc.outcomes).reduce((a: number, b) => a + (b as number), 0)).toBe(60);
    expect(mc.results.muzzleVelocity.percentiles['50']).toBeGreaterThan(0);
    expect(mc.target.velocity).toBe(400);
    const again = railpulse(['run', file, '--json', '--no-report', '--monte-carlo', '60', '--seed', '5', '--jobs', '1']);
    const mc2 = (JSON.parse(again.stdout) as Record<string, any>).uncertainty.monteCarlo;
    expect(mc2.results).toEqual(mc.results);
  });

  it('fit writes a calibration that run propagates: inputs from the calibration, with the record and its SHA-256', () => {
    const scenario = join(dir, 'bench.json');
    copyFileSync('scenarios/bench-shot.json', scenario);
    const fit = railpulse(['fit', scenario, 'scenarios/measured/bench-shot-17.csv', '--map', 'CH1=I', '--unit', 'CH1=kA', '--free', 'rails.inductanceGradient', '--free', 'armature.contactResistance', '--report', dir]);
    expect(fit.status).toBe(0);
    const calibratedPath = /calibrated scenario: (.*)$/m.exec(fit.stdout)![1]!;
    const calibrated = JSON.parse(readFileSync(calibratedPath, 'utf8')) as Record<string, any>;
    expect(calibrated.calibration.parameters).toEqual(['rails.inductanceGradient', 'armature.contactResistance']);
    expect(calibrated.calibration.record).toBe('bench-shot-17.csv');
    expect(calibrated.calibration.recordSha256).toMatch(/^[0-9a-f]{64}$/);
    // a prediction at another charge voltage
    calibrated.bank[0].voltage = '7 kV';
    const next = join(dir, 'next-shot.json');
    writeFileSync(next, JSON.stringify(calibrated, null, 2));
    const run = railpulse(['run', next, '--json', '--no-report']);
    expect(run.status).toBe(0);
    const json = JSON.parse(run.stdout) as Record<string, any>;
    expect(json.uncertainty.inputs.map((input: { source: string }) => input.source)).toEqual(['calibration', 'calibration']);
    expect(json.uncertainty.muzzleVelocity).toBeGreaterThan(0);
  });
});

describe('bad uncertainty input: one line naming the path, exit code 2', () => {
  const covariance = [[1e-18, 3e-17], [1e-17, 1e-14]];
  const calibration = { parameters: ['rails.inductanceGradient', 'armature.contactResistance'], values: [0.45e-6, 1e-4], covariance, record: 'x.csv', recordSha256: 'a'.repeat(64), date: '2026-01-02' };
  it.each([
    ['asymmetric', { calibration }, /calibration\.covariance\[0\]\[1\]: the covariance must be symmetric/],
    ['not-psd', { calibration: { ...calibration, covariance: [[1e-18, 2e-16], [2e-16, 1e-14]] } }, /calibration\.covariance: the covariance is not positive semi-definite/],
    ['no-path', { tolerances: [{ path: 'bank[1].voltage', normal: '10 V' }] }, /tolerances\[0\]\.path: bank\[1\]\.voltage: the bank has 1 group/],
    ['contradictory', { calibration: { ...calibration, covariance: [[1e-18, 0], [0, 1e-14]] }, tolerances: [{ path: 'rails.inductanceGradient', normal: '1 %' }] }, /tolerances\[0\]\.path: rails\.inductanceGradient is calibrated/],
  ])('run: %s', (name, extra, pattern) => {
    const result = railpulse(['run', scenarioFile(name, extra), '--json', '--no-report']);
    expect(result.status).toBe(2);
    expect(result.stdout).toBe('');
    const lines = result.stderr.trimEnd().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(pattern);
  });

  it.each([
    ['1.5', /target\.confidence: expected a probability between 0 and 1/],
    ['0', /target\.confidence: expected a probability between 0 and 1/],
    ['"95"', /target\.confidence: expected a probability between 0 and 1/],
  ])('size: a confidence of %s', (confidence, pattern) => {
    const file = scenarioFile(`confidence-${confidence.replace(/\W/g, '')}`, { target: { muzzleVelocity: '400 m/s', confidence: JSON.parse(confidence) } });
    const result = railpulse(['size', file, '--no-report']);
    expect(result.status).toBe(2);
    const lines = result.stderr.trimEnd().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(pattern);
  });

  it('run: --band outside (0, 1) and --monte-carlo without anything uncertain', () => {
    const band = railpulse(['run', scenarioFile('band', { tolerances: [{ path: 'armature.mass', normal: '0.01 g' }] }), '--json', '--no-report', '--band', '1.2']);
    expect(band.status).toBe(2);
    expect(band.stderr.trim()).toMatch(/--band: expected a coverage probability between 0 and 1/);
    const plain = railpulse(['run', 'scenarios/bench-shot.json', '--json', '--no-report', '--monte-carlo', '10']);
    expect(plain.status).toBe(2);
    expect(plain.stderr.trim()).toMatch(/--monte-carlo: the scenario has no tolerances and no calibration/);
  });
});
