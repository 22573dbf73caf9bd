import { describe, expect, it } from 'vitest';
import { fusionAction, meltingAction, specificActionToTemperature, temperatureAfterAction } from '../../src/conductors/heating.js';
import { getMaterial } from '../../src/conductors/materials.js';

// Onderdonk's fusing equation for copper (published: cited in D. Brooks, "Onderdonk's and Preece's
// Equations", PCD&F; form from memory, high): I = A·√(log10((Tm − Ta)/(234 + Ta) + 1) / (33 S)),
// A in circular mils, S in seconds, Tm = 1083 °C. So ∫I²dt/A² = log10(…)/33 A²·s/cmil².
const SQUARE_METRE_IN_CIRCULAR_MILS = 1 / ((Math.PI / 4) * (25.4e-6) ** 2); // 1 cmil = area of a 1 mil circle
function onderdonk(ambient: number): number {
  return (Math.log10((1083 - ambient) / (234 + ambient) + 1) / 33) * SQUARE_METRE_IN_CIRCULAR_MILS ** 2;
}

describe('action to melting', () => {
  it("copper from 20 °C agrees with Onderdonk's equation within 2 % (≈ 8.4e16 A²·s/m⁴)", () => {
    const copper = getMaterial('copper');
    expect(onderdonk(20)).toBeGreaterThan(8.3e16);
    expect(onderdonk(20)).toBeLessThan(8.5e16);
    expect(Math.abs(meltingAction(copper) / onderdonk(20) - 1)).toBeLessThan(0.02);
  });

  it("copper from 40 °C still agrees with Onderdonk's equation within 2 %", () => {
    expect(Math.abs(meltingAction(getMaterial('copper'), 40) / onderdonk(40) - 1)).toBeLessThan(0.02);
  });

  it('aluminium alloys melt at a far smaller action than copper (lower γc/ρ and lower melting point)', () => {
    expect(meltingAction(getMaterial('aluminium-6061-t6'))).toBeLessThan(0.5 * meltingAction(getMaterial('copper')));
  });

  it('the latent-heat part for copper is γ·L_f/ρ(T_m) [derived]', () => {
    const copper = getMaterial('copper');
    const rhoMelt = 1.7241e-8 * (1 + 3.93e-3 * (1084.62 - 20));
    expect(fusionAction(copper)).toBeCloseTo((8960 * 209e3) / rhoMelt, -10);
  });
});

describe('adiabatic temperature after an action', () => {
  it('inverts the action integral (round trip)', () => {
    const copper = getMaterial('copper');
    for (const t of [50, 300, 1000]) expect(temperatureAfterAction(copper, specificActionToTemperature(copper, t, 25), 25)).toBeCloseTo(t, 9);
  });

  it('a small action heats at constant resistivity: ΔT = ρ·g/(γc) (Joule heating, derived)', () => {
    const copper = getMaterial('copper');
    const g = 1e12;
    expect(temperatureAfterAction(copper, g) - 20).toBeCloseTo((1.7241e-8 * g) / (8960 * 385), 6);
  });
});
