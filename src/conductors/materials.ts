/**
 * Conductor materials as data. Every value is SI except temperatures, which are in °C (the unit the
 * scenario loader converts temperatures to); the temperature coefficient is per kelvin, referred to 20 °C.
 * Each value carries where it comes from: a published standard or handbook, "derived" (with how), or
 * "from memory" with a confidence. Alloy figures are typical, not guaranteed minima: for a real design use
 * the supplier's certified data.
 */
import { InputError } from '../core/errors.js';
import type { DimensionName } from '../units/quantity.js';

export interface Sourced {
  value: number;
  source: string;
}

/** The numbers the physics uses (SI; temperatures in °C). */
export interface Material {
  name: string;
  /** ρ at 20 °C (Ω·m) */
  resistivity: number;
  /** α of ρ(T) = ρ20·(1 + α·(T − 20 °C)) (1/K) */
  temperatureCoefficient: number;
  /** γ (kg/m³) */
  density: number;
  /** c (J/(kg·K)), taken as constant */
  specificHeat: number;
  /** melting point, or solidus for an alloy (°C) */
  meltingTemperature: number;
  /** latent heat of fusion (J/kg) */
  latentHeat: number;
}

export const MATERIAL_FIELDS = [
  'resistivity',
  'temperatureCoefficient',
  'density',
  'specificHeat',
  'meltingTemperature',
  'latentHeat',
] as const;
export type MaterialField = (typeof MATERIAL_FIELDS)[number];

/** The dimension of each field, for the loader's toSI on a scenario's own materials. */
export const MATERIAL_FIELD_DIMENSIONS: Record<MaterialField, DimensionName> = {
  resistivity: 'resistivity',
  temperatureCoefficient: 'perKelvin',
  density: 'density',
  specificHeat: 'specificHeat',
  meltingTemperature: 'temperature',
  latentHeat: 'specificEnergy',
};

export type SourcedMaterial = { name: string; description: string } & Record<MaterialField, Sourced>;

const IACS = 1.7241e-8; // Ω·m, 100 % IACS (IEC 60028)
// Matthiessen's rule: alloying adds a temperature-independent resistivity, so dρ/dT stays near the base
// metal's; α of an alloy ≈ (ρ_base·α_base)/ρ_alloy.
const COPPER_SLOPE = IACS * 3.93e-3;
const ALUMINIUM_SLOPE = 2.65e-8 * 4.29e-3;

export const MATERIALS = {
  copper: {
    name: 'copper',
    description: 'annealed copper (IEC 60028 standard)',
    resistivity: { value: 1.7241e-8, source: 'published: IEC 60028, international annealed copper standard' },
    temperatureCoefficient: { value: 3.93e-3, source: 'published: IEC 60028 (0.00393 /K at 20 °C)' },
    density: { value: 8960, source: 'from memory, high: CRC Handbook of Chemistry and Physics (IEC 60028 uses 8890 for the standard)' },
    specificHeat: { value: 385, source: 'from memory, high: CRC Handbook (25 °C)' },
    meltingTemperature: { value: 1084.62, source: 'from memory, high: CRC Handbook; ITS-90 fixed point' },
    latentHeat: { value: 209e3, source: 'from memory, high: CRC Handbook (13.26 kJ/mol ÷ 63.546 g/mol)' },
  },
  'copper-chromium': {
    name: 'copper-chromium',
    description: 'Cu–Cr rail alloy, C18200 solution-treated and aged (typical values)',
    resistivity: { value: IACS / 0.8, source: 'from memory, medium: ≈ 80 % IACS, copper alloy datasheets (C18200 aged)' },
    temperatureCoefficient: { value: COPPER_SLOPE / (IACS / 0.8), source: "derived: Matthiessen's rule from copper's dρ/dT (≈ 3.1e-3 /K), medium" },
    density: { value: 8890, source: 'from memory, medium: copper alloy datasheets (8.89 g/cm³)' },
    specificHeat: { value: 385, source: 'from memory, medium: taken as copper (≤ 1 % Cr)' },
    meltingTemperature: { value: 1070, source: 'from memory, medium: solidus, copper alloy datasheets (C18200)' },
    latentHeat: { value: 209e3, source: 'from memory, low: taken as copper (≤ 1 % Cr)' },
  },
  'aluminium-6061-t6': {
    name: 'aluminium-6061-t6',
    description: 'aluminium alloy 6061-T6 (typical values)',
    resistivity: { value: IACS / 0.43, source: 'published: alloy datasheets, ≈ 43 % IACS (ρ ≈ 4.0e-8 Ω·m)' },
    temperatureCoefficient: { value: ALUMINIUM_SLOPE / (IACS / 0.43), source: "derived: Matthiessen's rule from pure aluminium's dρ/dT (≈ 2.8e-3 /K), medium" },
    density: { value: 2700, source: 'published: alloy datasheets (2.70 g/cm³)' },
    specificHeat: { value: 896, source: 'published: alloy datasheets (0.896 J/(g·K))' },
    meltingTemperature: { value: 582, source: 'published: alloy datasheets, solidus 582 °C' },
    latentHeat: { value: 390e3, source: 'from memory, low: near pure aluminium (397 J/g)' },
  },
  'aluminium-7075-t6': {
    name: 'aluminium-7075-t6',
    description: 'aluminium alloy 7075-T6 (typical values)',
    resistivity: { value: IACS / 0.33, source: 'from memory, medium: ≈ 33 % IACS, alloy datasheets' },
    temperatureCoefficient: { value: ALUMINIUM_SLOPE / (IACS / 0.33), source: "derived: Matthiessen's rule from pure aluminium's dρ/dT (≈ 2.2e-3 /K), medium" },
    density: { value: 2810, source: 'from memory, high: alloy datasheets (2.81 g/cm³)' },
    specificHeat: { value: 960, source: 'from memory, medium: alloy datasheets (0.96 J/(g·K))' },
    meltingTemperature: { value: 477, source: 'from memory, medium: solidus, alloy datasheets' },
    latentHeat: { value: 380e3, source: 'from memory, low: somewhat below pure aluminium' },
  },
  'aluminium-1350': {
    name: 'aluminium-1350',
    description: 'electrical-conductor aluminium 1350 (EC grade), hard drawn',
    resistivity: { value: 2.8264e-8, source: 'from memory, medium-high: IEC 60889 hard-drawn aluminium (61 % IACS)' },
    temperatureCoefficient: { value: 4.03e-3, source: 'from memory, medium-high: IEC 60889 (0.00403 /K)' },
    density: { value: 2703, source: 'from memory, medium-high: IEC 60889 (2703 kg/m³)' },
    specificHeat: { value: 900, source: 'from memory, high: CRC Handbook, aluminium (≈ 0.90 J/(g·K))' },
    meltingTemperature: { value: 646, source: 'from memory, medium: solidus, alloy datasheets (1350)' },
    latentHeat: { value: 397e3, source: 'from memory, high: CRC Handbook, aluminium (10.71 kJ/mol ÷ 26.98 g/mol)' },
  },
} as const satisfies Record<string, SourcedMaterial>;

export type MaterialName = keyof typeof MATERIALS;

/** Plain numbers of a library material. */
function plain(entry: SourcedMaterial): Material {
  return {
    name: entry.name,
    resistivity: entry.resistivity.value,
    temperatureCoefficient: entry.temperatureCoefficient.value,
    density: entry.density.value,
    specificHeat: entry.specificHeat.value,
    meltingTemperature: entry.meltingTemperature.value,
    latentHeat: entry.latentHeat.value,
  };
}

/** Spellings people use for the library names. */
const ALIASES: Record<string, MaterialName> = {
  cu: 'copper',
  'cu-cr': 'copper-chromium',
  cucr: 'copper-chromium',
  c18200: 'copper-chromium',
  '6061-t6': 'aluminium-6061-t6',
  '7075-t6': 'aluminium-7075-t6',
  '1350': 'aluminium-1350',
};

function canonical(name: string): string {
  return name.trim().toLowerCase().replace(/aluminum/g, 'aluminium').replace(/[\s_]+/g, '-');
}

/**
 * A material by name: the user's own materials first (a scenario's `materials` table, already SI), then
 * the library. An unknown name raises InputError at `path` with the closest known name.
 */
export function getMaterial(name: string, path = 'material', userMaterials: Readonly<Record<string, Material>> = {}): Material {
  // own keys only: a material named "constructor" or "__proto__" is a plain name, never Object.prototype's
  const own = Object.hasOwn(userMaterials, name) ? userMaterials[name] : undefined;
  if (own) return own;
  const key = canonical(name);
  const libraryName = (Object.hasOwn(MATERIALS, key) ? key : Object.hasOwn(ALIASES, key) ? ALIASES[key] : undefined) as MaterialName | undefined;
  if (libraryName) return plain(MATERIALS[libraryName]);
  const known = [...Object.keys(userMaterials), ...Object.keys(MATERIALS)];
  const suggestion = closest(key, known);
  throw new InputError(
    path,
    `unknown material ${JSON.stringify(name)}${suggestion ? ` (did you mean "${suggestion}"?)` : ''}; known: ${known.join(', ')}`,
  );
}

/**
 * A material the scenario defines itself (fields as in Material, SI numbers, temperatures in °C).
 * Every field is required; all but the melting temperature must be > 0.
 */
export function materialFromObject(raw: unknown, path: string, name?: string): Material {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw))
    throw new InputError(path, `expected a material object with ${MATERIAL_FIELDS.join(', ')}`);
  const record = raw as Record<string, unknown>;
  for (const key of Object.keys(record)) {
    if (key !== 'name' && !(MATERIAL_FIELDS as readonly string[]).includes(key)) {
      const suggestion = closest(key, [...MATERIAL_FIELDS]);
      throw new InputError(`${path}.${key}`, `unknown key${suggestion ? ` (did you mean "${suggestion}"?)` : ''}`);
    }
  }
  const field = (key: MaterialField): number => {
    const value = record[key];
    if (value === undefined) throw new InputError(`${path}.${key}`, 'missing; a material needs every one of ' + MATERIAL_FIELDS.join(', '));
    if (typeof value !== 'number' || !Number.isFinite(value)) throw new InputError(`${path}.${key}`, `expected a number, got ${JSON.stringify(value)}`);
    const mayBeNegative = key === 'meltingTemperature';
    if (!mayBeNegative && value <= 0) throw new InputError(`${path}.${key}`, `expected a value greater than 0, got ${value}`);
    return value;
  };
  const material: Material = {
    name: typeof record.name === 'string' ? record.name : (name ?? path),
    resistivity: field('resistivity'),
    temperatureCoefficient: field('temperatureCoefficient'),
    density: field('density'),
    specificHeat: field('specificHeat'),
    meltingTemperature: field('meltingTemperature'),
    latentHeat: field('latentHeat'),
  };
  if (material.meltingTemperature <= 20)
    throw new InputError(`${path}.meltingTemperature`, `expected a melting point above 20 °C (the reference temperature), got ${material.meltingTemperature} °C`);
  return material;
}

/** A material given either as a name or as an object (scenario `rails.material`, `armature.material`). */
export function resolveMaterial(spec: unknown, path: string, userMaterials: Readonly<Record<string, Material>> = {}): Material {
  return typeof spec === 'string' ? getMaterial(spec, path, userMaterials) : materialFromObject(spec, path);
}

function closest(word: string, candidates: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const candidate of candidates) {
    const d = editDistance(word, candidate.toLowerCase());
    if (d < bestDistance) {
      bestDistance = d;
      best = candidate;
    }
  }
  return bestDistance <= Math.max(2, Math.floor(word.length / 3)) ? best : undefined;
}

function editDistance(a: string, b: string): number {
  let row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const next = [i];
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      next.push(Math.min(row[j]! + 1, next[j - 1]! + 1, row[j - 1]! + cost));
    }
    row = next;
  }
  return row[b.length]!;
}

/**
 * A scenario's own `materials` table ({ name: material object }), validated field by field. A name that
 * shadows a library material is allowed (the scenario's own wins) but must be spelt as it is used.
 */
export function userMaterialsFromObject(raw: unknown, path = 'materials'): Record<string, Material> {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) throw new InputError(path, 'expected an object of named materials');
  const table: Record<string, Material> = {};
  for (const [name, entry] of Object.entries(raw as Record<string, unknown>)) {
    if (name.trim() === '') throw new InputError(path, 'a material needs a non-empty name');
    // defineProperty: assigning table["__proto__"] would replace the table's prototype instead of adding a material
    Object.defineProperty(table, name, { value: materialFromObject(entry, `${path}.${name}`, name), enumerable: true, writable: true, configurable: true });
  }
  return table;
}
