/**
 * Filing what a command produced: a shot record, an overlay record or a comparison. One rule for every
 * command: the target is a folder (a new file named date_scenario_hash.html, with -2, -3 … if taken) or a new
 * file ending in .html; the page is written atomically and never replaces an existing file.
 */
import { existsSync, mkdirSync, statSync } from 'node:fs';
import { recordTag, reportDate } from '../output/provenance.js';
import { checkNewFile, checkWritableFolder, reportBaseName, writeExactFile, writeNewFile } from '../output/write.js';
import { buildShotReport } from '../report/html.js';
import type { OverlayInput } from '../report/overlay.js';
import type { RecordUncertainty } from '../report/uncertainty.js';
import { InputError, withFileProblems } from '../core/errors.js';
import type { AssessedShot } from './shoot.js';
import { shotRecordInput } from './recordInput.js';

export const DEFAULT_REPORT_DIR = 'reports';

export interface FilingPlace {
  /** a folder, or a new file ending in .html (default: reports/) */
  target?: string | undefined;
  /** the file name without extension when the target is a folder */
  baseName: string;
  /** the option that named the target, for messages */
  option?: string;
}

/**
 * Check, before a command does its work, that a page can be filed where the user asked: a new .html file that
 * does not exist yet in an existing, writable folder, or a folder that is writable or can be created.
 */
export function checkFilingPlace(target: string | undefined, option = '--report'): void {
  const place = target ?? DEFAULT_REPORT_DIR;
  if (place.toLowerCase().endsWith('.html')) checkNewFile(place, option);
  else checkWritableFolder(place, option);
}

/** Write a page where `place` says; returns the path written. */
export function fileRecord(html: string, place: FilingPlace): string {
  const target = place.target ?? DEFAULT_REPORT_DIR;
  const option = place.option ?? '--report';
  if (target.toLowerCase().endsWith('.html')) {
    writeExactFile(target, html, option);
    return target;
  }
  if (existsSync(target) && !statSync(target).isDirectory()) {
    throw new InputError(option, `${target} is a file; give a folder or a new file name ending in .html`);
  }
  withFileProblems(target, () => mkdirSync(target, { recursive: true }), 'cannot create the folder');
  return writeNewFile(target, place.baseName, '.html', html);
}

/** The base name of a shot's record: date, scenario name, a short hash of the scenario and tool version. */
export function recordBaseName(assessed: AssessedShot, suffix = ''): string {
  return `${reportBaseName(reportDate(), assessed.loaded.scenario.name, recordTag(assessed.loaded.sha256))}${suffix}`;
}

/** The HTML record of an assessed shot (with measured traces over it when `overlay` is given, its uncertainty when known). */
export function shotRecordHtml(assessed: AssessedShot, overlay?: OverlayInput, uncertainty?: RecordUncertainty): string {
  return buildShotReport(shotRecordInput(assessed, overlay, uncertainty));
}

/** Build and file the record of a shot; returns its path. */
export function recordShot(assessed: AssessedShot, target?: string, overlay?: OverlayInput, uncertainty?: RecordUncertainty): string {
  return fileRecord(shotRecordHtml(assessed, overlay, uncertainty), { target, baseName: recordBaseName(assessed, overlay ? '_overlay' : '') });
}
