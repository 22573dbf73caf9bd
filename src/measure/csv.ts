/**
 * Measured shots: oscilloscope / DAQ CSV → SI arrays.
 *
 * Columns are recognised by header name — `t` (time), `I` (rail current), `V_breech`, `V_muzzle` — each
 * with its unit in brackets (`t [us]`, `I [kA]`); any other header must be mapped (`map: { CH1: 'I' }`) or
 * explicitly dropped (`map: { CH4: 'ignore' }`). Options are keyed by the full header text, its name part,
 * or the signal it maps to (`scale: { I: 1000 }` works for `Rogowski A [V]` mapped to I).
 *
 * Order of operations for each cell, documented because probe factors are easy to apply twice:
 *     value_in_unit = raw × scale + offset        (scale and offset in the column's unit)
 *     value_SI      = value_in_unit × (unit → SI)
 * The column's unit is `units[...]` when given, otherwise the one in the header. So a Rogowski coil read
 * as volts at 2 kA/V is `units: { CH1: 'kA' }, scale: { CH1: 2 }`; a trigger delay of 2 µs on a
 * `t [us]` column is `offset: { t: 2 }`.
 */
import { InputError } from '../core/errors.js';
import { normaliseUnitText, parseWithUnit } from '../units/quantity.js';
import { mathUnit } from '../units/unitLibrary.js';
import { fileLines, textLines, type LineReader } from './lines.js';
import { openTable, readTable, type TableColumn, type TableLayout, type TableStream } from './table.js';

export const SIGNAL_NAMES = ['I', 'V_breech', 'V_muzzle'] as const;
export type SignalName = (typeof SIGNAL_NAMES)[number];
type ColumnRole = 't' | SignalName;

const ROLE_UNITS: Record<ColumnRole, { si: string; noun: string }> = {
  t: { si: 's', noun: 'a time (e.g. s, ms, us)' },
  I: { si: 'A', noun: 'a current (e.g. A, kA)' },
  V_breech: { si: 'V', noun: 'a voltage (e.g. V, kV)' },
  V_muzzle: { si: 'V', noun: 'a voltage (e.g. V, kV)' },
};
const ROLES = Object.keys(ROLE_UNITS) as ColumnRole[];

export interface MeasurementOptions {
  /** file path used in messages */
  source: string;
  /** unit of a column, overriding (or supplying) the header's */
  units?: Record<string, string>;
  /** factor applied to the raw numbers, in the column's unit (probe sensitivity) */
  scale?: Record<string, number>;
  /** added after scaling, in the column's unit (trigger offset) */
  offset?: Record<string, number>;
  /** header (full text or name part) → `t`, `I`, `V_breech`, `V_muzzle`, or `ignore` */
  map?: Record<string, string>;
}

export interface MeasuredColumn {
  role: ColumnRole;
  header: string;
  unit: string;
  scale: number;
  offset: number;
}

/** Sample values: what the reader produces (typed arrays), or plain arrays built by a caller. */
export type SampleArray = Float64Array | readonly number[];

export interface Measurement {
  /** sample times (s), strictly increasing */
  t: SampleArray;
  /** SI signals on the same samples: A for I, V for voltages */
  signals: Partial<Record<SignalName, SampleArray>>;
  /** the file it came from */
  source: string;
  /** how each used column was read (for the report) */
  columns: MeasuredColumn[];
}

export interface PositionPoints {
  /** probe positions from the breech (m), increasing */
  x: number[];
  /** arrival times (s), increasing with x */
  t: number[];
  source: string;
}

/** Read an oscilloscope / DAQ export held as text. Throws InputError at `file:line` for anything it cannot read. */
export function readMeasurement(text: string, options: MeasurementOptions): Measurement {
  return readMeasurementLines(textLines(text, options.source), options);
}

/**
 * Read an oscilloscope / DAQ export from a file, a chunk at a time: memory is the columns kept (8 bytes a
 * value), whatever the file's size. Throws InputError at `file:line` for anything it cannot read.
 */
export function readMeasurementFile(path: string, options: MeasurementOptions): Measurement {
  let reader: LineReader;
  try {
    reader = fileLines(path, options.source);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(options.source, code === 'ENOENT' ? 'no such file' : `cannot read the file (${code ?? 'error'})`);
  }
  return readMeasurementLines(reader, options);
}

/** The header of an export (its columns and their units as written), without reading its rows. */
export function readMeasurementHeader(path: string, source: string): TableLayout {
  let reader: LineReader;
  try {
    reader = fileLines(path, source);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(source, code === 'ENOENT' ? 'no such file' : `cannot read the file (${code ?? 'error'})`);
  }
  const table = openTable(reader, source);
  table.close();
  return table;
}

function readMeasurementLines(reader: LineReader, options: MeasurementOptions): Measurement {
  const { source } = options;
  const table = openTable(reader, source);
  try {
    return readRows(table, options);
  } finally {
    table.close();
  }
}

function readRows(table: TableStream, options: MeasurementOptions): Measurement {
  const { source } = options;
  const where = `${source}:${table.headerLine}`;
  const roles = table.columns.map((column) => roleOf(column, options.map, where));
  checkOptionKeys(table.columns, roles, options, source);

  const columns: (MeasuredColumn & { index: number; factor: number })[] = [];
  roles.forEach((role, index) => {
    if (role === 'ignore') return;
    const column = table.columns[index]!;
    if (columns.some((c) => c.role === role)) {
      throw new InputError(where, `two columns are ${role} ("${columns.find((c) => c.role === role)!.header}" and "${column.header}"); map one of them to "ignore"`);
    }
    const unit = lookup(options.units, column, role) ?? column.unit;
    if (unit === undefined) {
      throw new InputError(where, `column "${column.header}" has no unit: write it in the header, e.g. "${column.name} [${role === 't' ? 'us' : role === 'I' ? 'kA' : 'kV'}]", or give one with units`);
    }
    const scale = lookup(options.scale, column, role) ?? 1;
    const offset = lookup(options.offset, column, role) ?? 0;
    if (!Number.isFinite(scale) || scale === 0 || !Number.isFinite(offset)) {
      throw new InputError(where, `scale and offset of column "${column.header}" must be finite numbers and scale not 0`);
    }
    columns.push({ role, header: column.header, unit, scale, offset, index, factor: unitFactor(unit, role, column.header, where) });
  });

  const time = columns.find((c) => c.role === 't');
  if (!time) throw new InputError(where, `no time column: name one "t [unit]" or map a header to t`);
  if (columns.length < 2) throw new InputError(where, `no signal column: expected I, V_breech or V_muzzle (or map a header to one)`);

  // one growable column per kept signal, sized from the file's size so that it rarely grows
  const expectedRows = Math.ceil((1.02 * table.size) / Math.max(4, table.typicalRowLength)) + 16;
  const stores = columns.map(() => growableColumn(expectedRows));
  const row = new Float64Array(table.columns.length);
  let previousTime = -Infinity;
  for (let line = table.nextRow(row); line > 0; line = table.nextRow(row)) {
    columns.forEach((c, k) => {
      const value = (row[c.index]! * c.scale + c.offset) * c.factor;
      if (c === time) {
        if (!Number.isFinite(value)) throw new InputError(`${source}:${line}`, 'time is not a finite number');
        if (!(value > previousTime)) throw new InputError(`${source}:${line}`, `time is not increasing (${fmt(value)} s after ${fmt(previousTime)} s)`);
        previousTime = value;
      }
      stores[k]!.push(value);
    });
  }
  if (stores[0]!.length === 0) throw new InputError(where, 'no numeric rows after the header');
  const signals: Partial<Record<SignalName, Float64Array>> = {};
  let t: Float64Array = new Float64Array(0);
  columns.forEach((c, k) => {
    const values = stores[k]!.finish();
    if (c.role === 't') t = values;
    else signals[c.role] = values;
  });
  return { t, signals, source, columns: columns.map(({ role, header, unit, scale, offset }) => ({ role, header, unit, scale, offset })) };
}

/** A Float64Array that grows geometrically (×2) and is trimmed at the end. */
function growableColumn(initial: number) {
  let data = new Float64Array(Math.max(16, initial));
  let length = 0;
  return {
    get length() {
      return length;
    },
    push(value: number): void {
      if (length === data.length) {
        const grown = new Float64Array(data.length * 2);
        grown.set(data);
        data = grown;
      }
      data[length++] = value;
    },
    /** the values; copied only when the buffer is much larger than what it holds */
    finish(): Float64Array {
      return length * 1.25 < data.length ? data.slice(0, length) : data.subarray(0, length);
    },
  };
}

/** Probe arrival times: columns `x [m]` and `t [us]` in any order. Sorted by position; times must increase. */
export function readPositionPoints(text: string, options: { source: string; units?: Record<string, string> }): PositionPoints {
  const { source } = options;
  const table = readTable(text, source);
  const where = `${source}:${table.headerLine}`;
  const find = (name: 'x' | 't', si: string, noun: string): number[] => {
    const index = table.columns.findIndex((c) => c.name === name);
    if (index < 0) throw new InputError(where, `expected columns "x [m]" and "t [us]" (any order), found ${table.columns.map((c) => `"${c.header}"`).join(', ')}`);
    const column = table.columns[index]!;
    const unit = options.units?.[column.header] ?? options.units?.[name] ?? column.unit;
    if (unit === undefined) throw new InputError(where, `column "${column.header}" has no unit: write it in the header, e.g. "${name} [${si}]"`);
    const factor = convertUnit(unit, si, noun, column.header, where);
    return table.rows.map((row) => row[index]! * factor);
  };
  const x = find('x', 'm', 'a length (e.g. m, mm)');
  const t = find('t', 's', 'a time (e.g. s, ms, us)');
  if (x.length === 0) throw new InputError(where, 'no numeric rows after the header');
  const order = x.map((_, i) => i).sort((a, b) => x[a]! - x[b]!);
  for (let k = 1; k < order.length; k++) {
    const previous = order[k - 1]!;
    const current = order[k]!;
    const line = `${source}:${table.lines[current]}`;
    if (x[current] === x[previous]) throw new InputError(line, `position ${x[current]} m appears twice (also line ${table.lines[previous]})`);
    if (!(t[current]! > t[previous]!)) {
      throw new InputError(line, `arrival time ${fmt(t[current]!)} s at x = ${x[current]} m is not after ${fmt(t[previous]!)} s at x = ${x[previous]} m (line ${table.lines[previous]}); the armature never moves backwards`);
    }
  }
  return { x: order.map((i) => x[i]!), t: order.map((i) => t[i]!), source };
}

function roleOf(column: TableColumn, map: Record<string, string> | undefined, where: string): ColumnRole | 'ignore' {
  const mapped = map?.[column.header] ?? map?.[column.name];
  if (mapped !== undefined) {
    if (mapped === 'ignore' || (ROLES as string[]).includes(mapped)) return mapped as ColumnRole | 'ignore';
    throw new InputError(where, `map sends "${column.header}" to "${mapped}"; expected one of ${ROLES.join(', ')} or ignore`);
  }
  if ((ROLES as string[]).includes(column.name)) return column.name as ColumnRole;
  throw new InputError(where, `column "${column.header}" is not a known signal (${ROLES.join(', ')}); map it, e.g. map "${column.name}=I", or map it to ignore`);
}

/** Options naming no column are typos; say so rather than silently ignoring a probe factor. */
function checkOptionKeys(columns: TableColumn[], roles: (ColumnRole | 'ignore')[], options: MeasurementOptions, source: string): void {
  const known = new Set<string>();
  columns.forEach((c, i) => {
    known.add(c.header);
    known.add(c.name);
    known.add(roles[i]!);
  });
  for (const key of ['units', 'scale', 'offset', 'map'] as const) {
    for (const name of Object.keys(options[key] ?? {})) {
      if (!known.has(name)) {
        throw new InputError(source, `${key} is given for "${name}", which is not a column (columns: ${columns.map((c) => `"${c.header}"`).join(', ')})`);
      }
    }
  }
}

function lookup<T>(record: Record<string, T> | undefined, column: TableColumn, role: ColumnRole): T | undefined {
  return record?.[column.header] ?? record?.[column.name] ?? record?.[role];
}

function unitFactor(unit: string, role: ColumnRole, header: string, where: string): number {
  return convertUnit(unit, ROLE_UNITS[role].si, ROLE_UNITS[role].noun, header, where);
}

function convertUnit(unit: string, si: string, noun: string, header: string, where: string): number {
  try {
    mathUnit(normaliseUnitText(`1 ${unit}`));
  } catch {
    throw new InputError(where, `unknown unit "${unit}" in column "${header}"; expected ${noun}`);
  }
  try {
    const factor = parseWithUnit(`1 ${unit}`, si);
    if (Number.isFinite(factor) && factor > 0) return factor;
  } catch {
    // fall through to the dimension message
  }
  throw new InputError(where, `unit "${unit}" of column "${header}" is not ${noun}`);
}

/** Six significant digits; exponent form for the small times a scope records. */
function fmt(x: number): string {
  const rounded = Number(x.toPrecision(6));
  return rounded !== 0 && (Math.abs(rounded) < 1e-3 || Math.abs(rounded) >= 1e6) ? rounded.toExponential() : String(rounded);
}
