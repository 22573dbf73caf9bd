/**
 * The moving armature against closed forms of F = ½L′I² (each [derived] from Newton's second law and the force law
 * of the model contract §2, worked out beside its check), not only against the conservation laws.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { loadScenarioFile, scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import type { Scenario } from '../../src/scenario/types.js';
import { moduleGroup, scenario } from '../helpers/scenario.js';

/** Coasting under a drag force k·v²: v(t) = v0/(1 + k·v0·t/m) from the sample k0 on, to 1e-7 of v0, at 50+ samples. */
function expectCoasting(w: { t: ArrayLike<number>; velocity: ArrayLike<number> }, k0: number, k: number, mass: number): void {
  const v0 = w.velocity[k0]!;
  let compared = 0;
  for (let j = k0 + 1; j < w.t.length; j += 97) {
    const t = w.t[j]! - w.t[k0]!;
    expect(Math.abs(w.velocity[j]! - v0 / (1 + (k * v0 * t) / mass)) / v0).toBeLessThan(1e-7);
    compared++;
  }
  expect(compared).toBeGreaterThan(50);
}

/** Waveform value at the first sample at or after time t (an event instant is a sample). */
const sampleAt = (t: number[], series: number[], time: number) => {
  const k = t.findIndex((s) => s >= time);
  return { t: t[k]!, value: series[k]!, k };
};

/** A lossless crowbarred loop: no resistance anywhere, diode drop 0, so after crowbar onset the loop's flux is conserved. */
function lossless(feedInductance: number, mass: number, length: number): Scenario {
  return scenario({
    bank: [moduleGroup({ capacitance: 10e-6, voltage: 10e3, esr: 0, inductance: 1e-6, resistance: 0, crowbar: { drop: 0, resistance: 0 } })],
    feed: { inductance: feedInductance, resistance: 0 },
    rails: { length, inductanceGradient: 0.45e-6, resistanceGradient: 0 },
    armature: { mass, position: 0.01, resistance: 0, contactResistance: 0, arcDrop: 0 },
    solver: { sampleInterval: 20e-6, endTime: 1, currentFloor: 1e-9 },
  });
}

describe('constant current: x = L′I²t²/(4m), v = I·√(L′x/m) from rest [derived: constant force ½L′I²]', () => {
  it('a lossless loop conserves flux: v² = v_c² + (Φ²/m)(1/(L0 + L′x_c) − 1/(L0 + L′x)) after onset, to 1e-8 [derived: energy of a lossless loop]', () => {
    const s = lossless(1e-3, 1e-4, 1);
    const shot = runShot(s);
    const w = shot.waveforms!;
    const onset = shot.events.find((e) => e.kind === 'crowbar')!.t;
    const c = sampleAt(w.t, w.current, onset);
    const L0 = s.bank[0]!.inductance + s.feed.inductance;
    const lp = s.rails.inductanceGradient;
    const xc = w.position[c.k]!;
    const vc = w.velocity[c.k]!;
    const flux = (L0 + lp * xc) * c.value;
    let worst = 0;
    for (let k = c.k + 1; k < w.t.length; k += 17) {
      const x = w.position[k]!;
      const v2 = vc * vc + ((flux * flux) / s.armature.mass) * (1 / (L0 + lp * xc) - 1 / (L0 + lp * x));
      worst = Math.max(worst, Math.abs(w.velocity[k]! - Math.sqrt(v2)) / shot.results.muzzleVelocity);
      // and the current is the flux over the loop inductance
      expect(Math.abs(w.current[k]! - flux / (L0 + lp * x)) / c.value).toBeLessThan(1e-8);
    }
    expect(worst).toBeLessThan(1e-8);
  });

  it('with a loop inductance far above L′x the current stays constant and x − x_c − v_c τ = L′I²τ²/(4m), v² − v_c² = I²L′(x − x_c)/m (1e-4)', () => {
    // the loop holds 0.1 H: the current falls by L′·Δx/L ≈ 4.5e-6 over the bore
    const s = lossless(0.1, 1e-6, 1);
    const shot = runShot(s);
    const w = shot.waveforms!;
    const onset = shot.events.find((e) => e.kind === 'crowbar')!.t;
    const c = sampleAt(w.t, w.current, onset);
    const I = c.value;
    const lp = s.rails.inductanceGradient;
    const m = s.armature.mass;
    const xc = w.position[c.k]!;
    const vc = w.velocity[c.k]!;
    let compared = 0;
    for (let k = c.k + 1; k < w.t.length; k += 13) {
      const tau = w.t[k]! - c.t;
      const x = w.position[k]!;
      const expectedTravel = vc * tau + (lp * I * I * tau * tau) / (4 * m);
      if (x - xc < 0.05) continue;
      expect(Math.abs(x - xc - expectedTravel) / (x - xc)).toBeLessThan(1e-4);
      expect(Math.abs(w.velocity[k]! ** 2 - vc * vc - (I * I * lp * (x - xc)) / m) / w.velocity[k]! ** 2).toBeLessThan(1e-4);
      compared++;
    }
    expect(compared).toBeGreaterThan(10);
    expect(shot.results.outcome).toBe('exited');
  });
});

describe('crowbarred L/R decay, negligible back-EMF: v∞ = v_c + L′I_c²τ/(4m), τ = L/R [derived: ∫½L′I_c² e^(−2t/τ) dt]', () => {
  it('matches to 1e-4', () => {
    const s = scenario({
      bank: [moduleGroup({ capacitance: 400e-6, voltage: 5000, esr: 0, inductance: 20e-6, resistance: 10e-3, crowbar: { drop: 0, resistance: 0 } })],
      feed: { inductance: 0.3e-6, resistance: 0 },
      rails: { length: 10, inductanceGradient: 0.45e-6, resistanceGradient: 0 },
      armature: { mass: 50, position: 0.01, resistance: 0, contactResistance: 0, arcDrop: 0 },
      solver: { sampleInterval: 1e-6, endTime: 0.05, currentFloor: 1e-9 },
    });
    const shot = runShot(s);
    const w = shot.waveforms!;
    const onset = shot.events.find((e) => e.kind === 'crowbar')!.t;
    const c = sampleAt(w.t, w.current, onset);
    const L = s.bank[0]!.inductance + s.feed.inductance + s.rails.inductanceGradient * w.position[c.k]!;
    const tau = L / s.bank[0]!.resistance;
    expect(shot.results.outcome).toBe('timeout');
    // back-EMF L′v against R: negligible
    expect((s.rails.inductanceGradient * shot.results.muzzleVelocity) / s.bank[0]!.resistance).toBeLessThan(1e-6);
    const expected = w.velocity[c.k]! + (s.rails.inductanceGradient * c.value * c.value * tau) / (4 * s.armature.mass);
    expect(Math.abs(shot.results.muzzleVelocity / expected - 1)).toBeLessThan(1e-4);
  });
});

describe('drag coasting: v = v0/(1 + k v0 t/m), k = ½ρC_dA [derived: m dv/dt = −k v²]', () => {
  it('after the current has ended, the coasting velocity follows the closed form to 1e-7', () => {
    const drag = { gasDensity: 1.2, dragCoefficient: 0.9, boreArea: 4e-4 };
    const s = scenario({
      bank: [moduleGroup({ crowbar: { drop: 30, resistance: 2e-3 } })],
      armature: { mass: 0.01, position: 0.05 },
      rails: { length: 100 },
      drag,
      solver: { sampleInterval: 2e-6, endTime: 0.05, currentFloor: 1e-9 },
    });
    const shot = runShot(s);
    const w = shot.waveforms!;
    const off = shot.events.find((e) => e.kind === 'turn-off')!.t;
    const start = sampleAt(w.t, w.velocity, off);
    // the sample at the event instant may be its left side; take the last sample at that instant
    let k0 = start.k;
    while (w.t[k0 + 1] === w.t[k0]) k0++;
    const v0 = w.velocity[k0]!;
    const k = 0.5 * drag.gasDensity * drag.dragCoefficient * drag.boreArea;
    expectCoasting(w, k0, k, s.armature.mass);
    // and drag has slowed it measurably
    expect(w.velocity[w.t.length - 1]! / v0).toBeLessThan(0.99);
  });
});

describe('arc loss = V_arc·∫I dt [derived: the arc drop is constant while current flows]', () => {
  it('without crowbars every module\'s charge comes from its capacitor: loss = V_arc Σ nC(V0 − V_end), to 1e-8', () => {
    const { scenario: base } = loadScenarioFile('scenarios/reversal-bank.json');
    const arcDrop = 60;
    const s = { ...base, armature: { ...base.armature, arcDrop } };
    const shot = runShot(s);
    const w = shot.waveforms!;
    const last = w.t.length - 1;
    const charge = s.bank.reduce((sum, g, n) => sum + g.count * g.capacitance * (g.voltage - w.groupVoltage[n]![last]!), 0);
    expect(shot.results.energy.losses.arc).toBeGreaterThan(0);
    expect(Math.abs(shot.results.energy.losses.arc / (arcDrop * charge) - 1)).toBeLessThan(1e-8);
    // the arc drop opposes the current: the armature is slower than without it
    const without = runShot(base, { waveforms: false }).results.muzzleVelocity;
    expect(shot.results.muzzleVelocity).toBeLessThan(without);
  });
});

describe('strong-shock gas drag: pressure (γ+1)/2·ρ0·v² on the bore [published: Rankine–Hugoniot strong-shock limit of a piston-driven shock, e.g. Zel\'dovich & Raizer, Physics of Shock Waves]', () => {
  const raw = () => JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8'));

  it('coasting follows v0/(1 + k v0 t/m) with k = (γ+1)/2·ρ0·A (1e-7)', () => {
    const file = raw();
    file.friction = { coefficient: 0 };
    file.rails.length = '100 m';
    file.drag = { model: 'strong-shock', gasDensity: '1.2 kg/m^3', boreArea: '1 cm^2', heatCapacityRatio: 1.4 };
    file.solver = { sampleInterval: '2 us', endTime: '20 ms' };
    const s = scenarioFromRaw(file, 'shock.json');
    const shot = runShot(s);
    const w = shot.waveforms!;
    const off = shot.events.find((e) => e.kind === 'turn-off')!.t;
    let k0 = w.t.findIndex((t) => t >= off);
    while (w.t[k0 + 1] === w.t[k0]) k0++;
    const k = ((1.4 + 1) / 2) * 1.2 * 1e-4;
    expectCoasting(w, k0, k, s.armature.mass);
    expect(shot.results.energy.losses.drag).toBeGreaterThan(0);
  });

  it('refuses a drag coefficient beside the strong-shock model, γ without it, and an unknown model', () => {
    const attempt = (drag: Record<string, unknown>) => {
      const file = raw();
      file.drag = drag;
      try {
        scenarioFromRaw(file, 'x.json');
      } catch (error) {
        return (error as { where: string }).where;
      }
      return null;
    };
    expect(attempt({ model: 'strong-shock', gasDensity: 1.2, boreArea: 1e-4, dragCoefficient: 1 })).toBe('drag.dragCoefficient');
    expect(attempt({ gasDensity: 1.2, boreArea: 1e-4, dragCoefficient: 1, heatCapacityRatio: 1.4 })).toBe('drag.heatCapacityRatio');
    expect(attempt({ gasDensity: 1.2, boreArea: 1e-4 })).toBe('drag.dragCoefficient');
    expect(attempt({ model: 'shock', gasDensity: 1.2, boreArea: 1e-4 })).toBe('drag.model');
    expect(attempt({ model: 'strong-shock', gasDensity: 1.2, boreArea: 1e-4, heatCapacityRatio: 5 })).toBe('drag.heatCapacityRatio');
  });
});
