/**
 * Scenarios written with rail and armature geometry and materials, through the real command. The L′ values
 * themselves are checked against the exact two-wire formula and Grover's GMD formula in test/checks.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const base = JSON.parse(readFileSync('scenarios/geometry-shot.json', 'utf8')) as Record<string, any>;
const dir = mkdtempSync(join(tmpdir(), 'railpulse-geometry-'));

function run(name: string, edit: (s: Record<string, any>) => void = () => {}) {
  const copy = structuredClone(base);
  edit(copy);
  const file = join(dir, `${name}.json`);
  writeFileSync(file, JSON.stringify(copy));
  const result = spawnSync(process.execPath, ['bin/railpulse.js', 'run', file, '--json', '--no-report'], { encoding: 'utf8' });
  return { ...result, file };
}

describe('a scenario given only by geometry and materials', () => {
  it('runs, reports both L′ values and uses the high-frequency one, and lists every check with its source', () => {
    const result = run('plain');
    expect(result.status).toBe(0);
    const out = JSON.parse(result.stdout);
    const derived = out.railsDerived;
    expect(derived.inductanceGradient).toBe(derived.inductanceGradientHighFrequency);
    // surface currents on facing faces: the high-frequency L′ lies below the uniform-current value
    expect(derived.inductanceGradientHighFrequency).toBeLessThan(derived.inductanceGradientUniform);
    // R′ follows current diffusion (no single constant), and its loss-equivalent value never drops below the
    // uniform-current floor ρ/(h w) per rail
    expect(derived.resistanceModel).toBe('diffusion');
    expect(derived.resistanceGradient).toBe(derived.resistanceGradientLossEquivalent);
    expect(derived.resistanceGradientLossEquivalent).toBeGreaterThanOrEqual(derived.resistanceGradientDC);
    const ids = out.checks.map((c: { id: string }) => c.id);
    expect(ids).toEqual(expect.arrayContaining(['armature-action', 'rail-heating', 'linear-current-density', 'contact-force', 'rail-separating-force', 'peak-acceleration']));
    for (const check of out.checks) {
      expect(['pass', 'warn', 'fail', 'info']).toContain(check.verdict);
      expect(check.source.length).toBeGreaterThan(10);
      expect(Object.keys(check)).toEqual(expect.arrayContaining(['id', 'verdict', 'value', 'limit', 'direction', 'unit', 'source']));
    }
  });

  it('inductanceModel "uniform" makes the shot use the uniform-current L′', () => {
    const out = JSON.parse(run('uniform', (s) => { s.rails.inductanceModel = 'uniform'; }).stdout);
    expect(out.railsDerived.inductanceGradient).toBe(out.railsDerived.inductanceGradientUniform);
  });

  it('a number the user gives wins over the derived one', () => {
    const out = JSON.parse(run('override', (s) => { s.rails.inductanceGradient = '0.5 uH/m'; }).stdout);
    expect(out.railsDerived.inductanceGradient).toBeCloseTo(0.5e-6, 15);
  });
});

const bad: [string, (s: Record<string, any>) => void, RegExp][] = [
  ['negative height', (s) => { s.rails.geometry.height = '-15 mm'; }, /rails\.geometry\.height/],
  ['zero separation', (s) => { s.rails.geometry.separation = 0; }, /rails\.geometry\.separation/],
  ['unknown material', (s) => { s.rails.material = 'coper'; }, /rails\.material: .*copper/],
  ['outside the field computation range', (s) => { s.rails.geometry.width = '2 m'; }, /rails\.geometry/],
  ['armature without mass or geometry', (s) => { delete s.armature.geometry; }, /armature\.mass: missing required key/],
];

describe('bad geometry: one clear line naming the path, exit code 2', () => {
  it.each(bad)('%s', (name, edit, message) => {
    const result = run(name.replace(/ /g, '-'), edit);
    expect(result.status).toBe(2);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).toMatch(message);
  });
});
