/**
 * The machine-readable part of a shot report: the scenario as written and the results with their
 * provenance, embedded as JSON so an archive index (or anyone) can read a report without parsing HTML.
 */
import type { ShotStatus } from '../checks/assess.js';
import type { CheckDirection } from '../checks/engineering.js';
import type { BankHazard, HazardClass } from '../checks/hazard.js';
import type { ShotFiling } from '../scenario/types.js';
import type { ShotResults } from '../solve/types.js';
import type { ShotProvenance } from '../output/provenance.js';
import { jsonScriptElement, readJsonScriptElement } from './escape.js';

export const SCENARIO_ELEMENT_ID = 'railpulse-scenario';
export const RESULTS_ELEMENT_ID = 'railpulse-results';
export const REPORT_FORMAT = 'railpulse-shot-report';
export const REPORT_FORMAT_VERSION = 1;

export type ReportProvenance = ShotProvenance;

export interface ReportCheck {
  id: string;
  title: string;
  /** e.g. "pass", "warn", "fail", "info" */
  verdict: string;
  value: number | null;
  limit: number | null;
  /** "at-most" (≤ limit), "at-least" (≥ limit), or null for a hazard class; absent in records of older versions */
  direction?: CheckDirection | null;
  warnAt?: number;
  hazardClass?: HazardClass | null;
  unit: string;
  source: string;
  note?: string;
}

/** What the results element holds. */
export interface EmbeddedResultsBlock {
  format: typeof REPORT_FORMAT;
  formatVersion: number;
  scenarioName: string;
  scenarioDescription: string;
  results: ShotResults;
  provenance: ReportProvenance;
  warnings: string[];
  checks: ReportCheck[];
  /** the worst of the checks and the warnings (absent in records of older versions: computed from them) */
  status?: ShotStatus;
  /** stored energy, highest charge voltage and hazard classes of the bank (absent in older records) */
  hazard?: BankHazard;
  /** the scenario's `record` section: shot id, operator, reviewer, notes */
  record?: ShotFiling;
}

export interface EmbeddedReport extends Omit<EmbeddedResultsBlock, 'format' | 'formatVersion'> {
  scenarioRaw: unknown;
}

export function embeddedElements(block: EmbeddedResultsBlock, scenarioRaw: unknown): string {
  return `${jsonScriptElement(SCENARIO_ELEMENT_ID, scenarioRaw)}\n${jsonScriptElement(RESULTS_ELEMENT_ID, block)}`;
}

/** Raised when a file is not a railpulse shot report (or is one of an unknown format version). */
export class NotAReportError extends Error {}

function isObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Only the text fields of a filing (an archive is read from files anyone may have edited). */
function filingOf(value: unknown): ShotFiling {
  const record = value as Record<string, unknown>;
  const out: ShotFiling = {};
  for (const key of ['shotId', 'operator', 'reviewer', 'notes'] as const) if (typeof record[key] === 'string') out[key] = record[key] as string;
  return out;
}

/** Read the embedded scenario and results back from a report's HTML text. */
export function readEmbedded(html: string): EmbeddedReport {
  let scenarioRaw: unknown;
  let block: unknown;
  try {
    scenarioRaw = readJsonScriptElement(html, SCENARIO_ELEMENT_ID);
    block = readJsonScriptElement(html, RESULTS_ELEMENT_ID);
  } catch (error) {
    throw new NotAReportError(`embedded JSON is unreadable (${(error as Error).message})`);
  }
  if (scenarioRaw === undefined || !isObject(block)) {
    throw new NotAReportError(`no embedded ${SCENARIO_ELEMENT_ID}/${RESULTS_ELEMENT_ID} data`);
  }
  if (block['format'] !== REPORT_FORMAT || block['formatVersion'] !== REPORT_FORMAT_VERSION) {
    throw new NotAReportError(`embedded data is not a ${REPORT_FORMAT} version ${REPORT_FORMAT_VERSION}`);
  }
  if (!isObject(block['results']) || !isObject(block['provenance'])) {
    throw new NotAReportError('embedded data lacks results or provenance');
  }
  const full = block as unknown as EmbeddedResultsBlock;
  return {
    scenarioRaw,
    scenarioName: String(full.scenarioName ?? ''),
    scenarioDescription: String(full.scenarioDescription ?? ''),
    results: full.results,
    provenance: full.provenance,
    warnings: Array.isArray(full.warnings) ? full.warnings.map(String) : [],
    checks: Array.isArray(full.checks) ? full.checks : [],
    ...(isObject(full.status) ? { status: full.status } : {}),
    ...(isObject(full.hazard) ? { hazard: full.hazard } : {}),
    ...(isObject(full.record) ? { record: filingOf(full.record) } : {}),
  };
}
