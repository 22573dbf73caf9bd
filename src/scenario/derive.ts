/**
 * Geometry and materials → model parameters: rail L′ (field solution) and R′ (current penetration) from the
 * rail cross-section and material, armature resistance and mass from its block and material. A number the
 * user gave always wins over a derived one.
 */
import { InputError } from '../core/errors.js';
import type { Scenario } from './types.js';
import { toSI, DIMENSIONS, QuantityError } from '../units/quantity.js';
import { railGeometryFromObject } from '../conductors/inductance.js';
import { MATERIAL_FIELDS, MATERIAL_FIELD_DIMENSIONS, resolveMaterial, userMaterialsFromObject, type Material, type MaterialField } from '../conductors/materials.js';
import { deriveRails } from '../conductors/rails.js';
import { deriveArmature } from '../conductors/armature.js';
import { bankCharacteristicTime, currentCarryingArea } from '../conductors/resistance.js';
import { FASTEST_RATE_TIMES_TAU, railDiffusionOf } from '../conductors/diffusion.js';
import { highFrequencyCurrentWidth } from '../conductors/inductance.js';
import { LIMIT_DIMENSIONS, validateLimits } from './limits.js';
import { MAX_NAME_LENGTH, type QuantityField, type Range } from './fields.js';
import { rangeProblem } from './ranges.js';

type Read = Record<string, unknown>;

function section(read: Read, key: string): Read {
  return (read[key] as Read | null | undefined) ?? {};
}

/** Most materials a scenario may define. */
const MAX_MATERIALS = 100;

const within = (min: number, max: number, minExclusive = false): Range => ({ min, max, minExclusive });
/**
 * Plausible ranges of a material's properties (SI; the melting point in °C): from graphite to silver, lithium to
 * tungsten, with room to spare.
 */
const MATERIAL_RANGES: Record<MaterialField, Range> = {
  resistivity: within(1e-10, 1e2),
  temperatureCoefficient: within(0, 1, true),
  density: within(100, 1e5),
  specificHeat: within(10, 1e5),
  meltingTemperature: within(20, 5000, true),
  latentHeat: within(0, 1e8, true),
};

function materialField(key: MaterialField): QuantityField {
  return { kind: 'quantity', dimension: DIMENSIONS[MATERIAL_FIELD_DIMENSIONS[key]], range: MATERIAL_RANGES[key], description: key };
}

/** Material fields may carry units ("1.72e-8 ohm m", "1084.6 degC"): read them to SI first, within range. */
function materialInSI(raw: unknown, path: string): unknown {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return raw;
  const out: Record<string, unknown> = { ...(raw as Record<string, unknown>) };
  if (typeof out.name === 'string' && out.name.length > MAX_NAME_LENGTH) {
    throw new InputError(`${path}.name`, `expected a text of at most ${MAX_NAME_LENGTH} characters, got ${out.name.length}`);
  }
  for (const key of MATERIAL_FIELDS) {
    let value = out[key];
    if (typeof value === 'string') {
      if (value.length > 100) throw new InputError(`${path}.${key}`, `expected a quantity such as "1.72e-8 ohm m", got a text of ${value.length} characters`);
      try {
        value = toSI(value, DIMENSIONS[MATERIAL_FIELD_DIMENSIONS[key]]);
      } catch (error) {
        if (error instanceof QuantityError) throw new InputError(`${path}.${key}`, error.message);
        throw error;
      }
      out[key] = value;
    }
    if (typeof value !== 'number' || !Number.isFinite(value)) continue; // the material reader names the problem
    const problem = rangeProblem(materialField(key), value);
    if (problem) throw new InputError(`${path}.${key}`, problem);
  }
  return out;
}

function userMaterials(read: Read): Record<string, Material> {
  const raw = read.materials;
  if (raw === undefined) return {};
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    throw new InputError('materials', 'expected an object of materials by name');
  }
  const entries = Object.entries(raw as Read);
  if (entries.length > MAX_MATERIALS) throw new InputError('materials', `expected at most ${MAX_MATERIALS} materials, got ${entries.length}`);
  for (const [name] of entries) {
    if (name.length > MAX_NAME_LENGTH) throw new InputError('materials', `a material name has ${name.length} characters; at most ${MAX_NAME_LENGTH}`);
  }
  const inSI = Object.fromEntries(entries.map(([name, m]) => [name, materialInSI(m, `materials.${name}`)]));
  return userMaterialsFromObject(inSI, 'materials');
}

function limitsInSI(raw: unknown): unknown {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return raw;
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(raw as Read)) {
    const dimension = Object.hasOwn(LIMIT_DIMENSIONS, key) ? LIMIT_DIMENSIONS[key as keyof typeof LIMIT_DIMENSIONS] : undefined;
    if (dimension && typeof value === 'string') {
      try {
        out[key] = toSI(value, dimension);
      } catch (error) {
        if (error instanceof QuantityError) throw new InputError(`limits.${key}`, error.message);
        throw error;
      }
    } else out[key] = value;
  }
  return out;
}

export function deriveFromGeometry(scenario: Scenario, read: Read, raw: Read, file?: string): void {
  try {
    derive(scenario, read, raw);
  } catch (error) {
    if (error instanceof InputError && !error.file && file) throw new InputError(error.where, error.problem, file);
    throw error;
  }
}

function derive(scenario: Scenario, read: Read, raw: Read): void {
  if (scenario.load) {
    // a ring-down has no rails or armature to derive; its limits are the bank's
    if (read.limits !== undefined) scenario.limits = validateLimits(limitsInSI(withoutSizingLimits(read.limits)), 'limits');
    return;
  }
  deriveDrag(scenario, read);
  const materials = userMaterials(read);
  const rails = section(read, 'rails');
  const armature = section(read, 'armature');
  const given = section(raw, 'armature');
  const cleanRails = { length: scenario.rails.length, inductanceGradient: scenario.rails.inductanceGradient, resistanceGradient: scenario.rails.resistanceGradient };
  scenario.rails = cleanRails;
  if (rails.material !== undefined) scenario.rails.material = resolveMaterial(materialInSI(rails.material, 'rails.material'), 'rails.material', materials);
  if (rails.geometry) {
    const geometry = railGeometryFromObject(stripUndefined(rails.geometry as Read), 'rails.geometry');
    const time = bankCharacteristicTime(scenario.bank, scenario.feed.inductance);
    const derived = deriveRails(geometry, scenario.rails.material, time, 'rails');
    const model = (rails.inductanceModel as string | undefined) ?? 'high-frequency';
    if (model !== 'high-frequency' && model !== 'uniform') {
      throw new InputError('rails.inductanceModel', `expected "high-frequency" or "uniform", got ${JSON.stringify(model)}`);
    }
    scenario.rails.geometry = geometry;
    scenario.rails.derived = derived;
    if (rails.inductanceGradient === undefined) {
      scenario.rails.inductanceGradient = model === 'uniform' ? derived.inductanceGradientUniform : derived.inductanceGradientHighFrequency;
    }
    const resistanceModel = rails.resistanceModel as string | undefined;
    if (resistanceModel !== undefined && resistanceModel !== 'diffusion' && resistanceModel !== 'quarter-period') {
      throw new InputError('rails.resistanceModel', `expected "diffusion" or "quarter-period", got ${JSON.stringify(resistanceModel)}`);
    }
    if (resistanceModel !== undefined && rails.resistanceGradient !== undefined) {
      throw new InputError('rails.resistanceModel', 'applies only when R\' comes from geometry and material: rails.resistanceGradient is given as a number, which the shot holds constant');
    }
    if (resistanceModel !== undefined && !scenario.rails.material) {
      throw new InputError('rails.resistanceModel', 'needs rails.material (the resistivity) as well as rails.geometry');
    }
    if (resistanceModel === 'diffusion' && geometry.kind !== 'rectangular') {
      throw new InputError('rails.resistanceModel', '"diffusion" is modelled for rectangular rails ({ height, width, separation }); use "quarter-period" for round rails');
    }
    const diffuse = rails.resistanceGradient === undefined && scenario.rails.material !== undefined && geometry.kind === 'rectangular' && resistanceModel !== 'quarter-period';
    if (diffuse && geometry.kind === 'rectangular') {
      const width = highFrequencyCurrentWidth(geometry);
      const diffusion = railDiffusionOf(geometry.height * geometry.width, width, scenario.rails.material!.resistivity, (scenario.solver.diffusionRate ?? FASTEST_RATE_TIMES_TAU) / time, 'rails');
      scenario.rails.diffusion = diffusion;
      scenario.rails.resistanceGradient = diffusion.resistanceGradientDC;
      scenario.rails.resistanceSource = 'diffusion';
    } else if (rails.resistanceGradient === undefined && derived.resistanceGradient !== null) {
      scenario.rails.resistanceGradient = derived.resistanceGradient;
      scenario.rails.resistanceSource = 'quarter-period';
    } else {
      scenario.rails.resistanceSource = rails.resistanceGradient === undefined ? 'none' : 'given';
    }
  } else if (rails.inductanceModel !== undefined) {
    throw new InputError('rails.inductanceModel', 'only applies with rails.geometry');
  } else if (rails.resistanceModel !== undefined) {
    throw new InputError('rails.resistanceModel', 'only applies with rails.geometry and rails.material');
  }
  if (rails.inductanceGradient === undefined && !rails.geometry) {
    throw new InputError('rails.inductanceGradient', 'missing required key (or give rails.geometry to compute it)');
  }
  const a = scenario.armature;
  const cleanArmature: Scenario['armature'] = { mass: a.mass, position: a.position, resistance: a.resistance, contactResistance: a.contactResistance, arcDrop: a.arcDrop };
  const transition = armature.transition as Read | null | undefined;
  if (transition) {
    if (a.arcDrop !== 0) throw new InputError('armature.transition', `a transition from a solid contact to an arc needs a solid armature: armature.arcDrop is ${a.arcDrop} V (an arc from the start); remove one of them`);
    const specificAction = transition.specificAction as number;
    const contactArea = transition.contactArea as number;
    cleanArmature.transition = { specificAction, contactArea, arcDrop: transition.arcDrop as number, action: specificAction * contactArea * contactArea };
  }
  scenario.armature = cleanArmature;
  if (armature.material !== undefined) scenario.armature.material = resolveMaterial(materialInSI(armature.material, 'armature.material'), 'armature.material', materials);
  if (armature.geometry) {
    const geometry = armature.geometry as { height: number; width: number; length: number };
    scenario.armature.geometry = geometry;
    if (scenario.armature.material) {
      const derived = deriveArmature(geometry, scenario.armature.material, 'armature.geometry');
      scenario.armature.derived = derived;
      if (given.mass === undefined) scenario.armature.mass = derived.mass;
      if (given.resistance === undefined) scenario.armature.resistance = derived.resistance;
    }
  }
  if (armature.mass === undefined && scenario.armature.mass === undefined) {
    throw new InputError('armature.mass', 'missing required key (or give armature.geometry and armature.material to compute it)');
  }
  if (read.limits !== undefined) scenario.limits = validateLimits(limitsInSI(withoutSizingLimits(read.limits)), 'limits');
  deriveHeating(scenario, read);
}

/**
 * Adiabatic heating: κ = ρ0α/(A²γc) of the armature (its block's current area) and of the rails (the layer the
 * rail-heating check uses: h × the penetration depth at the bank's quarter period, at most the rail).
 */
function deriveHeating(scenario: Scenario, read: Read): void {
  const model = read.heating as string | undefined;
  if (model === undefined || model === 'none') return;
  if (model !== 'adiabatic') throw new InputError('heating', `expected "none" or "adiabatic", got ${JSON.stringify(model)}`);
  const kappa = (m: Material, area: number) => (m.resistivity * m.temperatureCoefficient) / (area * area * m.density * m.specificHeat);
  const a = scenario.armature;
  const armature = a.derived && a.material ? kappa(a.material, a.derived.currentArea) : 0;
  const r = scenario.rails;
  const time = r.derived?.characteristicTime ?? null;
  const rails = r.geometry && r.material && time !== null ? kappa(r.material, currentCarryingArea(r.geometry, r.material.resistivity, time)) : 0;
  if (armature === 0 && rails === 0) {
    throw new InputError('heating', 'needs a material to heat: give armature.geometry and armature.material, or rails.geometry and rails.material (numbers alone carry no resistivity, temperature coefficient or heat capacity)');
  }
  scenario.heating = { armature, rails, armatureAlpha: a.material?.temperatureCoefficient ?? 0, railAlpha: r.material?.temperatureCoefficient ?? 0 };
}

/**
 * The drag law: ½ρC_dA v² with the given C_d, or the strong-shock pressure (γ+1)/2·ρ0·v² on the bore [published:
 * Rankine–Hugoniot strong-shock limit for a piston-driven shock, e.g. Zel'dovich & Raizer, Physics of Shock Waves],
 * which is the same law with C_d = γ + 1.
 */
function deriveDrag(scenario: Scenario, read: Read): void {
  const raw = read.drag as Read | null | undefined;
  if (!raw || !scenario.drag) return;
  const model = raw.model as string | undefined;
  if (model !== undefined && model !== 'coefficient' && model !== 'strong-shock') {
    throw new InputError('drag.model', `expected "coefficient" or "strong-shock", got ${JSON.stringify(model)}`);
  }
  if (model === 'strong-shock') {
    if (raw.dragCoefficient !== undefined) throw new InputError('drag.dragCoefficient', 'does not apply with drag.model "strong-shock", whose pressure (γ+1)/2·ρ0·v² has no drag coefficient; remove one of them');
    const gamma = (raw.heatCapacityRatio as number | undefined) ?? 1.4;
    scenario.drag = { ...scenario.drag, dragCoefficient: gamma + 1, model: 'strong-shock', heatCapacityRatio: gamma };
    return;
  }
  if (raw.heatCapacityRatio !== undefined) throw new InputError('drag.heatCapacityRatio', 'applies only with drag.model "strong-shock"');
  if (raw.dragCoefficient === undefined) throw new InputError('drag.dragCoefficient', 'missing required key (drag coefficient C_d; or give drag.model "strong-shock")');
}

/** Limits that only `railpulse size` reads (src/study/sizeInput.ts); the checks take the rest. */
export const SIZING_LIMIT_KEYS = ['peakCurrent', 'actionIntegral', 'reversal', 'chargeVoltage', 'modulesPerGroup'];

function withoutSizingLimits(raw: unknown): unknown {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return raw;
  return Object.fromEntries(Object.entries(raw as Read).filter(([key]) => !SIZING_LIMIT_KEYS.includes(key)));
}

function stripUndefined(object: Read): Read {
  return Object.fromEntries(Object.entries(object).filter(([, v]) => v !== undefined));
}
