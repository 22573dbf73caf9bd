/**
 * A synthetic "fired shot" for the measure CLI tests: an invented bench scenario is simulated with the real
 * solver, and its current and breech voltage are written as a scope export (with a trigger offset, a mapped
 * probe column and seeded Gaussian noise), plus probe arrival times (with seeded jitter) and the muzzle velocity. Then the
 * scenario is perturbed to play "yesterday's scenario" that the fit must correct.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawn, spawnSync } from 'node:child_process';
import { interpolateSorted } from '../../src/core/interpolate.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { seededNormal } from './random.js';

/** An invented bench: 1 mF at 5 kV through 10 µH with a crowbar, 1 g armature on 0.5 m rails, friction. */
export const TRUTH_RAW = {
  name: 'measured bench (invented)',
  description: 'Invented bench for the measure tests.',
  bank: [{ capacitance: '1 mF', voltage: '5 kV', inductance: '3 uH', esr: '5 mohm', resistance: '10 mohm', crowbar: { drop: '1 V', resistance: '1 mohm' } }],
  feed: { inductance: '1 uH', resistance: '3 mohm' },
  rails: { length: '0.5 m', inductanceGradient: '0.45 uH/m', resistanceGradient: '0.2 mohm/m' },
  armature: { mass: '1 g', resistance: '0.1 mohm', contactResistance: '0.5 mohm' },
  friction: { coefficient: 0.2, preload: '40 N' },
  solver: { endTime: '10 ms', sampleInterval: '1 us' },
};

export const TRUTH = {
  'rails.inductanceGradient': 0.45e-6,
  'armature.contactResistance': 0.5e-3,
  'friction.coefficient': 0.2,
};

/** Yesterday's scenario: the three fitted values off by +20 %, −30 %, +40 %, written with units. */
export const PERTURBED_RAW = {
  ...TRUTH_RAW,
  rails: { ...TRUTH_RAW.rails, inductanceGradient: '0.54 uH/m' },
  armature: { ...TRUTH_RAW.armature, contactResistance: '0.35 mohm' },
  friction: { coefficient: 0.28, preload: '40 N' },
};

export const NOISE = { I: 150, V_breech: 0.5 }; // A, V: about 0.4 % and 0.7 % of the peaks
export const PROBE_JITTER = 1e-6; // s, one standard deviation of a probe's arrival time
export const TRIGGER_OFFSET_US = 2; // the scope's time axis starts 2 µs late: t_file = t_true − 2 µs

export interface Fixture {
  dir: string;
  scenario: string;
  truthScenario: string;
  csv: string;
  positions: string;
  muzzleVelocity: number;
  exitTime: number;
}

export function makeFixture(seed = 7): Fixture {
  const dir = mkdtempSync(join(tmpdir(), 'railpulse-measure-'));
  const truth = scenarioFromRaw(TRUTH_RAW);
  const shot = runShot(truth);
  const w = shot.waveforms!;
  if (shot.results.outcome !== 'exited') throw new Error(`fixture shot did not exit (${shot.results.outcome})`);
  const exitTime = shot.results.exitTime!;
  // a 2 µs-sampled record to just before exit (the scope keeps recording, the model stops at exit)
  const times = Array.from({ length: Math.floor(exitTime / 2e-6) }, (_, k) => k * 2e-6);
  const current = interpolateSorted(w.t, w.current, times);
  const breech = interpolateSorted(w.t, w.breechVoltage, times);
  const normal = seededNormal(seed);
  const lines = [
    '"Model","DSO-invented 4ch"',
    '"Record length","' + times.length + '"',
    '"Probe CH1","Rogowski 10 kA/V"',
    't [us],CH1 [V],V_breech [kV]',
    ...times.map((t, k) => {
      const amps = current[k]! + NOISE.I * normal();
      const volts = breech[k]! + NOISE.V_breech * normal();
      return `${(t * 1e6 - TRIGGER_OFFSET_US).toFixed(3)},${(amps / 1e4).toFixed(6)},${(volts / 1e3).toFixed(6)}`;
    }),
  ];
  const csv = join(dir, 'shot-042.csv');
  writeFileSync(csv, lines.join('\n') + '\n');
  // probes at 10, 20 cm and at the muzzle: arrival times by inverting x(t) of the true shot
  const probeX = [0.1, 0.2, 0.3, 0.4, 0.5];
  const probeT = probeX.map((x) => {
    const k = w.position.findIndex((p) => p >= x);
    if (k <= 0) return exitTime;
    return w.t[k - 1]! + ((x - w.position[k - 1]!) * (w.t[k]! - w.t[k - 1]!)) / (w.position[k]! - w.position[k - 1]!);
  });
  // the probes' timing jitter: σ = 1 µs, the fit's default arrival-time uncertainty
  const jittered = probeT.map((t) => t + PROBE_JITTER * normal());
  const positions = join(dir, 'probes.csv');
  writeFileSync(positions, 'x [m],t [us]\n' + probeX.map((x, i) => `${x},${(jittered[i]! * 1e6).toFixed(4)}`).join('\n') + '\n');
  const scenario = join(dir, 'bench.json');
  writeFileSync(scenario, JSON.stringify(PERTURBED_RAW, null, 2) + '\n');
  const truthScenario = join(dir, 'truth.json');
  writeFileSync(truthScenario, JSON.stringify(TRUTH_RAW, null, 2) + '\n');
  return { dir, scenario, truthScenario, csv, positions, muzzleVelocity: shot.results.muzzleVelocity, exitTime };
}

/** The CSV options that read the fixture's scope export. */
export function csvOptions(fixture: Fixture): string[] {
  return ['--map', 'CH1=I', '--unit', 'CH1=kA', '--scale', 'CH1=10', '--offset', `t=${TRIGGER_OFFSET_US}us`, '--positions', fixture.positions];
}

const CLI = join(process.cwd(), 'bin', 'railpulse.js');

export interface CliResult {
  status: number | null;
  stdout: string;
  stderr: string;
}

// a fixed record date (2026-12-02T12:00Z) so names and descriptions are predictable
const ENV = { ...process.env, SOURCE_DATE_EPOCH: '1796212800' };

export function railpulse(args: string[], cwd = process.cwd()): CliResult {
  const result = spawnSync(process.execPath, [CLI, ...args], { cwd, encoding: 'utf8', env: ENV });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

/** The same, without blocking: independent invocations run side by side (each one mostly pays start-up). */
export function railpulseAsync(args: string[], cwd = process.cwd()): Promise<CliResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [CLI, ...args], { cwd, env: ENV });
    let stdout = '';
    let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (d: string) => (stdout += d));
    child.stderr.setEncoding('utf8').on('data', (d: string) => (stderr += d));
    child.on('error', reject);
    child.on('close', (status) => resolve({ status, stdout, stderr }));
  });
}
