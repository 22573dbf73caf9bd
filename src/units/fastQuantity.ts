/**
 * A fast reader for the quantity strings scenarios are made of ("250 uF", "0.46 uH/m", "1.2 kg/m^3"), so that a
 * run need not load the unit library (unitLibrary.ts) at all.
 *
 * It is mathjs's reader (Unit.parse, _normalize, to, toNumber of mathjs 15), restricted: the same scanner for
 * numbers, unit names, "^", "*", "/" and blanks, the same floating-point operations in the same order, on a table
 * of the SI units a launcher's scenario uses and their SI prefixes, with mathjs's values. Anything it does not
 * know for certain — parentheses, other units, a value without a number, units of another dimension than the
 * one asked for, offsets (°C) — it declines (null), and the caller asks mathjs, so every result and every message
 * is mathjs's. test/units/fastQuantity.test.ts checks it against mathjs, the reference, over many strings.
 */

/** Base dimensions in mathjs's order: mass, length, time, current, temperature, luminous intensity, amount, angle, bit. */
type Dimensions = number[];

interface TableUnit {
  /** mathjs's unit value (in SI) */
  value: number;
  dimensions: Dimensions;
}

const d = (mass: number, length: number, time: number, current: number, temperature = 0): Dimensions => [mass, length, time, current, temperature, 0, 0, 0, 0];

/** The units read here, with mathjs's values and dimensions; none has an offset. */
export const FAST_UNITS: Record<string, TableUnit> = {
  m: { value: 1, dimensions: d(0, 1, 0, 0) },
  g: { value: 0.001, dimensions: d(1, 0, 0, 0) },
  s: { value: 1, dimensions: d(0, 0, 1, 0) },
  A: { value: 1, dimensions: d(0, 0, 0, 1) },
  K: { value: 1, dimensions: d(0, 0, 0, 0, 1) },
  N: { value: 1, dimensions: d(1, 1, -2, 0) },
  J: { value: 1, dimensions: d(1, 2, -2, 0) },
  W: { value: 1, dimensions: d(1, 2, -3, 0) },
  V: { value: 1, dimensions: d(1, 2, -3, -1) },
  F: { value: 1, dimensions: d(-1, -2, 4, 2) },
  H: { value: 1, dimensions: d(1, 2, -2, -2) },
  ohm: { value: 1, dimensions: d(1, 2, -3, -2) },
  C: { value: 1, dimensions: d(0, 0, 1, 1) },
  Hz: { value: 1, dimensions: d(0, 0, -1, 0) },
  Pa: { value: 1, dimensions: d(1, -1, -2, 0) },
  T: { value: 1, dimensions: d(1, 0, -2, -1) },
  Wb: { value: 1, dimensions: d(1, 2, -2, -1) },
  S: { value: 1, dimensions: d(-1, -2, 3, 2) },
};

/** mathjs's short SI prefixes and their values. */
export const FAST_PREFIXES: Record<string, number> = {
  '': 1, da: 10, h: 100, k: 1000, M: 1e6, G: 1e9, T: 1e12, P: 1e15, E: 1e18, Z: 1e21, Y: 1e24, R: 1e27, Q: 1e30,
  d: 0.1, c: 0.01, m: 0.001, u: 0.000001, n: 1e-9, p: 1e-12, f: 1e-15, a: 1e-18, z: 1e-21, y: 1e-24, r: 1e-27, q: 1e-30,
};

/** prefix + unit names that mathjs reads as another unit of its table (found by comparing every name with mathjs) */
const DECLINED_NAMES: string[] = [];

interface Term {
  unit: TableUnit;
  prefix: number;
  power: number;
}

/**
 * A unit name as mathjs resolves it: the name itself if it is a unit, else the first unit (in mathjs's table
 * order) the name ends with, behind a known prefix. Only names resolved with certainty are in this map; every
 * other name is declined.
 */
const RESOLVED = new Map<string, { unit: TableUnit; prefix: number }>();
for (const [name, unit] of Object.entries(FAST_UNITS)) {
  for (const [prefix, value] of Object.entries(FAST_PREFIXES)) RESOLVED.set(prefix + name, { unit, prefix: value });
}
// Names mathjs resolves otherwise (it tries whole unit names first, then its own table order): declined.
for (const name of DECLINED_NAMES) RESOLVED.delete(name);

const isDigit = (c: string) => c >= '0' && c <= '9';
const isAlpha = (c: string) => (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');

/** A parsed unit string: its value in SI (null without a number), terms and dimensions; null when declined. */
interface Parsed {
  value: number | null;
  terms: Term[];
  dimensions: Dimensions;
}

/** mathjs's Unit.parse on the restricted grammar; null for anything outside it (or anything mathjs would refuse). */
function parse(text: string): Parsed | null {
  let i = 0;
  const at = () => (i < text.length ? text[i]! : '');
  const skipBlanks = () => {
    while (at() === ' ' || at() === '\t') i++;
  };
  // mathjs's parseNumber: [+|-] digits [. digits] | . digits, then an exponent only when digits follow e[+|-]
  const number = (): string | null => {
    const start = i;
    let out = '';
    if (at() === '+') i++;
    else if (at() === '-') {
      out += '-';
      i++;
    }
    if (!(isDigit(at()) || at() === '.')) {
      i = start;
      return null;
    }
    if (at() === '.') {
      out += '.';
      i++;
      if (!isDigit(at())) {
        i = start;
        return null;
      }
    } else {
      while (isDigit(at())) out += text[i++];
      if (at() === '.') {
        out += '.';
        i++;
      }
    }
    while (isDigit(at())) out += text[i++];
    if (at() === 'e' || at() === 'E') {
      const back = i;
      let tentative = text[i++]!;
      if (at() === '+' || at() === '-') tentative += text[i++];
      if (!isDigit(at())) {
        i = back;
        return out;
      }
      out += tentative;
      while (isDigit(at())) out += text[i++];
    }
    return out;
  };

  skipBlanks();
  const valueText = number();
  let value: number | null = null;
  let multiplier = 1;
  let expectingUnit = false;
  if (valueText) {
    value = parseFloat(valueText);
    skipBlanks();
    if (at() === '*') {
      i++;
      expectingUnit = true;
    } else if (at() === '/') {
      i++;
      multiplier = -1;
      expectingUnit = true;
    }
  }
  const terms: Term[] = [];
  const dimensions: Dimensions = [0, 0, 0, 0, 0, 0, 0, 0, 0];
  for (;;) {
    skipBlanks();
    if (at() === '') break;
    if (!isAlpha(at())) return null; // parentheses, or a character mathjs refuses
    let name = '';
    while (isDigit(at()) || isAlpha(at())) name += text[i++];
    const found = RESOLVED.get(name);
    if (!found) return null;
    let power = multiplier;
    skipBlanks();
    if (at() === '^') {
      i++;
      skipBlanks();
      const p = number();
      if (p === null) return null;
      power *= Number(p);
      if (!Number.isFinite(power)) return null;
    }
    terms.push({ unit: found.unit, prefix: found.prefix, power });
    for (let k = 0; k < dimensions.length; k++) dimensions[k]! += (found.unit.dimensions[k] || 0) * power;
    skipBlanks();
    if (at() === ')') return null;
    expectingUnit = false;
    if (at() === '*') {
      i++;
      multiplier = 1;
      expectingUnit = true;
    } else if (at() === '/') {
      i++;
      multiplier = -1;
      expectingUnit = true;
    } else {
      multiplier = 1;
    }
  }
  if (expectingUnit || terms.length === 0) return null;
  if (value !== null) {
    // mathjs's _normalize
    for (const term of terms) value = value * Math.pow(term.unit.value * term.prefix, term.power);
  }
  return { value, terms, dimensions };
}

const targets = new Map<string, Parsed | null>();

/**
 * `text` (already normalised, see normaliseUnitText) in the unit `si` (mathjs syntax), exactly as
 * mathjs's unit(text).toNumber(si) gives it; null when this reader declines and mathjs must be asked.
 */
export function fastSI(text: string, si: string): number | null {
  let target = targets.get(si);
  if (target === undefined) {
    target = parse(si);
    if (target && target.value !== null) target = null; // a target with a value: mathjs refuses it
    targets.set(si, target);
  }
  if (!target) return null;
  const parsed = parse(text);
  if (!parsed || parsed.value === null) return null;
  for (let k = 0; k < parsed.dimensions.length; k++) {
    if (Math.abs(parsed.dimensions[k]! - target.dimensions[k]!) > 1e-12) return null;
  }
  // mathjs's to() keeps the normalised value (no offsets here); toNumeric's _denormalize divides by the target's terms
  let value = parsed.value;
  for (const term of target.terms) value = value / Math.pow(term.unit.value * term.prefix, term.power);
  return value;
}
