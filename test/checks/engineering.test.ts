import { describe, expect, it } from 'vitest';
import type { ShotResults } from '../../src/solve/types.js';
import { engineeringChecks, type Check, type EngineeringInput } from '../../src/checks/engineering.js';
import { DEFAULT_LIMITS, validateLimits } from '../../src/scenario/limits.js';
import { meltingAction, specificActionToTemperature } from '../../src/conductors/heating.js';
import { getMaterial } from '../../src/conductors/materials.js';
import { currentCarryingArea } from '../../src/conductors/resistance.js';
import { InputError } from '../../src/core/errors.js';

const MU0 = 4e-7 * Math.PI;
const copper = getMaterial('copper');

function results(over: Partial<ShotResults> = {}): ShotResults {
  const losses = { bank: 0, crowbar: 0, modules: 0, feed: 0, rails: 0, armature: 0, contacts: 0, arc: 0, friction: 0, drag: 0 };
  return {
    outcome: 'exited',
    muzzleVelocity: 300,
    exitTime: 2e-3,
    finalPosition: 1,
    peakCurrent: 100e3,
    peakCurrentTime: 0.4e-3,
    peakAcceleration: 5e5,
    peakBreechVoltage: 300,
    actionIntegral: 1e6,
    efficiency: 0.02,
    energy: { initial: 0, capacitors: 0, magnetic: 0, magneticRails: 0, kinetic: 0, losses, residual: 0 },
    modules: [{ label: 'group 1', peakCurrent: 100e3, reversal: 0 }],
    ...over,
  };
}

/** A low-voltage, low-energy bank so the hazard checks stay quiet unless a test wants them. */
const quietBank = [{ label: 'group 1', count: 1, capacitance: 1e-3, voltage: 50 }];

function check(input: Partial<EngineeringInput>, id: string): Check {
  const found = engineeringChecks({ results: results(), bank: quietBank, ...input }).find((c) => c.id === id);
  if (!found) throw new Error(`no check ${id}`);
  return found;
}

describe('armature specific action against the action to melting (adiabatic, derived; Onderdonk for copper)', () => {
  const area = 1e-4;
  const limit = meltingAction(copper);
  const verdictAt = (fraction: number) =>
    check({ results: results({ actionIntegral: fraction * limit * area * area }), armature: { currentArea: area, material: copper } }, 'armature-action').verdict;
  it('passes below 80 % (design margin chosen here), warns from 80 %, fails from 100 %', () => {
    expect(verdictAt(0.79)).toBe('pass');
    expect(verdictAt(0.801)).toBe('warn');
    expect(verdictAt(0.999)).toBe('warn');
    expect(verdictAt(1.001)).toBe('fail');
  });
  it('is left out without an armature cross-section', () => {
    expect(engineeringChecks({ results: results(), bank: quietBank }).some((c) => c.id === 'armature-action')).toBe(false);
  });
});

describe('rail heating (adiabatic through the penetration layer, derived)', () => {
  const geometry = { kind: 'rectangular' as const, height: 0.02, width: 0.02, separation: 0.02 };
  const tau = 0.3e-3;
  const area = currentCarryingArea(geometry, copper.resistivity, tau);
  const verdictAt = (fraction: number) => {
    const temperature = 20 + fraction * (copper.meltingTemperature - 20);
    const action = specificActionToTemperature(copper, temperature) * area * area;
    return check({ results: results({ actionIntegral: action }), rails: { geometry, material: copper, characteristicTime: tau } }, 'rail-heating');
  };
  it('reports the rise, warns from half the rise to melting (margin chosen here), fails at melting', () => {
    expect(verdictAt(0.3).value).toBeCloseTo(0.3 * (copper.meltingTemperature - 20), 6);
    expect(verdictAt(0.49).verdict).toBe('pass');
    expect(verdictAt(0.51).verdict).toBe('warn');
    expect(verdictAt(0.99).verdict).toBe('warn');
    expect(verdictAt(1.01).verdict).toBe('fail');
  });
});

describe('linear current density (common practice, 40–50 kA/mm)', () => {
  const geometry = { kind: 'rectangular' as const, height: 0.01, width: 0.01, separation: 0.01 };
  const verdictAt = (kAperMm: number) => check({ results: results({ peakCurrent: kAperMm * 1e6 * 0.01 }), rails: { geometry } }, 'linear-current-density');
  it('is peak current per rail height; passes below 40, warns from 40, fails from 50 kA/mm (limit 50, warnAt 40, at most)', () => {
    expect(verdictAt(30).value).toBeCloseTo(30e6, 3);
    expect(verdictAt(30)).toMatchObject({ limit: 50e6, warnAt: 40e6, direction: 'at-most' });
    expect(verdictAt(39.9).verdict).toBe('pass');
    expect(verdictAt(40.1).verdict).toBe('warn');
    expect(verdictAt(49.9).verdict).toBe('warn');
    expect(verdictAt(50.1).verdict).toBe('fail');
  });
});

describe('solid-armature contact force (common practice: 1 gf per ampere)', () => {
  it('passes at or above 9.80665 mN per ampere of peak current, warns below (a minimum: direction at-least)', () => {
    const at = (preload: number) => check({ results: results({ peakCurrent: 100e3 }), contact: { preload, magneticLoading: 1e-7 } }, 'contact-force');
    expect(at(0).direction).toBe('at-least');
    // magnetic part: 1e-7 × (1e5)² = 1000 N; the rule asks 980.665 N
    expect(at(0).value).toBeCloseTo(1000, 9);
    expect(at(0).limit).toBeCloseTo(980.665, 9);
    expect(at(0).verdict).toBe('pass');
    const weak = check({ results: results({ peakCurrent: 100e3 }), contact: { preload: 0, magneticLoading: 0.98e-7 } }, 'contact-force');
    expect(weak.verdict).toBe('warn');
  });
});

describe('rail separating force', () => {
  const round = { kind: 'round' as const, radius: 2e-3, centreDistance: 30e-3 };
  it("for perfectly conducting round rails, virtual work on the field solution gives μ0I²/(2π√(d² − 4a²)), just above Ampère's μ0I²/(2πd) (derived from the exact two-wire line; IUPAC Gold Book, ampere)", () => {
    const I = 200e3;
    const c = check({ results: results({ peakCurrent: I }), rails: { geometry: round } }, 'rail-separating-force');
    const exact = (MU0 * I * I) / (2 * Math.PI * Math.sqrt(30e-3 ** 2 - 4 * 2e-3 ** 2));
    expect(Math.abs(c.value / exact - 1)).toBeLessThan(1e-3);
    expect(c.value).toBeGreaterThan((MU0 * I * I) / (2 * Math.PI * 30e-3));
    // no containment rating given: a figure for information, not a pass
    expect(c.verdict).toBe('info');
    expect(c.direction).toBe('at-most');
    expect(c.note).toMatch(/no limit given/);
  });
  it('flat rails close together: at least the Ampère figure at the centre distance', () => {
    const flat = { kind: 'rectangular' as const, height: 0.03, width: 0.01, separation: 0.01 };
    const c = check({ results: results({ peakCurrent: 100e3 }), rails: { geometry: flat } }, 'rail-separating-force');
    expect(c.value).toBeGreaterThanOrEqual((MU0 * 1e10) / (2 * Math.PI * 0.02));
  });
  it('passes at the given containment limit and fails above it', () => {
    const value = check({ rails: { geometry: round } }, 'rail-separating-force').value;
    expect(check({ rails: { geometry: round }, limits: { railSeparatingForcePerLength: value } }, 'rail-separating-force').verdict).toBe('pass');
    expect(check({ rails: { geometry: round }, limits: { railSeparatingForcePerLength: value * 0.999 } }, 'rail-separating-force').verdict).toBe('fail');
  });
});

describe('peak acceleration against a payload limit', () => {
  it('is "info" (no verdict) when the scenario gives no limit, never a pass', () => {
    const c = check({}, 'peak-acceleration');
    expect(c.verdict).toBe('info');
    expect(c.limit).toBeNull();
    expect(c.direction).toBe('at-most');
    expect(c.note).toMatch(/no limit given/);
  });
  it('passes at the limit and fails above it', () => {
    expect(check({ limits: { peakAcceleration: 5e5 } }, 'peak-acceleration').verdict).toBe('pass');
    expect(check({ limits: { peakAcceleration: 4.99e5 } }, 'peak-acceleration').verdict).toBe('fail');
  });
});

describe('capacitor voltage reversal (common practice: rated 10–20 %)', () => {
  const withReversal = (reversal: number, ratedReversal?: number) =>
    check(
      {
        results: results({ modules: [{ label: 'group 1', peakCurrent: 1, reversal }] }),
        bank: [{ label: 'group 1', count: 1, capacitance: 1e-3, voltage: 50, ...(ratedReversal === undefined ? {} : { ratedReversal }) }],
      },
      'capacitor-reversal[0]',
    ).verdict;
  it('passes up to the default 20 % and fails above it', () => {
    expect(withReversal(0.2)).toBe('pass');
    expect(withReversal(0.2001)).toBe('fail');
  });
  it("uses the group's own rating when given", () => {
    expect(withReversal(0.1, 0.1)).toBe('pass');
    expect(withReversal(0.11, 0.1)).toBe('fail');
  });
});

describe('capacitor hazard classes (published: DOE-HDBK-1092)', () => {
  const bankAt = (voltage: number, energy: number) => [{ label: 'g', count: 1, capacitance: (2 * energy) / (voltage * voltage), voltage }];
  const verdicts = (voltage: number, energy: number) => {
    const all = engineeringChecks({ results: results(), bank: bankAt(voltage, energy) });
    return [all.find((c) => c.id === 'capacitor-shock-hazard')!, all.find((c) => c.id === 'capacitor-arc-flash-hazard')!];
  };
  it('shock hazard from 100 V and 10 J; below the thresholds a class is "info", never a pass', () => {
    expect(verdicts(100, 10.01)[0]!).toMatchObject({ verdict: 'warn', hazardClass: 'shock', direction: null });
    expect(verdicts(100, 9.99)[0]!).toMatchObject({ verdict: 'info', hazardClass: null });
    expect(verdicts(99.9, 50)[0]!).toMatchObject({ verdict: 'info', hazardClass: null });
    expect(verdicts(100, 10.01)[0]!.note).toMatch(/SHOCK HAZARD.*local codes/);
  });
  it('thermal hazard below 100 V above 100 J', () => {
    expect(verdicts(99.9, 100.1)[0]!).toMatchObject({ verdict: 'warn', hazardClass: 'thermal' });
    expect(verdicts(99.9, 100.1)[0]!.note).toMatch(/THERMAL/);
    expect(verdicts(99.9, 99.9)[0]!.verdict).toBe('info');
  });
  it('arc-flash hazard from 100 V and 10 kJ; a lethal bank is never passed (the bench demo: 9.92 kJ at 6.3 kV)', () => {
    const [shock, arc] = verdicts(10e3, 50e3);
    expect(shock!.verdict).toBe('warn');
    expect(arc!).toMatchObject({ verdict: 'warn', hazardClass: 'arc-flash' });
    expect(arc!.note).toMatch(/ARC-FLASH HAZARD.*Charged capacitor banks can kill/);
    const [benchShock, benchArc] = verdicts(6300, 9.92e3);
    expect(benchShock!).toMatchObject({ verdict: 'warn', hazardClass: 'shock' });
    expect(benchArc!).toMatchObject({ verdict: 'info', hazardClass: null });
    expect(verdicts(1000, 10.01e3)[1]!.verdict).toBe('warn');
    for (const voltage of [50, 100, 1000, 10e3]) for (const energy of [1, 50, 500, 5e3, 5e4]) {
      expect(verdicts(voltage, energy).map((c) => c.verdict)).not.toContain('pass');
    }
  });
  it('counts every module of a group in the stored energy', () => {
    const all = engineeringChecks({ results: results(), bank: [{ label: 'g', count: 4, capacitance: 1e-3, voltage: 1000 }] });
    expect(all.find((c) => c.id === 'capacitor-shock-hazard')!.value).toBeCloseTo(2000, 9);
  });
});

describe('limits from a scenario', () => {
  it('accepts known thresholds and rejects unknown keys, non-positive values and a fail band below the warn band', () => {
    expect(validateLimits({ peakAcceleration: 1e5 })).toEqual({ peakAcceleration: 1e5 });
    expect(() => validateLimits({ peakAcceleraton: 1 })).toThrow(InputError);
    expect(() => validateLimits({ ratedReversal: -0.1 })).toThrow(/limits\.ratedReversal/);
    expect(() => validateLimits({ actionWarnFraction: 1.5 })).toThrow(/limits\.actionWarnFraction/);
    expect(() => validateLimits({ linearCurrentDensityFail: DEFAULT_LIMITS.linearCurrentDensityWarn / 2 })).toThrow(/linearCurrentDensityFail/);
  });
});

describe('every check states how it is judged', () => {
  it('a limited check has a direction; a hazard class has none but a class', () => {
    const geometry = { kind: 'rectangular' as const, height: 0.02, width: 0.02, separation: 0.02 };
    const all = engineeringChecks({
      results: results(),
      bank: [{ label: 'g', count: 1, capacitance: 1e-3, voltage: 5000 }],
      rails: { geometry, material: copper, characteristicTime: 0.3e-3 },
      armature: { currentArea: 1e-4, material: copper },
      contact: { preload: 100, magneticLoading: 0 },
    });
    for (const c of all) {
      if (/hazard$/.test(c.id)) expect(c.direction, c.id).toBeNull();
      else expect(['at-most', 'at-least'], c.id).toContain(c.direction);
      expect(['pass', 'warn', 'fail', 'info'], c.id).toContain(c.verdict);
    }
    expect(all.filter((c) => c.direction === 'at-least').map((c) => c.id)).toEqual(['contact-force']);
  });
});
