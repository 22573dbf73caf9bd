/**
 * One study point as a line of points.jsonl and a line of points.csv. Worker-safe (no unit parser, no mathjs).
 *
 * JSONL row: {"index":…, "<path>": SI value for each varied path, …the shot's results with the keys of --json,
 * "verdict": the point's status (the worst of its checks and warnings: pass, warn or fail), "verdicts": {check id:
 * verdict}, "warnings": [warning ids]}, or {"index":…, "<path>":…, "error": "…"} for a point that could not be run.
 * CSV: the same, nested keys flattened with dots and brackets (energy.losses.rails, modules[0].reversal,
 * verdicts.peak-acceleration), the warnings joined by ";", an `error` column last. The verdicts come from the
 * assessment every command reads (src/checks/assess.ts). The CSV line is always made from the row object, so a line
 * rebuilt from points.jsonl is byte-identical.
 * A study run with --uncertainty adds `uncertainty: { muzzleVelocity, … }` (the standard uncertainties of the
 * headline results at that point, SI) to each row, and `uncertainty.<result>` columns after the results.
 */
import type { Assessment } from '../checks/assess.js';
import { checkIdsFor } from '../checks/shotChecks.js';
import type { Scenario } from '../scenario/types.js';
import { LOSS_KEYS, type ShotResults } from '../solve/types.js';
import { getPath, parsePath, type PathStep } from '../scenario/paths.js';
import { HEADLINE_KEYS, type Headline } from './headline.js';

export interface RowLayout {
  /** the varied paths, in --vary order */
  paths: string[];
  groupCount: number;
  /** the check ids with a verdict column, in the checks' order */
  checkIds: string[];
  /** rows carry the standard uncertainties of the headline results */
  uncertainty: boolean;
  /** every CSV column, in order */
  /** result columns of the shot effects the scenario turns on (EFFECT_COLUMNS), after the modules' */
  effects: string[];
  columns: string[];
}

export const VERDICT_COLUMN = 'verdict';
export const VERDICTS_PREFIX = 'verdicts.';
export const WARNINGS_COLUMN = 'warnings';

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

/**
 * Results that exist only for some scenarios, in this order: the energy that leaves with the armature (every
 * launch; blank when the armature does not exit), the energy inside the rails (rail current diffusion), the
 * contact's transition to an arc and the adiabatic temperatures (when those options are on).
 */
export const EFFECT_COLUMNS = ['energy.afterExit', 'energy.railInterior', 'transitionTime', 'transitionPosition', 'armatureTemperature', 'railTemperature'] as const;

/** The effect columns a study of `scenario` has. */
export function effectColumns(scenario: Scenario): string[] {
  if (scenario.load) return [];
  const on: Record<(typeof EFFECT_COLUMNS)[number], boolean> = {
    'energy.afterExit': true,
    'energy.railInterior': scenario.rails.diffusion !== undefined,
    transitionTime: scenario.armature.transition !== undefined,
    transitionPosition: scenario.armature.transition !== undefined,
    armatureTemperature: (scenario.heating?.armature ?? 0) > 0,
    railTemperature: (scenario.heating?.rails ?? 0) > 0,
  };
  return EFFECT_COLUMNS.filter((column) => on[column]);
}

export function resultColumns(groupCount: number, effects: readonly string[] = []): string[] {
  const modules = Array.from({ length: groupCount }, (_, k) => [`modules[${k}].label`, `modules[${k}].peakCurrent`, `modules[${k}].reversal`]).flat();
  return [...SCALAR_RESULTS, ...modules, ...effects];
}

export const UNCERTAINTY_COLUMNS = HEADLINE_KEYS.map((key) => `uncertainty.${key}`);

export function rowLayout(paths: string[], groupCount: number, checkIds: string[] = [], uncertainty = false, effects: string[] = []): RowLayout {
  return {
    paths,
    groupCount,
    checkIds,
    uncertainty,
    effects,
    columns: ['index', ...paths, ...resultColumns(groupCount, effects), ...(uncertainty ? UNCERTAINTY_COLUMNS : []), VERDICT_COLUMN, ...checkIds.map((id) => `${VERDICTS_PREFIX}${id}`), WARNINGS_COLUMN, 'error'],
  };
}

/** The layout of a study of `scenario` varying `paths`: its result columns and a verdict column per check. */
export function studyLayout(scenario: Scenario, paths: string[], uncertainty = false): RowLayout {
  return rowLayout(paths, scenario.bank.length, checkIdsFor(scenario, paths), uncertainty, effectColumns(scenario));
}

export type RowObject = Record<string, unknown>;

export function rowObject(
  layout: RowLayout,
  index: number,
  values: ArrayLike<number>,
  results: ShotResults | null,
  error?: string,
  assessment?: Pick<Assessment, 'checks' | 'warnings' | 'status'>,
  uncertainty?: Headline,
): RowObject {
  const row: RowObject = { index };
  layout.paths.forEach((path, d) => {
    row[path] = values[d];
  });
  if (results) {
    Object.assign(row, results);
    if (assessment) {
      row[VERDICT_COLUMN] = assessment.status.verdict;
      row.verdicts = Object.fromEntries(assessment.checks.map((check) => [check.id, check.verdict]));
      row[WARNINGS_COLUMN] = assessment.warnings.map((warning) => warning.id);
    }
    if (uncertainty) row.uncertainty = uncertainty;
  } else row.error = (error ?? 'failed').replace(/\s+/g, ' ').trim();
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
  return [...resultColumns(layout.groupCount, layout.effects), ...(layout.uncertainty ? UNCERTAINTY_COLUMNS : [])].map((column) => parsePath(column)!);
}

const stepsCache = new WeakMap<RowLayout, PathStep[][]>();

export function csvLine(layout: RowLayout, row: RowObject): string {
  let steps = stepsCache.get(layout);
  if (!steps) {
    steps = makeResultSteps(layout);
    stepsCache.set(layout, steps);
  }
  const verdicts = (row.verdicts ?? {}) as Record<string, unknown>;
  const warnings = Array.isArray(row[WARNINGS_COLUMN]) ? (row[WARNINGS_COLUMN] as unknown[]).join(';') : undefined;
  const cells = [
    csvCell(row.index),
    ...layout.paths.map((path) => csvCell(row[path])),
    ...steps.map((step) => csvCell(getPath(row, step))),
    csvCell(row[VERDICT_COLUMN]),
    ...layout.checkIds.map((id) => csvCell(verdicts[id])),
    csvCell(warnings),
    csvCell(row.error),
  ];
  return `${cells.join(',')}\n`;
}

export function jsonLine(row: RowObject): string {
  return `${JSON.stringify(row)}\n`;
}
