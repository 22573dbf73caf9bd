/**
 * Quantity strings ⇄ SI numbers. Units live only at the edges: a scenario value is parsed once here.
 */
import { mathUnit, type Unit } from './unitLibrary.js';
import { fastSI } from './fastQuantity.js';

/** A physical dimension a scenario value must have: the SI unit it converts to and a name for messages. */
export interface Dimension {
  /** SI unit in mathjs syntax; '' for dimensionless */
  si: string;
  /** what the user is told is expected, e.g. "a capacitance (F)" */
  noun: string;
  /** how SI values are written back for people */
  display: string;
}

const dim = (si: string, noun: string, display = si): Dimension => ({ si, noun, display });

export const DIMENSIONS = {
  capacitance: dim('F', 'a capacitance (F)'),
  voltage: dim('V', 'a voltage (V)'),
  resistance: dim('ohm', 'a resistance (Ω)', 'Ω'),
  inductance: dim('H', 'an inductance (H)'),
  inductanceGradient: dim('H/m', 'an inductance gradient (H/m)'),
  resistanceGradient: dim('ohm/m', 'a resistance gradient (Ω/m)', 'Ω/m'),
  mass: dim('kg', 'a mass (kg)'),
  length: dim('m', 'a length (m)'),
  area: dim('m^2', 'an area (m²)', 'm²'),
  time: dim('s', 'a time (s)'),
  force: dim('N', 'a force (N)'),
  current: dim('A', 'a current (A)'),
  velocity: dim('m/s', 'a velocity (m/s)'),
  acceleration: dim('m/s^2', 'an acceleration (m/s²)', 'm/s²'),
  energy: dim('J', 'an energy (J)'),
  density: dim('kg/m^3', 'a density (kg/m³)', 'kg/m³'),
  forcePerCurrentSquared: dim('N/A^2', 'a force per current squared (N/A²)', 'N/A²'),
  resistivity: dim('ohm m', 'a resistivity (Ω·m)', 'Ω·m'),
  perKelvin: dim('1/K', 'a temperature coefficient (1/K)'),
  specificHeat: dim('J/(kg K)', 'a specific heat (J/(kg·K))', 'J/(kg·K)'),
  specificEnergy: dim('J/kg', 'a specific energy (J/kg)'),
  temperature: dim('degC', 'a temperature (°C)', '°C'),
  specificAction: dim('A^2 s/m^4', 'a specific action (A²·s/m⁴)', 'A²·s/m⁴'),
  currentPerLength: dim('A/m', 'a current per length (A/m)'),
  forcePerCurrent: dim('N/A', 'a force per current (N/A)'),
  dimensionless: dim('', 'a plain number'),
} satisfies Record<string, Dimension>;

export type DimensionName = keyof typeof DIMENSIONS;

/** Raised for a value that cannot be read; the caller adds the scenario path. */
export class QuantityError extends Error {}

/** Normalise the spellings people use that mathjs does not know: micro signs, Ω, Ohm. */
export function normaliseUnitText(text: string): string {
  return text
    .replace(/[\u00B5\u03BC]/g, 'u')
    .replace(/\u2126|\u03A9/g, 'ohm')
    .replace(/Ohm/g, 'ohm')
    .replace(/\u00B2/g, '^2')
    .replace(/\u00B3/g, '^3')
    .replace(/\u00B7|\u22C5/g, ' ')
    .replace(/\u2212/g, '-')
    .trim();
}

const NUMBER_ONLY = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function describe(value: unknown): string {
  return typeof value === 'string' ? JSON.stringify(value) : String(value);
}

/**
 * Read a scenario quantity: a plain number (already SI) or a string with a unit.
 * Throws QuantityError with "expected …, got …" on a wrong dimension or unreadable text.
 */
export function toSI(value: unknown, dimension: Dimension): number {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new QuantityError(`expected ${dimension.noun}, got ${describe(value)}`);
    return value;
  }
  if (typeof value !== 'string') {
    throw new QuantityError(`expected ${dimension.noun}, got ${value === null ? 'null' : typeof value === 'object' ? (Array.isArray(value) ? 'an array' : 'an object') : describe(value)}`);
  }
  const text = normaliseUnitText(value);
  if (NUMBER_ONLY.test(text)) {
    if (dimension.si === '') return Number(text);
    throw new QuantityError(`expected ${dimension.noun} with a unit, got ${describe(value)} (give a unit, or a plain number in SI)`);
  }
  // the common case ("250 uF") without the unit library; anything the fast reader declines goes to mathjs
  const fast = dimension.si === '' ? null : fastSI(text, dimension.si);
  if (fast !== null) {
    if (!Number.isFinite(fast)) throw new QuantityError(`expected ${dimension.noun}, got ${describe(value)}`);
    return fast;
  }
  let parsed: Unit;
  try {
    parsed = mathUnit(text);
  } catch {
    throw new QuantityError(`expected ${dimension.noun}, got ${describe(value)} (not a number with a known unit)`);
  }
  let si: number;
  try {
    si = dimension.si === '' ? dimensionlessValue(parsed) : parsed.toNumber(dimension.si);
  } catch {
    throw new QuantityError(`expected ${dimension.noun}, got ${describe(value)}`);
  }
  if (!Number.isFinite(si)) throw new QuantityError(`expected ${dimension.noun}, got ${describe(value)}`);
  return si;
}

function dimensionlessValue(parsed: Unit): number {
  // mathjs has no unit for "1"; accept "%" style values by converting through a ratio of equal units.
  const probe = parsed.toSI();
  if (probe.units.length > 0 && !(probe.units.length === 1 && probe.units[0]!.unit.name === 'rad')) {
    throw new QuantityError('not dimensionless');
  }
  return probe.value ?? NaN;
}

/** Parse a quantity whose dimension is given by the caller as text (command-line values). */
export function parseWithUnit(text: string, siUnit: string): number {
  const parsed = mathUnit(normaliseUnitText(text));
  return parsed.toNumber(siUnit);
}

/** Does the text carry a unit of the given dimension? (used to guess a dimension from user input) */
export function hasDimension(text: string, dimension: Dimension): boolean {
  try {
    toSI(text, dimension);
    return true;
  } catch {
    return false;
  }
}
