/**
 * Adiabatic heating during the shot: ρ = ρ0(1 + αΔT) with the action–temperature relation
 * ∫I²dt/A² = γc/(ρ0α)·ln(1 + αΔT) (src/conductors/heating.ts, [derived] from ρ(T) and a constant heat capacity),
 * so a conductor's resistance is R0·exp(κS), κ = ρ0α/(A²γc), S = ∫I²dt through it.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { temperatureAfterAction } from '../../src/conductors/heating.js';
import { currentCarryingArea } from '../../src/conductors/resistance.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';

/** A large, nearly lossless crowbarred loop: the current reaches I0 = V0√(C/L) and then stays nearly constant. */
function raw(heating: boolean) {
  return {
    name: 'heating check',
    bank: [{ capacitance: '10 mF', voltage: '10 kV', inductance: '1 uH', crowbar: { drop: 0, resistance: 0 } }],
    feed: { inductance: '0.1 H' },
    rails: { length: '1 m', geometry: { height: '15 mm', width: '10 mm', separation: '15 mm' }, material: 'copper', resistanceModel: 'quarter-period' },
    armature: { position: '5 cm', geometry: { height: '15 mm', width: '5 mm', length: '5 mm' }, material: 'aluminium-6061-t6', mass: '1 kg' },
    friction: { coefficient: 0, staticCoefficient: 1, preload: '1e6 N' },
    solver: { endTime: '0.3 s', sampleInterval: '100 us' },
    ...(heating ? { heating: 'adiabatic' } : {}),
  };
}

describe('a current through a conductor with adiabatic heating', () => {
  const cold = scenarioFromRaw(raw(false), 'cold.json');
  const hot = scenarioFromRaw(raw(true), 'hot.json');
  const shot = runShot(hot, { waveforms: true });
  const r = shot.results;
  const S = r.actionIntegral;

  it('heats the armature as the action integral says: T from ∫I²dt/A² (1e-9)', () => {
    const material = hot.armature.material!;
    const area = hot.armature.derived!.currentArea;
    expect(r.armatureTemperature).toBeGreaterThan(30);
    expect(Math.abs(r.armatureTemperature! - temperatureAfterAction(material, S / (area * area)))).toBeLessThan(1e-9 * r.armatureTemperature!);
  });

  it('dissipates ∫R0 e^(κS) dS = R0 (e^(κS) − 1)/κ in the armature and the locked rails, whatever the current (1e-7)', () => {
    const h = hot.heating!;
    const armature = (hot.armature.resistance * Math.expm1(h.armature * S)) / h.armature;
    expect(Math.abs(r.energy.losses.armature / armature - 1)).toBeLessThan(1e-7);
    const rails = (hot.rails.resistanceGradient * hot.armature.position * Math.expm1(h.rails * S)) / h.rails;
    expect(Math.abs(r.energy.losses.rails / rails - 1)).toBeLessThan(1e-7);
    // the rail layer is the one the rail-heating check uses
    const area = currentCarryingArea(hot.rails.geometry!, hot.rails.material!.resistivity, hot.rails.derived!.characteristicTime!);
    expect(Math.abs(r.railTemperature! - temperatureAfterAction(hot.rails.material!, S / (area * area)))).toBeLessThan(1e-9 * r.railTemperature!);
  });

  it('at constant current the armature temperature follows 20 + (exp(κ I² t) − 1)/α in time (1e-4)', () => {
    const w = shot.waveforms!;
    const onset = shot.events.find((e) => e.kind === 'crowbar')!.t;
    const k = w.t.findIndex((t) => t >= onset);
    const I = w.current[k]!;
    const end = w.t.length - 1;
    // the current barely moves over the shot: L/R of the loop is far longer
    expect(Math.abs(w.current[end]! / I - 1)).toBeLessThan(1e-3);
    const h = hot.heating!;
    // the action to onset of a (nearly) lossless LC quarter period is I0²·t_c/2 [derived]
    const action = (I * I * onset) / 2 + I * I * (w.t[end]! - onset);
    expect(Math.abs(S / action - 1)).toBeLessThan(2e-3);
    const expected = 20 + Math.expm1(h.armature * I * I * (w.t[end]! - onset) + h.armature * (I * I * onset) / 2) / h.armatureAlpha;
    expect(Math.abs(r.armatureTemperature! - expected) / (expected - 20)).toBeLessThan(5e-3);
  });

  it('raises the losses against the same shot without heating', () => {
    const plain = runShot(cold, { waveforms: false }).results;
    expect(r.energy.losses.armature).toBeGreaterThan(1.01 * plain.energy.losses.armature);
    expect(plain.armatureTemperature).toBeUndefined();
  });

  it('closes the ledger on the geometry demo with heating, diffusion and a transition (1e-6·E0 at every sample)', () => {
    const file = JSON.parse(readFileSync('scenarios/geometry-shot.json', 'utf8'));
    file.heating = 'adiabatic';
    file.armature.transition = { specificAction: '5e14 A^2 s/m^4', contactArea: '3 cm^2', arcDrop: '60 V' };
    const s = scenarioFromRaw(file, 'geometry.json');
    const demo = runShot(s);
    const e0 = demo.results.energy.initial;
    expect(Math.max(...demo.waveforms!.energy.residual.map(Math.abs)) / e0).toBeLessThan(1e-6);
    expect(demo.results.railTemperature).toBeGreaterThan(20);
  });

  it('refuses heating with nothing to heat and an unknown model', () => {
    const where = (file: Record<string, unknown>) => {
      try {
        scenarioFromRaw(file, 'x.json');
      } catch (error) {
        return (error as { where: string }).where;
      }
      return null;
    };
    const bench = JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8'));
    expect(where({ ...bench, heating: 'adiabatic' })).toBe('heating');
    expect(where({ ...raw(true), heating: 'isothermal' })).toBe('heating');
  });
});
