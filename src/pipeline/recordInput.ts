/**
 * What a shot record shows of an assessed shot. Browser-safe (no files): `recordShot` files the page it gives, the
 * design page builds the same page in the browser.
 */
import type { OverlayInput } from '../report/overlay.js';
import type { ShotReportInput } from '../report/shot-record.js';
import type { RecordUncertainty } from '../report/uncertainty.js';
import type { AssessedShot } from './shoot.js';

export function shotRecordInput(assessed: AssessedShot, overlay?: OverlayInput, uncertainty?: RecordUncertainty): ShotReportInput {
  return {
    scenarioRaw: assessed.loaded.raw,
    scenario: assessed.scenario,
    shot: assessed.shot,
    provenance: assessed.provenance,
    warnings: assessed.assessment.warnings.map((w) => w.message),
    checks: assessed.assessment.checks,
    ...(overlay ? { overlay } : {}),
    ...(uncertainty ? { uncertainty } : {}),
  };
}
