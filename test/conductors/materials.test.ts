import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { getMaterial, materialFromObject, MATERIALS, MATERIAL_FIELDS, resolveMaterial, userMaterialsFromObject, type Material } from '../../src/conductors/materials.js';

function whereOf(fn: () => unknown): string {
  try {
    fn();
  } catch (error) {
    if (error instanceof InputError) return `${error.where} | ${error.problem}`;
    throw error;
  }
  throw new Error('expected an InputError');
}

describe('materials library reads back its sources', () => {
  it('copper: IEC 60028 resistivity 1.7241e-8 Ω·m and α 0.00393 /K (published: IEC 60028)', () => {
    const copper = getMaterial('copper');
    expect(copper.resistivity).toBe(1.7241e-8);
    expect(copper.temperatureCoefficient).toBe(3.93e-3);
    expect(MATERIALS.copper.resistivity.source).toMatch(/IEC 60028/);
  });

  it('copper: CRC Handbook values, density 8960, c 385, melting 1084.62 °C, fusion 209 J/g (from memory, high)', () => {
    const copper = getMaterial('Copper');
    expect([copper.density, copper.specificHeat, copper.meltingTemperature, copper.latentHeat]).toEqual([8960, 385, 1084.62, 209e3]);
  });

  it('6061-T6 is 43 % IACS (ρ ≈ 4.0e-8 Ω·m) with solidus 582 °C (published: alloy datasheets)', () => {
    const alloy = getMaterial('aluminum 6061-T6');
    expect(alloy.resistivity).toBeCloseTo(4.01e-8, 10);
    expect(alloy.meltingTemperature).toBe(582);
  });

  it('Matthiessen-derived α of alloys stays below the base metal (alloys add temperature-independent resistivity)', () => {
    expect(getMaterial('copper-chromium').temperatureCoefficient).toBeLessThan(getMaterial('copper').temperatureCoefficient);
    expect(getMaterial('7075-t6').temperatureCoefficient).toBeLessThan(getMaterial('aluminium-6061-t6').temperatureCoefficient);
  });

  it('every library value is positive and carries a source tag (published / derived / from memory)', () => {
    for (const entry of Object.values(MATERIALS)) {
      for (const field of MATERIAL_FIELDS) {
        expect(entry[field].value).toBeGreaterThan(0);
        expect(entry[field].source).toMatch(/^(published|derived|from memory)/);
      }
    }
  });
});

describe('user materials and errors name the path', () => {
  const own: Material = {
    name: 'lab-brass',
    resistivity: 6.4e-8,
    temperatureCoefficient: 1.5e-3,
    density: 8500,
    specificHeat: 380,
    meltingTemperature: 900,
    latentHeat: 170e3,
  };

  it("a scenario's own material is found by name before the library", () => {
    expect(getMaterial('lab-brass', 'rails.material', { 'lab-brass': own })).toBe(own);
    expect(resolveMaterial({ ...own }, 'armature.material')).toEqual(own);
  });

  it("a scenario's materials table is validated entry by entry and found by name", () => {
    const { name: _name, ...fields } = own;
    const table = userMaterialsFromObject({ 'lab-brass': fields });
    expect(getMaterial('lab-brass', 'rails.material', table)).toEqual(own);
    expect(whereOf(() => userMaterialsFromObject({ 'lab-brass': { ...fields, latentHeat: 0 } }))).toMatch(/^materials\.lab-brass\.latentHeat \|/);
    expect(whereOf(() => userMaterialsFromObject([]))).toMatch(/^materials \|/);
  });

  it('an unknown name suggests the closest one', () => {
    expect(whereOf(() => getMaterial('coper', 'rails.material'))).toMatch(/^rails\.material \| unknown material "coper" \(did you mean "copper"\?\)/);
    expect(whereOf(() => getMaterial('unobtainium', 'armature.material'))).toMatch(/^armature\.material \| unknown material "unobtainium"; known:/);
  });

  it('missing, negative and misspelt fields are rejected at their path', () => {
    const { density: _density, ...missing } = own;
    expect(whereOf(() => materialFromObject(missing, 'materials.brass'))).toMatch(/^materials\.brass\.density \| missing/);
    expect(whereOf(() => materialFromObject({ ...own, resistivity: -1 }, 'materials.brass'))).toMatch(/^materials\.brass\.resistivity \| expected a value greater than 0/);
    expect(whereOf(() => materialFromObject({ ...own, specificHeat: 'lots' }, 'materials.brass'))).toMatch(/^materials\.brass\.specificHeat \| expected a number/);
    expect(whereOf(() => materialFromObject({ ...own, densty: 1 }, 'materials.brass'))).toMatch(/^materials\.brass\.densty \| unknown key \(did you mean "density"\?\)/);
    expect(whereOf(() => materialFromObject({ ...own, meltingTemperature: 10 }, 'materials.brass'))).toMatch(/^materials\.brass\.meltingTemperature/);
    expect(whereOf(() => materialFromObject(42, 'materials.brass'))).toMatch(/^materials\.brass \| expected a material object/);
  });
});
