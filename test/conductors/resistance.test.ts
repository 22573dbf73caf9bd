import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { getMaterial } from '../../src/conductors/materials.js';
import {
  bankCharacteristicTime,
  magneticDiffusivity,
  penetrationDepth,
  quarterPeriod,
  resistanceGradientDC,
  resistanceGradientOf,
} from '../../src/conductors/resistance.js';
import { deriveRails } from '../../src/conductors/rails.js';

const MU0 = 4e-7 * Math.PI;
const copper = getMaterial('copper');

describe('current penetration', () => {
  it('the diffused current after a step loses as much as a uniform layer √(2πDt) (half-space diffusion, derived)', () => {
    // Step of surface current K on a half-space: H = K·erfc(x/2√(Dt)), so J = K/√(πDt)·exp(−x²/4Dt).
    const t = 1e-3;
    const D = magneticDiffusivity(copper.resistivity);
    const K = 1;
    let loss = 0;
    const dx = 1e-6;
    for (let x = dx / 2; x < 0.2; x += dx) {
      const J = (K / Math.sqrt(Math.PI * D * t)) * Math.exp(-(x * x) / (4 * D * t));
      loss += copper.resistivity * J * J * dx;
    }
    expect(loss).toBeCloseTo((copper.resistivity * K * K) / penetrationDepth(copper.resistivity, t), 12);
  });

  it('copper after 1 ms: D = ρ/μ0 ≈ 0.0137 m²/s and the layer ≈ 9.28 mm [derived]', () => {
    expect(magneticDiffusivity(copper.resistivity)).toBeCloseTo(1.7241e-8 / MU0, 12);
    expect(penetrationDepth(copper.resistivity, 1e-3) * 1e3).toBeCloseTo(9.28, 2);
  });
});

describe('rail resistance gradient R′ (both rails)', () => {
  const rails = { kind: 'rectangular' as const, height: 0.02, width: 0.02, separation: 0.02 };

  it('a short pulse confines the current to the layer: R′ = 2ρ/(h·√(2πDτ))', () => {
    const tau = 0.2e-3;
    expect(resistanceGradientOf(rails, copper, tau)).toBeCloseTo((2 * copper.resistivity) / (0.02 * penetrationDepth(copper.resistivity, tau)), 12);
  });

  it('a long pulse never goes below the DC value 2ρ/(h·w)', () => {
    const dc = resistanceGradientDC(rails, copper);
    expect(dc).toBeCloseTo((2 * 1.7241e-8) / (0.02 * 0.02), 15);
    expect(resistanceGradientOf(rails, copper, 1)).toBe(dc);
    expect(resistanceGradientOf(rails, copper, 1e-5)).toBeGreaterThan(dc);
  });

  it('round rails: annulus below the DC value 2ρ/(πa²) for a long pulse', () => {
    const round = { kind: 'round' as const, radius: 5e-3, centreDistance: 25e-3 };
    expect(resistanceGradientOf(round, copper, 1)).toBeCloseTo((2 * copper.resistivity) / (Math.PI * 25e-6), 15);
    const tau = 1e-5;
    const d = penetrationDepth(copper.resistivity, tau);
    expect(resistanceGradientOf(round, copper, tau)).toBeCloseTo((2 * copper.resistivity) / (Math.PI * (25e-6 - (5e-3 - d) ** 2)), 12);
  });

  it('a non-positive characteristic time is bad input', () => {
    expect(() => resistanceGradientOf(rails, copper, 0)).toThrow(InputError);
  });

  it('deriveRails gathers L′ and R′ for the JSON output', () => {
    const derived = deriveRails(rails, copper, 0.5e-3);
    expect(derived.inductanceGradientHighFrequency).toBeGreaterThan(0.45e-6);
    expect(derived.resistanceGradient).toBe(resistanceGradientOf(rails, copper, 0.5e-3));
    expect(deriveRails(rails, undefined, undefined).resistanceGradient).toBeNull();
  });
});

describe('characteristic time of a bank', () => {
  it('the quarter period (π/2)√(LC) is the time to peak current of an undamped LC discharge (circuits textbook)', () => {
    const L = 3e-6;
    const C = 2e-3;
    const omega = 1 / Math.sqrt(L * C);
    // i(t) = V0/(ωL)·sin(ωt) peaks where ωt = π/2
    expect(Math.sin(omega * quarterPeriod(L, C))).toBeCloseTo(1, 14);
  });

  it('groups fired together are one equivalent LC: C·n summed, L/n in parallel (model contract §1)', () => {
    const one = bankCharacteristicTime([{ count: 4, capacitance: 1e-3, inductance: 8e-6 }], 1e-6);
    const split = bankCharacteristicTime(
      [
        { count: 1, capacitance: 1e-3, inductance: 8e-6 },
        { count: 3, capacitance: 1e-3, inductance: 8e-6 },
      ],
      1e-6,
    );
    expect(split).toBeCloseTo(one, 15);
    expect(one).toBeCloseTo(quarterPeriod(2e-6 + 1e-6, 4e-3), 15);
  });
});
