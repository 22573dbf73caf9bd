/**
 * Bad input through the real command: one line naming the scenario path, what was expected and what was
 * found; exit code 2; no stack trace; nothing on stdout.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const base = JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8')) as Record<string, any>;
const dir = mkdtempSync(join(tmpdir(), 'railpulse-bad-'));

function runWith(name: string, text: string, ...extra: string[]) {
  const file = join(dir, `${name}.json`);
  writeFileSync(file, text);
  const result = spawnSync(process.execPath, ['bin/railpulse.js', 'run', file, '--json', '--no-report', ...extra], { encoding: 'utf8' });
  return { ...result, file };
}

function variant(edit: (s: Record<string, any>) => void): string {
  const copy = structuredClone(base);
  edit(copy);
  return JSON.stringify(copy, null, 2);
}

const cases: [string, string, RegExp][] = [
  ['malformed', '{\n  "name": "x",\n  "bank": [ }\n', /line 3, column \d+: malformed JSON/],
  ['unknown-key', variant((s) => { s.bank[0].capacitence = s.bank[0].capacitance; delete s.bank[0].capacitance; }), /bank\[0\]\.capacitence: unknown key \(did you mean "capacitance"\?\)/],
  ['missing-key', variant((s) => { delete s.feed.inductance; }), /feed\.inductance: missing required key/],
  ['wrong-dimension', variant((s) => { s.bank[0].capacitance = '450 uH'; }), /bank\[0\]\.capacitance: expected a capacitance \(F\), got "450 uH"/],
  ['not-a-unit', variant((s) => { s.rails.length = '2 furlongs of rail'; }), /rails\.length: expected a length \(m\), got "2 furlongs of rail"/],
  ['non-finite', variant((s) => { s.bank[0].voltage = 1e999; }).replace('Infinity', '1e999').replace('null', '1e999'), /bank\[0\]\.voltage: expected a voltage \(V\), got (Infinity|1e999)/],
  ['negative-capacitance', variant((s) => { s.bank[0].capacitance = '-450 uF'; }), /bank\[0\]\.capacitance: expected a capacitance from 1 pF to 10 F, got -450 µF/],
  ['zero-inductance', variant((s) => { s.feed.inductance = 0; }), /feed\.inductance: expected an inductance from 1 pH to 1 H, got 0 H/],
  ['zero-mass', variant((s) => { s.armature.mass = '0 g'; }), /armature\.mass: expected a mass from 1 µg to 100 Mg, got 0 g/],
  ['negative-friction', variant((s) => { s.friction.coefficient = -0.1; s.friction.staticCoefficient = 0.2; }), /friction\.coefficient: expected a friction coefficient ≥ 0 and ≤ 10, got -0\.1/],
  ['static-below-sliding', variant((s) => { s.friction.coefficient = 0.3; s.friction.staticCoefficient = 0.2; }), /friction\.staticCoefficient: expected a static coefficient ≥ the sliding coefficient \(0\.3\), got 0\.2/],
  ['short-rails', variant((s) => { s.rails.length = '1 cm'; }), /rails\.length: expected a rail length greater than the armature's initial position/],
  ['no-module', variant((s) => { s.bank = []; }), /bank: the bank has no module group, so the shot cannot fire/],
  ['count-fraction', variant((s) => { s.bank[0].count = 1.5; }), /bank\[0\]\.count: expected a whole number, got 1\.5/],
  ['integration-failure', variant((s) => { s.solver = { maxSteps: 3 }; }), /solver: integration stopped after 3 steps \(solver\.maxSteps\) at t = [\d.e-]+ s with I = [\d.e+-]+ A, x = [\d.e-]+ m/],
];

describe('bad input: one clear line, exit code 2, no stack trace (through the real CLI)', () => {
  it.each(cases)('%s', (name, text, message) => {
    const result = runWith(name, text);
    expect(result.status).toBe(2);
    expect(result.stdout).toBe('');
    const lines = result.stderr.trim().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toContain(result.file);
    expect(lines[0]).toMatch(message);
    expect(result.stderr).not.toMatch(/\n\s+at /);
  });

  it('a missing file is one line with exit code 2', () => {
    const result = spawnSync(process.execPath, ['bin/railpulse.js', 'run', join(dir, 'nowhere.json')], { encoding: 'utf8' });
    expect(result.status).toBe(2);
    expect(result.stderr.trim()).toMatch(/nowhere\.json: no such file$/);
  });
});

describe('units as people write them', () => {
  it('µ (U+00B5), μ (U+03BC), u, Ω and mohm all read the same', () => {
    const spellings = [
      ['450 uF', '3 mohm'],
      ['450 µF', '3 mΩ'],
      ['450 μF', '3 mΩ'],
      [450e-6, 3e-3],
    ];
    const outputs = spellings.map(([capacitance, esr], n) => {
      const result = runWith(`units-${n}`, variant((s) => { s.bank[0].capacitance = capacitance; s.bank[0].esr = esr; }));
      expect(result.status).toBe(0);
      return JSON.parse(result.stdout).muzzleVelocity as number;
    });
    for (const v of outputs) expect(v).toBeCloseTo(outputs[0]!, 9);
  });

  it('--json prints the results object of the model contract, then the checks, the status and the warnings', () => {
    const result = runWith('json-keys', JSON.stringify(base));
    expect(result.status).toBe(0);
    const results = JSON.parse(result.stdout);
    // the contract's keys in its order, then the engineering checks, the status and the warnings (no geometry here,
    // so no railsDerived)
    expect(Object.keys(results)).toEqual([
      'outcome', 'muzzleVelocity', 'exitTime', 'finalPosition', 'peakCurrent', 'peakCurrentTime', 'peakAcceleration',
      'peakBreechVoltage', 'actionIntegral', 'efficiency', 'energy', 'modules', 'checks', 'status', 'warnings',
    ]);
    expect(Object.keys(results.status)).toEqual(['verdict', 'checks', 'warnings', 'hazardClasses', 'failing', 'warning']);
    // afterExit (the muzzle-arc bound) only when the armature exits
    expect(Object.keys(results.energy)).toEqual(['initial', 'capacitors', 'magnetic', 'magneticRails', 'kinetic', 'losses', 'residual', ...(results.outcome === 'exited' ? ['afterExit'] : [])]);
    expect(Object.keys(results.energy.losses)).toEqual(['bank', 'crowbar', 'modules', 'feed', 'rails', 'armature', 'contacts', 'arc', 'friction', 'drag']);
  });
});
