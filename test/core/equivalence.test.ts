/**
 * Identities the shot must satisfy whatever the scenario: a group of n modules is n modules (exact
 * equivalence of parallel identical branches, circuit theory), the energy ledger closes (conservation of
 * energy), the impulse equals the momentum (Newton's second law), static friction holds until ½L′I² > μ_s F_N.
 */
import { describe, expect, it } from 'vitest';
import { runShot } from '../../src/solve/shot.js';
import { LOCKED, lockedLoop, moduleGroup, scenario } from '../helpers/scenario.js';
import { brentRoot } from '../../src/solve/roots.js';

const crowbar = { drop: 25, resistance: 3e-3 };

describe('a group of count n equals n separate identical modules (parallel identical branches)', () => {
  it('same trigger, moving armature, crowbar: every result agrees to 1e-9', () => {
    const tight = { relTol: 1e-12 };
    const grouped = runShot(scenario({ solver: tight, bank: [moduleGroup({ count: 3, crowbar })] }), { waveforms: false });
    const separate = runShot(
      scenario({ solver: tight, bank: [0, 1, 2].map(() => moduleGroup({ crowbar })) }),
      { waveforms: false },
    );
    const a = grouped.results;
    const b = separate.results;
    const close = (x: number, y: number, scale: number) => expect(Math.abs(x - y) / scale).toBeLessThan(1e-9);
    expect(a.outcome).toBe(b.outcome);
    close(a.muzzleVelocity, b.muzzleVelocity, a.muzzleVelocity);
    close(a.exitTime!, b.exitTime!, a.exitTime!);
    close(a.peakCurrent, b.peakCurrent, a.peakCurrent);
    close(a.peakAcceleration, b.peakAcceleration, a.peakAcceleration);
    close(a.actionIntegral, b.actionIntegral, a.actionIntegral);
    close(a.modules[0]!.peakCurrent, b.modules[1]!.peakCurrent, a.modules[0]!.peakCurrent);
    const e0 = a.energy.initial;
    close(a.energy.kinetic, b.energy.kinetic, e0);
    close(a.energy.magnetic, b.energy.magnetic, e0);
    for (const key of Object.keys(a.energy.losses) as (keyof typeof a.energy.losses)[]) {
      close(a.energy.losses[key], b.energy.losses[key], e0);
    }
  });
});

describe('static friction (Coulomb friction: the armature starts when ½L′I² first exceeds μ_s·F_N)', () => {
  it('the start time is the root of the locked-armature current at the breakaway current', () => {
    const friction = { coefficient: 0.15, staticCoefficient: 0.3, preload: 400, magneticLoading: 1e-8 };
    const s = scenario({ friction, solver: { relTol: 1e-10 } });
    const shot = runShot(s);
    const start = shot.events.find((e) => e.kind === 'start')!;
    // before the start the armature is locked: series RLC natural response (circuits textbook)
    const { inductance: L, resistance: R, capacitance: C, voltage: V0 } = lockedLoop(s);
    const alpha = R / (2 * L);
    const omegaD = Math.sqrt(1 / (L * C) - alpha * alpha);
    const current = (t: number) => (V0 / (omegaD * L)) * Math.exp(-alpha * t) * Math.sin(omegaD * t);
    const Lp = s.rails.inductanceGradient;
    const breakaway = Math.sqrt((friction.staticCoefficient * friction.preload) / (0.5 * Lp - friction.staticCoefficient * friction.magneticLoading));
    const expected = brentRoot((t) => current(t) - breakaway, 0, Math.atan(omegaD / alpha) / omegaD);
    expect(Math.abs(start.t - expected) / expected).toBeLessThan(1e-8);
    // just after the start, the acceleration jumps to (½L′I² − μ F_N)/m > 0 (μ_s > μ)
    expect(shot.results.peakAcceleration).toBeGreaterThan(0);
  });

  it('with ½L′I² never above μ_s F_N the armature never moves', () => {
    const shot = runShot(scenario({ friction: LOCKED }));
    expect(shot.events.some((e) => e.kind === 'start')).toBe(false);
    expect(shot.results.muzzleVelocity).toBe(0);
  });
});

describe('exit location and sampling independence', () => {
  it('exit is located to 1e-9 m and the exit velocity does not depend on sampleInterval', () => {
    const velocities: number[] = [];
    for (const sampleInterval of [1e-6, 0.37e-6, 5e-6, 0]) {
      const shot = runShot(scenario({ bank: [moduleGroup({ crowbar })], solver: { sampleInterval } }));
      expect(shot.results.outcome).toBe('exited');
      expect(Math.abs(shot.results.finalPosition - 1.0)).toBeLessThan(1e-9);
      velocities.push(shot.results.muzzleVelocity);
    }
    for (const v of velocities) expect(Math.abs(v - velocities[0]!) / velocities[0]!).toBeLessThan(1e-12);
  });
});
