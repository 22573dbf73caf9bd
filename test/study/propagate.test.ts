/**
 * Linear propagation of tolerances (GUM, JCGM 100:2008, §5.1.2: σ_f² = Σ (∂f/∂x_i)² σ_i² for independent inputs)
 * checked against the analytic derivative of a closed form: the peak current of the locked-armature series RLC
 * discharge (natural response of a series RLC circuit, e.g. Nilsson & Riedel, "Electric Circuits").
 */
import { describe, expect, it } from 'vitest';
import type { Scenario, Tolerance } from '../../src/scenario/types.js';
import { runShot } from '../../src/solve/shot.js';
import { propagateLinear } from '../../src/study/propagate.js';
import { LOCKED, lockedLoop, scenario } from '../helpers/scenario.js';

function tolerance(path: string, distribution: 'uniform' | 'normal', spread: number, relative = true): Tolerance {
  return { where: 'test', path, distribution, spread, relative, common: false, targets: [{ path, follows: [] }] };
}

/**
 * Underdamped peak: i(t) = V0/(ωd L) e^(−αt) sin(ωd t) peaks where tan(ωd t) = ωd/α, and there sin(ωd t) = ωd/ω0,
 * so I_p = V0 √(C/L) exp(−q φ) with q = α/ωd and φ = atan(1/q). Derivatives by the chain rule (derived here):
 *   d(qφ)/dq = φ − q/(1 + q²)
 *   ∂ωd/∂C = −1/(2 ωd L C²),          ∂q/∂C = −(α/ωd²) ∂ωd/∂C
 *   ∂α/∂L = −α/L,  ∂ωd/∂L = (−1/(L²C) + 2α²/L)/(2ωd),  ∂q/∂L = (∂α/∂L)/ωd − (α/ωd²) ∂ωd/∂L
 *   ∂I_p/∂C = I_p (1/(2C) − (dqφ/dq) ∂q/∂C),   ∂I_p/∂L = I_p (−1/(2L) − (dqφ/dq) ∂q/∂L)
 */
function peakAndDerivatives(L: number, R: number, C: number, V0: number) {
  const alpha = R / (2 * L);
  const omegaD = Math.sqrt(1 / (L * C) - alpha * alpha);
  const q = alpha / omegaD;
  const phi = Math.atan(1 / q);
  const peak = V0 * Math.sqrt(C / L) * Math.exp(-q * phi);
  const dQPhi = phi - q / (1 + q * q);
  const dOmegaDdC = -1 / (2 * omegaD * L * C * C);
  const dqdC = -(alpha / (omegaD * omegaD)) * dOmegaDdC;
  const dAlphadL = -alpha / L;
  const dOmegaDdL = (-1 / (L * L * C) + (2 * alpha * alpha) / L) / (2 * omegaD);
  const dqdL = dAlphadL / omegaD - (alpha / (omegaD * omegaD)) * dOmegaDdL;
  return { peak, dC: peak * (1 / (2 * C) - dQPhi * dqdC), dL: peak * (-1 / (2 * L) - dQPhi * dqdL) };
}

describe('linear propagation', () => {
  const base = (): Scenario => scenario({ friction: LOCKED, solver: { currentFloor: 1e-9 } });

  it('the analytic derivatives above agree with the closed form differenced by hand (a check of the derivation)', () => {
    const { inductance: L, resistance: R, capacitance: C, voltage: V0 } = lockedLoop(base());
    const at = peakAndDerivatives(L, R, C, V0);
    const h = 1e-6;
    expect(at.dC / ((peakAndDerivatives(L, R, C * (1 + h), V0).peak - peakAndDerivatives(L, R, C * (1 - h), V0).peak) / (2 * h * C)) - 1).toBeLessThan(1e-6);
    expect(at.dL / ((peakAndDerivatives(L * (1 + h), R, C, V0).peak - peakAndDerivatives(L * (1 - h), R, C, V0).peak) / (2 * h * L)) - 1).toBeLessThan(1e-6);
  });

  it('σ of the peak current from C ±5 % uniform and module L σ 2 % normal matches the analytic derivative (series RLC natural response; GUM §5.1.2)', () => {
    const s = base();
    s.tolerances = [tolerance('bank[0].capacitance', 'uniform', 0.05), tolerance('bank[0].inductance', 'normal', 0.02)];
    const { inductance: L, resistance: R, capacitance: C, voltage: V0 } = lockedLoop(s);
    const { peak, dC, dL } = peakAndDerivatives(L, R, C, V0);
    // uniform ±a has σ = a/√3 (GUM §4.3.7); the loop L moves one for one with the module L
    const sigmaC = (0.05 * C) / Math.sqrt(3);
    const sigmaL = 0.02 * s.bank[0]!.inductance;
    const expected = Math.hypot(dC * sigmaC, dL * sigmaL);

    const result = propagateLinear(s, runShot)!;
    expect(result.outcome).toBe('stalled');
    expect(Math.abs(result.nominal.peakCurrent! / peak - 1)).toBeLessThan(1e-8);
    expect(Math.abs(result.sensitivities.peakCurrent[0]! / (dC * sigmaC) - 1)).toBeLessThan(1e-4);
    expect(Math.abs(result.sensitivities.peakCurrent[1]! / (dL * sigmaL) - 1)).toBeLessThan(1e-4);
    expect(Math.abs(result.standardUncertainty.peakCurrent! / expected - 1)).toBeLessThan(1e-4);
    // a locked armature never exits: no exit time, so no uncertainty of it; and nothing changes the outcome
    expect(result.standardUncertainty.exitTime).toBeNull();
    expect(result.standardUncertainty.muzzleVelocity).toBe(0);
    expect(result.outcomeChanges).toEqual([]);
    expect(result.shots).toBe(1 + 4 * 2);
  });

  it('correlated inputs: a common draw on both groups of a two-group bank equals the sum of the separate sensitivities (GUM §5.2, r = 1)', () => {
    const s = base();
    s.bank = [s.bank[0]!, { ...s.bank[0]!, label: 'second' }];
    const both: Tolerance = { where: 'test', path: 'bank[*].voltage', distribution: 'normal', spread: 0.01, relative: true, common: false, targets: [0, 1].map((g) => ({ path: `bank[${g}].voltage`, follows: [] })) };
    s.tolerances = [both];
    const separate = propagateLinear(s, runShot)!;
    s.tolerances = [{ ...both, common: true }];
    const common = propagateLinear(s, runShot)!;
    const [a, b] = separate.sensitivities.peakCurrent as number[];
    expect(common.inputs).toHaveLength(1);
    expect(Math.abs(common.standardUncertainty.peakCurrent! / (a! + b!) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(separate.standardUncertainty.peakCurrent! / Math.hypot(a!, b!) - 1)).toBeLessThan(1e-9);
    // the peak current of a linear circuit is proportional to the charge voltage: σ_I / I = σ_V / V
    expect(Math.abs(common.standardUncertainty.peakCurrent! / common.nominal.peakCurrent! - 0.01)).toBeLessThan(1e-6);
  });
});
