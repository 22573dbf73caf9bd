/**
 * The shot record as the commands file it: the page of shot-record.ts with the plotly bundle read from
 * node_modules.
 */
import { plotlyBundleSource } from './plotly-bundle.js';
import { buildShotRecord, type ShotReportInput } from './shot-record.js';

export * from './shot-record.js';

export function buildShotReport(input: ShotReportInput): string {
  return buildShotRecord(input, plotlyBundleSource());
}
