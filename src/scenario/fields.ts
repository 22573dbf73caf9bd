/**
 * The scenario format as data: every key, its dimension, whether it is required and its default.
 * The loader, the JSON Schema and the sweep's path lookup all read this one table.
 */
import { DIMENSIONS, type Dimension } from '../units/quantity.js';
import { parsePath } from './paths.js';
import { FASTEST_RATE_TIMES_TAU } from '../conductors/diffusion.js';

/**
 * The plausible range of a quantity (SI): what the tool accepts. Wide enough for any bench or laboratory
 * launcher, narrow enough that no state of the model overflows a double (a 1e308 V bank is a typo, not a shot).
 * A value exactly at a bound is within the range.
 */
export interface Range {
  min: number;
  max: number;
  /** the lower bound itself is not allowed (an inductance must be > 0) */
  minExclusive?: boolean;
}
export interface QuantityField {
  kind: 'quantity';
  dimension: Dimension;
  range: Range;
  /** what the value is, for messages ("a capacitance"); default: from the dimension */
  noun?: string;
  required?: boolean;
  default?: number;
  description: string;
}
export interface IntegerField {
  kind: 'integer';
  range: Range;
  required?: boolean;
  default?: number;
  description: string;
}
export interface TextField {
  kind: 'text';
  /** longest text accepted (characters) */
  maxLength: number;
  required?: boolean;
  description: string;
}
export interface SectionField {
  kind: 'section';
  fields: Record<string, Field>;
  /** null or absent allowed (e.g. crowbar, drag) */
  optional?: boolean;
  required?: boolean;
  description: string;
}
export interface ListField {
  kind: 'list';
  item: SectionField;
  /** most items accepted */
  maxItems: number;
  required?: boolean;
  description: string;
}
/** A value checked by its own reader (materials, limits): passed through as written. */
export interface RawField {
  kind: 'raw';
  required?: boolean;
  description: string;
  /** its JSON Schema, when its reader checks a fixed shape */
  schema?: Record<string, unknown>;
}
export type Field = QuantityField | IntegerField | TextField | SectionField | ListField | RawField;

const q = (dimension: Dimension, range: Range, description: string, extra: { required?: boolean; default?: number; noun?: string } = {}): QuantityField => ({
  kind: 'quantity',
  dimension,
  range,
  description,
  ...extra,
});
const D = DIMENSIONS;
/** [min, max], both included */
const within = (min: number, max: number): Range => ({ min, max });
/** (0, max]: above zero */
const positive = (max: number): Range => ({ min: 0, max, minExclusive: true });

/** Longest name or label, and longest description, in characters. */
export const MAX_NAME_LENGTH = 200;
export const MAX_DESCRIPTION_LENGTH = 10_000;
/** Most module groups in a bank (each group is any number of identical modules). */
export const MAX_GROUPS = 1_000;

// Plausible ranges shared by several keys (SI).
const RESISTANCE = within(0, 1e6); // up to 1 MΩ
const INDUCTANCE = within(1e-12, 1); // 1 pH … 1 H
const CROSS_SECTION = positive(10); // rail and armature dimensions up to 10 m
const TIME = within(0, 10); // the longest end time

export const MODULE_FIELDS: Record<string, Field> = {
  label: { kind: 'text', maxLength: MAX_NAME_LENGTH, description: 'name of the group, shown in outputs' },
  count: { kind: 'integer', range: within(1, 10_000), default: 1, description: 'number of identical modules fired together' },
  capacitance: q(D.capacitance, within(1e-12, 10), 'capacitance of one module', { required: true }),
  voltage: q(D.voltage, positive(1e6), 'charge voltage V0 (> 0)', { required: true, noun: 'a charge voltage' }),
  esr: q(D.resistance, RESISTANCE, 'capacitor equivalent series resistance of one module', { default: 0 }),
  inductance: q(D.inductance, INDUCTANCE, 'module inductance: pulse-shaping inductor + ESL + cabling (> 0)', { required: true }),
  resistance: q(D.resistance, RESISTANCE, 'module series resistance outside the crowbar loop', { default: 0 }),
  trigger: q(D.time, TIME, 'trigger time of the closing switch', { default: 0 }),
  crowbar: {
    kind: 'section',
    optional: true,
    description: 'crowbar diode across the capacitor; absent or null = none',
    fields: {
      drop: q(D.voltage, within(0, 1e5), 'diode forward drop V_D', { default: 0 }),
      resistance: q(D.resistance, RESISTANCE, 'diode on-resistance R_D of one module', { default: 0 }),
    },
  },
  ratedReversal: q(D.dimensionless, within(0, 1), "capacitor's rated voltage reversal as a fraction of V0 (checks; default limits.ratedReversal, 20 %)", { noun: 'a fraction' }),
};

export const SCENARIO_FIELDS: Record<string, Field> = {
  $schema: { kind: 'text', maxLength: 2_000, description: 'JSON Schema of this file (for editors)' },
  name: { kind: 'text', maxLength: MAX_NAME_LENGTH, required: true, description: 'short name of the shot' },
  description: { kind: 'text', maxLength: MAX_DESCRIPTION_LENGTH, description: 'what the shot is for' },
  record: {
    kind: 'section',
    optional: true,
    description: 'how the lab files this shot: shown on its record and in the archive index (no effect on the simulation)',
    fields: {
      shotId: { kind: 'text', maxLength: MAX_NAME_LENGTH, description: "the lab's shot number or identifier, e.g. \"B2-0117\"" },
      operator: { kind: 'text', maxLength: MAX_NAME_LENGTH, description: 'who prepared or fires the shot' },
      reviewer: { kind: 'text', maxLength: MAX_NAME_LENGTH, description: 'who reviewed the design and the record' },
      notes: { kind: 'text', maxLength: MAX_DESCRIPTION_LENGTH, description: 'free notes filed with the record' },
    },
  },
  bank: {
    kind: 'list',
    required: true,
    maxItems: MAX_GROUPS,
    description: 'module groups of the capacitor bank',
    item: { kind: 'section', description: 'a group of identical modules', fields: MODULE_FIELDS },
  },
  feed: {
    kind: 'section',
    required: true,
    description: 'busbar/coax from the bank to the breech (includes the breech inductance)',
    fields: {
      inductance: q(D.inductance, INDUCTANCE, 'feed inductance L_f (> 0)', { required: true }),
      resistance: q(D.resistance, RESISTANCE, 'feed resistance R_f', { default: 0 }),
    },
  },
  load: {
    kind: 'section',
    optional: true,
    description: 'a shorted load in place of rails and armature (a ring-down of the bank); absent = a launch. With a load, rails, armature, friction, drag and target are not given',
    fields: {
      kind: { kind: 'text', required: true, maxLength: 20, description: '"short": the bank fired into a short at the breech' },
      inductance: q(D.inductance, within(0, 1), "the short's own inductance (shorting bar or dummy load); the feed keeps its own", { default: 0 }),
      resistance: q(D.resistance, RESISTANCE, "the short's own resistance", { default: 0 }),
    },
  },
  rails: {
    kind: 'section',
    description: 'the two rails (required unless load is given)',
    fields: {
      length: q(D.length, positive(1e4), 'rail length from the breech to the muzzle', { required: true }),
      inductanceGradient: q(D.inductanceGradient, within(1e-9, 1e-4), "inductance gradient L' (required unless rails.geometry is given)"),
      resistanceGradient: q(D.resistanceGradient, within(0, 1e3), "loop resistance of both rails per metre of travel R' (default 0, or from geometry and material)"),
      geometry: {
        kind: 'section',
        optional: true,
        description: 'rail cross-section: { height, width, separation } for rectangular rails or { radius, centreDistance } for round rails',
        fields: {
          height: q(D.length, CROSS_SECTION, 'rail height (the face the armature slides on)'),
          width: q(D.length, CROSS_SECTION, 'rail width (thickness away from the bore)'),
          separation: q(D.length, CROSS_SECTION, "gap between the rails' inner faces"),
          radius: q(D.length, CROSS_SECTION, 'round rail radius'),
          centreDistance: q(D.length, CROSS_SECTION, 'distance between the round rails\' centres'),
        },
      },
      material: { kind: 'raw', description: 'rail material: a library name (copper, copper-chromium, aluminium-6061-t6, aluminium-7075-t6, aluminium-1350) or one from "materials"' },
      inductanceModel: { kind: 'text', maxLength: 40, description: 'which L\' from geometry the shot uses: "high-frequency" (default) or "uniform"' },
      resistanceModel: { kind: 'text', maxLength: 40, description: 'how R\' from geometry and material follows the shot: "diffusion" (default for rectangular rails: the current diffuses into each rail section from the moment the armature passes it, never below the uniform-current value) or "quarter-period" (a constant R\' at the current-penetration depth of the bank\'s quarter period; the only choice for round rails)' },
    },
  },
  armature: {
    kind: 'section',
    description: 'the sliding armature (required unless load is given)',
    fields: {
      mass: q(D.mass, within(1e-9, 1e5), 'armature (and payload) mass (required unless geometry and material give it)'),
      position: q(D.length, within(0, 1e4), 'initial distance from the breech', { default: 0 }),
      resistance: q(D.resistance, RESISTANCE, 'armature resistance R_a', { default: 0 }),
      contactResistance: q(D.resistance, RESISTANCE, 'total contact resistance R_c', { default: 0 }),
      arcDrop: q(D.voltage, within(0, 1e5), 'arc drop V_arc (0 for a solid armature)', { default: 0 }),
      transition: {
        kind: 'section',
        optional: true,
        description: 'solid contact turning into an arc: once the action through the contact, ∫I²dt, reaches specificAction × contactArea², the arc drop applies and the contact resistance no longer does (a located event); absent = none. The criterion is common practice (an action per contact area), not a published constant: calibrate it',
        fields: {
          specificAction: q(D.specificAction, positive(1e20), 'specific action of the contact at the transition', { required: true, noun: 'a specific action' }),
          contactArea: q(D.area, positive(1), 'area of the contact that carries the current', { required: true }),
          arcDrop: q(D.voltage, positive(1e5), 'arc drop after the transition (> 0)', { required: true, noun: 'an arc drop' }),
        },
      },
      geometry: {
        kind: 'section',
        optional: true,
        description: 'solid armature block: height (current path across the bore), width (across the bore), length (along the bore)',
        fields: {
          height: q(D.length, CROSS_SECTION, 'current path length across the bore', { required: true }),
          width: q(D.length, CROSS_SECTION, 'width of the conducting block', { required: true }),
          length: q(D.length, CROSS_SECTION, 'length of the conducting block along the bore', { required: true }),
        },
      },
      material: { kind: 'raw', description: 'armature material: a library name or one from "materials"' },
    },
  },
  friction: {
    kind: 'section',
    optional: true,
    description: 'sliding friction at the rail contacts; absent = none',
    fields: {
      coefficient: q(D.dimensionless, within(0, 10), 'sliding friction coefficient μ', { default: 0, noun: 'a friction coefficient' }),
      staticCoefficient: q(D.dimensionless, within(0, 10), 'static friction coefficient μ_s (default μ, never below μ)', { noun: 'a static friction coefficient' }),
      preload: q(D.force, within(0, 1e8), 'contact preload normal force F_N0', { default: 0 }),
      magneticLoading: q(D.forcePerCurrentSquared, within(0, 1), 'magnetic contact loading k_N in F_N = F_N0 + k_N I²', { default: 0 }),
    },
  },
  drag: {
    kind: 'section',
    optional: true,
    description: 'gas drag ahead of the armature; absent = none',
    fields: {
      gasDensity: q(D.density, within(0, 1e4), 'gas density in the bore', { required: true }),
      dragCoefficient: q(D.dimensionless, within(0, 100), 'drag coefficient C_d of ½ρC_dA v² (required unless model is "strong-shock")', { noun: 'a drag coefficient' }),
      model: { kind: 'text', maxLength: 40, description: 'how the gas ahead resists: "coefficient" (default: ½ρC_dA v²) or "strong-shock" (the armature drives a strong shock into the gas column: pressure (γ+1)/2·ρ0·v², Rankine–Hugoniot strong-shock limit, valid for speeds well above the gas\'s sound speed; the ambient pressure ahead is neglected, so it reads low near Mach 1)' },
      heatCapacityRatio: q(D.dimensionless, within(1, 3), 'ratio of specific heats γ of the gas ahead (strong-shock model; default 1.4, air)', { noun: 'a ratio of specific heats' }),
      boreArea: q(D.area, within(0, 100), 'bore cross-section A_b', { required: true }),
    },
  },
  heating: { kind: 'text', maxLength: 40, description: 'resistances rising with temperature during the shot: "none" (default) or "adiabatic" (ρ = ρ0(1 + αΔT), the temperature from the action through the conductor, γc/(ρ0α)·ln(1 + αΔT) = ∫I²dt/A²): the armature by its block (armature.geometry and material), each rail section by the action since the armature passed it (rails.geometry and material)' },
  materials: { kind: 'raw', description: 'your own materials by name: { NAME: { resistivity, temperatureCoefficient, density, specificHeat, meltingTemperature, latentHeat } }' },
  limits: { kind: 'raw', description: 'engineering-check thresholds that replace the defaults, and the limits railpulse size must respect (peakCurrent, peakAcceleration, actionIntegral, reversal, chargeVoltage, modulesPerGroup)' },
  target: { kind: 'raw', description: 'what railpulse size must reach: { "muzzleVelocity": "…" } or { "kineticEnergy": "…" }, with an optional "confidence" (0–1) and "tieBreak" ("peakCurrent" or "none")' },
  tolerances: {
    kind: 'raw',
    description: 'spreads of scenario values (src/scenario/uncertainty.ts): each entry a path (bank[*] for every group) with "uniform" (half-width ±a) or "normal" (σ), as a quantity or a percentage of the value',
    schema: {
      type: 'array',
      items: {
        type: 'object',
        additionalProperties: false,
        required: ['path'],
        properties: {
          path: { type: 'string', description: 'scenario path, e.g. bank[0].capacitance or bank[*].voltage' },
          uniform: { description: 'half-width a of a uniform spread ±a (σ = a/√3): a quantity, or a percentage of the value such as "5 %"', anyOf: [{ type: 'number' }, { type: 'string' }] },
          normal: { description: 'standard deviation σ of a normal spread: a quantity, or a percentage of the value', anyOf: [{ type: 'number' }, { type: 'string' }] },
          common: { type: 'boolean', description: 'with bank[*]: one draw moves every group together (default false: each group its own draw)' },
        },
      },
    },
  },
  calibration: {
    kind: 'raw',
    description: 'fitted values with their covariance and the measured record they came from (written by railpulse fit)',
    schema: {
      type: 'object',
      additionalProperties: false,
      required: ['parameters', 'values', 'covariance', 'record', 'recordSha256', 'date'],
      properties: {
        parameters: { type: 'array', items: { type: 'string' }, description: 'the fitted scenario paths' },
        values: { type: 'array', items: { type: 'number' }, description: 'fitted values (SI), equal to the scenario values at those paths' },
        covariance: { type: 'array', items: { type: 'array', items: { type: 'number' } }, description: 'covariance matrix of the fitted values (SI), symmetric positive semi-definite' },
        record: { type: 'string', description: 'the measured record that was fitted' },
        recordSha256: { type: 'string', pattern: '^[0-9a-fA-F]{64}$', description: "SHA-256 of the record's bytes" },
        date: { type: 'string', description: 'ISO date of the fit' },
        scenario: { type: 'string', description: 'the scenario file that was calibrated' },
        chiSquaredReduced: { type: 'number', minimum: 0, description: 'χ²/ν of the fit' },
        onBound: { type: 'array', items: { type: 'string' }, description: 'parameters fitted onto a bound (no uncertainty)' },
      },
    },
  },
  solver: {
    kind: 'section',
    optional: true,
    description: 'integration settings',
    fields: {
      relTol: q(D.dimensionless, within(1e-13, 1e-3), 'relative tolerance', { default: 1e-9, noun: 'a relative tolerance' }),
      endTime: q(D.time, positive(10), 'end time (timeout)', { default: 0.1 }),
      sampleInterval: q(D.time, TIME, 'waveform sample interval (default 1 µs, or endTime / 2,000,000 when that is longer; 0 = event samples only)'),
      currentFloor: q(D.current, positive(1e6), 'stall current floor per module', { default: 1 }),
      maxSteps: { kind: 'integer', range: within(1, 100_000_000), default: 1_000_000, description: 'bound on accepted integration steps for the whole shot' },
      diffusionRate: q(D.dimensionless, within(0.5, 1000), `rail current diffusion (rails.resistanceModel \"diffusion\"): the fastest cell integrated, λ·τ with τ the bank's quarter period; faster cells are held as inductance. Higher is more accurate for ringing currents and slower (default ${FASTEST_RATE_TIMES_TAU})`, { default: FASTEST_RATE_TIMES_TAU, noun: 'a rate in units of 1/τ' }),
    },
  },
};

/** The field description at a scenario path, or undefined. */
export function fieldAt(path: string): Field | undefined {
  const parts = parsePath(path);
  if (!parts) return undefined;
  let fields: Record<string, Field> | undefined = SCENARIO_FIELDS;
  let field: Field | undefined;
  for (let k = 0; k < parts.length; k++) {
    const part = parts[k]!;
    if (typeof part === 'number') {
      if (field?.kind !== 'list') return undefined;
      field = field.item;
      fields = field.fields;
      continue;
    }
    // own keys only: a path step such as "constructor" is a plain (unknown) name, not Object.prototype's
    if (!fields || !Object.hasOwn(fields, part)) return undefined;
    field = fields[part]!;
    fields = field.kind === 'section' ? field.fields : undefined;
    if (field.kind === 'list' && parts[k + 1] === undefined) return field;
  }
  return field;
}

/** Dimension of the quantity at a path such as `bank[0].voltage`, or undefined if the path is not a quantity. */
export function dimensionOfPath(path: string): Dimension | undefined {
  const field = fieldAt(path);
  return field?.kind === 'quantity' ? field.dimension : undefined;
}

/** Every quantity path of the format with list indices shown as [n] (for did-you-mean on paths). */
export function quantityPaths(prefix = '', fields: Record<string, Field> = SCENARIO_FIELDS): string[] {
  const out: string[] = [];
  for (const [key, field] of Object.entries(fields)) {
    const path = prefix ? `${prefix}.${key}` : key;
    if (field.kind === 'quantity' || field.kind === 'integer') out.push(path);
    else if (field.kind === 'section') for (const inner of quantityPaths(path, field.fields)) out.push(inner);
    else if (field.kind === 'list') for (const inner of quantityPaths(`${path}[n]`, field.item.fields)) out.push(inner);
  }
  return out;
}
