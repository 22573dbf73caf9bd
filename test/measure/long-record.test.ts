/**
 * A scope export of two million rows (generated here in a temporary folder, never committed) through the
 * real command line: `overlay` and `fit` read it as a stream (no stack overflow from spreading the samples
 * into Math.max, no copy of the text), compare every sample but those at switching instants, and the fit
 * decimates it into block means while keeping single samples next to each switching instant. The record is
 * the model's own shot with seeded Gaussian noise, so the RMS error of the true scenario is the noise σ
 * (sampling error σ/√(2N), N = 2·10⁶: 0.05 %).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { writeLongRecord } from './long-record.js';

const ROWS = 2_000_000;
const SPAN = 1e-3; // s: 0.5 ns sampling, a 2 GS/s digitiser
const NOISE = { I: 150, V_breech: 0.2 };

/** An invented bench: one crowbarred 12 kV module on 1 m rails. */
const TRUTH = {
  name: 'long record bench (invented)',
  bank: [{ capacitance: '400 uF', voltage: '12 kV', esr: '2 mohm', inductance: '5 uH', resistance: '3 mohm', crowbar: { drop: '40 V', resistance: '1.5 mohm' } }],
  feed: { inductance: '0.3 uH', resistance: '0.8 mohm' },
  rails: { length: '1 m', inductanceGradient: '0.45 uH/m', resistanceGradient: '0.25 mohm/m' },
  armature: { mass: '20 g', position: '2 cm', resistance: '40 uohm', contactResistance: '0.1 mohm' },
  friction: { coefficient: 0.2, preload: '100 N' },
};
const START = { ...TRUTH, rails: { ...TRUTH.rails, inductanceGradient: '0.5 uH/m' }, armature: { ...TRUTH.armature, contactResistance: '0.08 mohm' } };

const CLI = join(process.cwd(), 'bin', 'railpulse.js');
const PEAK_RSS = 'data:text/javascript,process.on("exit",()=>process.stderr.write("peak-rss-kB "+process.resourceUsage().maxRSS+"\\n"))';

let dir: string;
let record: string;
let interval: number;

function cli(args: string[]): { status: number | null; stdout: string; stderr: string; peakRss: number } {
  const result = spawnSync(process.execPath, ['--import', PEAK_RSS, CLI, ...args], { encoding: 'utf8', maxBuffer: 1 << 26, env: { ...process.env, SOURCE_DATE_EPOCH: '1796212800' } });
  const peakRss = Number(/peak-rss-kB (\d+)/.exec(result.stderr)?.[1] ?? NaN) * 1024;
  return { status: result.status, stdout: result.stdout, stderr: result.stderr, peakRss };
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-long-'));
  const shot = runShot(scenarioFromRaw({ ...TRUTH, solver: { sampleInterval: '0.05 us', endTime: '10 ms' } }));
  record = join(dir, 'shot-long.csv');
  interval = writeLongRecord(record, shot, { rows: ROWS, span: SPAN, noise: NOISE, seed: 11 });
  writeFileSync(join(dir, 'truth.json'), JSON.stringify(TRUTH));
  writeFileSync(join(dir, 'start.json'), JSON.stringify(START));
}, 120_000);

afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('a two-million-row scope export', () => {
  it('overlay reads it whole, within memory, and the true scenario misses it by exactly the added noise', () => {
    const result = cli(['overlay', join(dir, 'truth.json'), record, '--json', '--no-report']);
    expect(result.stderr).not.toMatch(/RangeError|stack|internal error/i);
    expect(result.status).toBe(0);
    const goodness = JSON.parse(result.stdout) as { signals: Record<string, { rms: number; points: number }>; samples: { interval: number; excluded: number[] } };
    expect(goodness.samples.interval).toBeCloseTo(interval, 15);
    expect(goodness.signals.I!.points).toBe(ROWS - goodness.samples.excluded.length);
    expect(goodness.samples.excluded.length).toBeGreaterThan(0);
    expect(Math.abs(goodness.signals.I!.rms / NOISE.I - 1)).toBeLessThan(0.01);
    // the breech voltage is written to 1 mV: rounding adds (1 mV)²/12 to the variance, negligible
    expect(Math.abs(goodness.signals.V_breech!.rms / NOISE.V_breech - 1)).toBeLessThan(0.01);
    // three columns of 2·10⁶ doubles are 48 MB; the bound for ten million rows is 1 GB
    expect(result.peakRss).toBeLessThan(1024 ** 3);
  }, 120_000);

  it('fit decimates it into block means, keeps single samples at the switching instants, and recovers L′ and R_c', () => {
    const result = cli(['fit', join(dir, 'start.json'), record, '--free', 'rails.inductanceGradient', '--free', 'armature.contactResistance', '--json', '--no-report']);
    expect(result.stderr).not.toMatch(/RangeError|internal error/i);
    expect(result.status).toBe(0);
    const fit = JSON.parse(result.stdout) as {
      parameters: Record<string, { value: number; uncertainty: number }>;
      residual: { chiSquaredReduced: number; perGroup: Record<string, { points: number; samples: number }> };
      samples: { blockSize: number; excluded: number[]; instants: number[] };
    };
    // 2·10⁶ usable samples into at most 20,000 blocks a signal: blocks of 100
    expect(fit.samples.blockSize).toBe(100);
    const current = fit.residual.perGroup.I!;
    expect(current.samples).toBe(ROWS - fit.samples.excluded.length);
    // more points than blocks: the single samples kept next to each switching instant
    expect(current.points).toBeGreaterThan(Math.ceil(current.samples / 100));
    expect(current.points).toBeLessThan(Math.ceil(current.samples / 100) + 2 * 100 * fit.samples.instants.length + 1);
    // the block noise comes from the blocks themselves: χ²/ν ≈ 1 (Numerical Recipes §15.1)
    expect(Math.abs(fit.residual.chiSquaredReduced - 1)).toBeLessThan(0.05);
    const truth = { 'rails.inductanceGradient': 0.45e-6, 'armature.contactResistance': 0.1e-3 };
    for (const [path, value] of Object.entries(truth)) {
      const p = fit.parameters[path]!;
      expect(Math.abs(p.value - value)).toBeLessThan(4 * p.uncertainty);
    }
    expect(result.peakRss).toBeLessThan(1024 ** 3);
  }, 180_000);
});
