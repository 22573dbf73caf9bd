/**
 * One study point as a line of points.jsonl and a line of points.csv. Worker-safe (no units, no mathjs).
 *
 * JSONL row: {"index":…, "<path>": SI value for each varied path, …the shot's results with the keys of --json}, or
 * {"index":…, "<path>":…, "error": "…"} for a point that could not be run. CSV: the same, nested result keys
 * flattened with dots and brackets (energy.losses.rails, modules[0].reversal), an `error` column last.
 * The CSV line is always made from the row object, so a line rebuilt from points.jsonl is byte-identical.
 */
import { LOSS_KEYS, type ShotResults } from '../solve/types.js';
import { getPath, parsePath, type PathStep } from '../scenario/paths.js';

export interface RowLayout {
  /** the varied paths, in --vary order */
  paths: string[];
  groupCount: number;
  /** every CSV column, in order */
  columns: string[];
}

const SCALAR_RESULTS = [
  'outcome',
  'muzzleVelocity',
  'exitTime',
  'finalPosition',
  'peakCurrent',
  'peakCurrentTime',
  'peakAcceleration',
  'peakBreechVoltage',
  'actionIntegral',
  'efficiency',
  'energy.initial',
  'energy.capacitors',
  'energy.magnetic',
  'energy.magneticRails',
  'energy.kinetic',
  ...LOSS_KEYS.map((key) => `energy.losses.${key}`),
  'energy.residual',
];

export function resultColumns(groupCount: number): string[] {
  const modules = Array.from({ length: groupCount }, (_, k) => [`modules[${k}].label`, `modules[${k}].peakCurrent`, `modules[${k}].reversal`]).flat();
  return [...SCALAR_RESULTS, ...modules];
}

export function rowLayout(paths: string[], groupCount: number): RowLayout {
  return { paths, groupCount, columns: ['index', ...paths, ...resultColumns(groupCount), 'error'] };
}

export type RowObject = Record<string, unknown>;

export function rowObject(layout: RowLayout, index: number, values: ArrayLike<number>, results: ShotResults | null, error?: string): RowObject {
  const row: RowObject = { index };
  layout.paths.forEach((path, d) => {
    row[path] = values[d];
  });
  if (results) Object.assign(row, results);
  else row.error = (error ?? 'failed').replace(/\s+/g, ' ').trim();
  return row;
}

function csvCell(value: unknown): string {
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (value === null || value === undefined) return '';
  const text = String(value);
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvHeader(layout: RowLayout): string {
  return `${layout.columns.map(csvCell).join(',')}\n`;
}

/** Precomputed lookups of the result columns, so formatting a row does not re-parse paths. */
function makeResultSteps(layout: RowLayout): PathStep[][] {
  return resultColumns(layout.groupCount).map((column) => parsePath(column)!);
}

const stepsCache = new WeakMap<RowLayout, PathStep[][]>();

export function csvLine(layout: RowLayout, row: RowObject): string {
  let steps = stepsCache.get(layout);
  if (!steps) {
    steps = makeResultSteps(layout);
    stepsCache.set(layout, steps);
  }
  const cells = [csvCell(row.index), ...layout.paths.map((path) => csvCell(row[path])), ...steps.map((step) => csvCell(getPath(row, step))), csvCell(row.error)];
  return `${cells.join(',')}\n`;
}

export function jsonLine(row: RowObject): string {
  return `${JSON.stringify(row)}\n`;
}
