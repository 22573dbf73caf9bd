/**
 * The scenario format as data: every key, its dimension, whether it is required and its default.
 * The loader, the JSON Schema and the sweep's path lookup all read this one table.
 */
import { DIMENSIONS, type Dimension } from '../units/quantity.js';
import { parsePath } from './paths.js';

export interface QuantityField {
  kind: 'quantity';
  dimension: Dimension;
  required?: boolean;
  default?: number;
  description: string;
}
export interface IntegerField {
  kind: 'integer';
  required?: boolean;
  default?: number;
  description: string;
}
export interface TextField {
  kind: 'text';
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
  required?: boolean;
  description: string;
}
/** A value checked by its own reader (materials, limits): passed through as written. */
export interface RawField {
  kind: 'raw';
  required?: boolean;
  description: string;
}
export type Field = QuantityField | IntegerField | TextField | SectionField | ListField | RawField;

const q = (dimension: Dimension, description: string, extra: { required?: boolean; default?: number } = {}): QuantityField => ({
  kind: 'quantity',
  dimension,
  description,
  ...extra,
});
const D = DIMENSIONS;

export const MODULE_FIELDS: Record<string, Field> = {
  label: { kind: 'text', description: 'name of the group, shown in outputs' },
  count: { kind: 'integer', default: 1, description: 'number of identical modules fired together' },
  capacitance: q(D.capacitance, 'capacitance of one module', { required: true }),
  voltage: q(D.voltage, 'charge voltage V0 (> 0)', { required: true }),
  esr: q(D.resistance, 'capacitor equivalent series resistance of one module', { default: 0 }),
  inductance: q(D.inductance, 'module inductance: pulse-shaping inductor + ESL + cabling (> 0)', { required: true }),
  resistance: q(D.resistance, 'module series resistance outside the crowbar loop', { default: 0 }),
  trigger: q(D.time, 'trigger time of the closing switch', { default: 0 }),
  crowbar: {
    kind: 'section',
    optional: true,
    description: 'crowbar diode across the capacitor; absent or null = none',
    fields: {
      drop: q(D.voltage, 'diode forward drop V_D', { default: 0 }),
      resistance: q(D.resistance, 'diode on-resistance R_D of one module', { default: 0 }),
    },
  },
  ratedReversal: q(D.dimensionless, "capacitor's rated voltage reversal as a fraction of V0 (checks; default limits.ratedReversal, 20 %)"),
};

export const SCENARIO_FIELDS: Record<string, Field> = {
  $schema: { kind: 'text', description: 'JSON Schema of this file (for editors)' },
  name: { kind: 'text', required: true, description: 'short name of the shot' },
  description: { kind: 'text', description: 'what the shot is for' },
  record: {
    kind: 'section',
    optional: true,
    description: 'how the lab files this shot: shown on its record and in the archive index (no effect on the simulation)',
    fields: {
      shotId: { kind: 'text', description: "the lab's shot number or identifier, e.g. \"B2-0117\"" },
      operator: { kind: 'text', description: 'who prepared or fires the shot' },
      reviewer: { kind: 'text', description: 'who reviewed the design and the record' },
      notes: { kind: 'text', description: 'free notes filed with the record' },
    },
  },
  bank: {
    kind: 'list',
    required: true,
    description: 'module groups of the capacitor bank',
    item: { kind: 'section', description: 'a group of identical modules', fields: MODULE_FIELDS },
  },
  feed: {
    kind: 'section',
    required: true,
    description: 'busbar/coax from the bank to the breech (includes the breech inductance)',
    fields: {
      inductance: q(D.inductance, 'feed inductance L_f (> 0)', { required: true }),
      resistance: q(D.resistance, 'feed resistance R_f', { default: 0 }),
    },
  },
  rails: {
    kind: 'section',
    required: true,
    description: 'the two rails',
    fields: {
      length: q(D.length, 'rail length from the breech to the muzzle', { required: true }),
      inductanceGradient: q(D.inductanceGradient, "inductance gradient L' (required unless rails.geometry is given)"),
      resistanceGradient: q(D.resistanceGradient, "loop resistance of both rails per metre of travel R' (default 0, or from geometry and material)"),
      geometry: {
        kind: 'section',
        optional: true,
        description: 'rail cross-section: { height, width, separation } for rectangular rails or { radius, centreDistance } for round rails',
        fields: {
          height: q(D.length, 'rail height (the face the armature slides on)'),
          width: q(D.length, 'rail width (thickness away from the bore)'),
          separation: q(D.length, "gap between the rails' inner faces"),
          radius: q(D.length, 'round rail radius'),
          centreDistance: q(D.length, 'distance between the round rails\' centres'),
        },
      },
      material: { kind: 'raw', description: 'rail material: a library name (copper, copper-chromium, aluminium-6061-t6, aluminium-7075-t6, aluminium-1350) or one from "materials"' },
      inductanceModel: { kind: 'text', description: 'which L\' from geometry the shot uses: "high-frequency" (default) or "uniform"' },
    },
  },
  armature: {
    kind: 'section',
    required: true,
    description: 'the sliding armature',
    fields: {
      mass: q(D.mass, 'armature (and payload) mass (required unless geometry and material give it)'),
      position: q(D.length, 'initial distance from the breech', { default: 0 }),
      resistance: q(D.resistance, 'armature resistance R_a', { default: 0 }),
      contactResistance: q(D.resistance, 'total contact resistance R_c', { default: 0 }),
      arcDrop: q(D.voltage, 'arc drop V_arc (0 for a solid armature)', { default: 0 }),
      geometry: {
        kind: 'section',
        optional: true,
        description: 'solid armature block: height (current path across the bore), width (across the bore), length (along the bore)',
        fields: {
          height: q(D.length, 'current path length across the bore', { required: true }),
          width: q(D.length, 'width of the conducting block', { required: true }),
          length: q(D.length, 'length of the conducting block along the bore', { required: true }),
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
      coefficient: q(D.dimensionless, 'sliding friction coefficient μ', { default: 0 }),
      staticCoefficient: q(D.dimensionless, 'static friction coefficient μ_s (default μ, never below μ)'),
      preload: q(D.force, 'contact preload normal force F_N0', { default: 0 }),
      magneticLoading: q(D.forcePerCurrentSquared, 'magnetic contact loading k_N in F_N = F_N0 + k_N I²', { default: 0 }),
    },
  },
  drag: {
    kind: 'section',
    optional: true,
    description: 'gas drag ahead of the armature; absent = none',
    fields: {
      gasDensity: q(D.density, 'gas density in the bore', { required: true }),
      dragCoefficient: q(D.dimensionless, 'drag coefficient C_d', { required: true }),
      boreArea: q(D.area, 'bore cross-section A_b', { required: true }),
    },
  },
  materials: { kind: 'raw', description: 'your own materials by name: { NAME: { resistivity, temperatureCoefficient, density, specificHeat, meltingTemperature, latentHeat } }' },
  limits: { kind: 'raw', description: 'engineering-check thresholds that replace the defaults, and the limits railpulse size must respect (peakCurrent, peakAcceleration, actionIntegral, reversal, chargeVoltage, modulesPerGroup)' },
  target: { kind: 'raw', description: 'what railpulse size must reach: { "muzzleVelocity": "…" } or { "kineticEnergy": "…" }' },
  solver: {
    kind: 'section',
    optional: true,
    description: 'integration settings',
    fields: {
      relTol: q(D.dimensionless, 'relative tolerance', { default: 1e-9 }),
      endTime: q(D.time, 'end time (timeout)', { default: 0.1 }),
      sampleInterval: q(D.time, 'waveform sample interval', { default: 1e-6 }),
      currentFloor: q(D.current, 'stall current floor per module', { default: 1 }),
      maxSteps: { kind: 'integer', default: 1_000_000, description: 'bound on accepted integration steps for the whole shot' },
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
    if (!fields) return undefined;
    field = fields[part];
    if (!field) return undefined;
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
    else if (field.kind === 'section') out.push(...quantityPaths(path, field.fields));
    else if (field.kind === 'list') out.push(...quantityPaths(`${path}[n]`, field.item.fields));
  }
  return out;
}
