/**
 * Scenarios that give the rails and the armature as numbers (no geometry, no materials) and opt into none of the
 * optional shot effects give the same results as the model did before those effects existed, to 1e-12 relative:
 * every headline figure, the energy ledger and the module figures. The fixture (`unchanged.fixture.json`) was
 * written by this file (RAILPULSE_WRITE_FIXTURE=1) from the model before the effects were added; the variants
 * with drag and an arc drop hold today's `drag` and `arcDrop` keys fixed too.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { loadScenarioFile } from '../../src/scenario/load.js';
import type { Scenario } from '../../src/scenario/types.js';
import { runShot } from '../../src/solve/shot.js';

const FIXTURE = new URL('./unchanged.fixture.json', import.meta.url);
const DEMOS = ['bench-shot', 'bench-ring-down', 'reversal-bank', 'sizing-target', 'staggered-bank'];

function variants(): [string, Scenario][] {
  const list: [string, Scenario][] = DEMOS.map((d) => [d, loadScenarioFile(`scenarios/${d}.json`).scenario]);
  const staggered = loadScenarioFile('scenarios/staggered-bank.json').scenario;
  list.push([
    'staggered-bank with drag and arc drop',
    { ...staggered, drag: { gasDensity: 1.2, dragCoefficient: 0.9, boreArea: 2.25e-4 }, armature: { ...staggered.armature, arcDrop: 40 } },
  ]);
  const bench = loadScenarioFile('scenarios/bench-shot.json').scenario;
  list.push(['bench-shot with arc drop', { ...bench, armature: { ...bench.armature, arcDrop: 25 } }]);
  return list;
}

/** The figures that must not move: headline numbers, the ledger, the modules, the event list. */
function figures(scenario: Scenario) {
  const shot = runShot(scenario, { waveforms: false });
  const r = shot.results;
  return {
    outcome: r.outcome,
    muzzleVelocity: r.muzzleVelocity,
    exitTime: r.exitTime,
    finalPosition: r.finalPosition,
    peakCurrent: r.peakCurrent,
    peakCurrentTime: r.peakCurrentTime,
    peakAcceleration: r.peakAcceleration,
    peakBreechVoltage: r.peakBreechVoltage,
    actionIntegral: r.actionIntegral,
    efficiency: r.efficiency,
    energy: r.energy,
    modules: r.modules,
    events: shot.events.map((e) => [e.kind, e.group ?? -1, e.t]),
  };
}

type Figures = ReturnType<typeof figures>;

/** Every number in `actual` equals the one in `expected` to 1e-12 relative (absolute 1e-12·scale near zero). */
function compare(actual: unknown, expected: unknown, path: string, scale: number, out: string[]): void {
  if (typeof expected === 'number') {
    if (typeof actual !== 'number') {
      out.push(`${path}: ${String(actual)} instead of ${expected}`);
      return;
    }
    const tolerance = 1e-12 * Math.max(Math.abs(expected), scale);
    if (!(Math.abs(actual - expected) <= tolerance)) out.push(`${path}: ${actual} instead of ${expected}`);
    return;
  }
  if (Array.isArray(expected) || (expected && typeof expected === 'object')) {
    const e = expected as Record<string, unknown>;
    const a = (actual ?? {}) as Record<string, unknown>;
    for (const key of Object.keys(e)) compare(a[key], e[key], `${path}.${key}`, scale, out);
    return;
  }
  if (actual !== expected) out.push(`${path}: ${String(actual)} instead of ${String(expected)}`);
}

if (process.env.RAILPULSE_WRITE_FIXTURE === '1') {
  if (existsSync(FIXTURE)) throw new Error('the fixture exists; it is written once, from the model before the new effects');
  writeFileSync(FIXTURE, JSON.stringify(Object.fromEntries(variants().map(([name, s]) => [name, figures(s)])), null, 1) + '\n');
}

const fixture = JSON.parse(readFileSync(FIXTURE, 'utf8')) as Record<string, Figures>;

describe.each(variants())('%s', (name, scenario) => {
  it('gives the same figures as before the optional effects existed (1e-12 relative)', () => {
    const expected = structuredClone(fixture[name]!);
    expect(expected).toBeDefined();
    // the one deliberate correction: a crowbarred module's reversal was reported as exactly 0 and is now the diode's
    // clamp voltage (test/fidelity/corrections.test.ts checks it against its closed form)
    scenario.bank.forEach((group, g) => {
      if (group.crowbar) delete (expected.modules[g] as { reversal?: number }).reversal;
    });
    const actual = figures(scenario);
    const problems: string[] = [];
    // a figure near zero (a residual, an unused loss) is compared against the shot's stored energy or its own scale
    const scale = (expected.energy.initial as number) * 1e-6;
    compare(actual, expected, name, scale, problems);
    expect(problems).toEqual([]);
  });
});
