/**
 * Verdicts in words, the same on the terminal, every page and the archive index: a check's verdict (a hazard check
 * shows its class, never PASS), its direction (≤ / ≥), and the sentence that says what a shot's status rests on.
 */
import type { ShotStatus } from '../checks/assess.js';
import type { CheckDirection } from '../checks/engineering.js';
import { HAZARD_CLASS_NAMES, type HazardClass } from '../checks/hazard.js';
import { formatQuantity, NO_VALUE, sharedPrefixFormatter } from '../units/format.js';

/** What a verdict label needs of a check; embedded records of older versions may lack the newer fields. */
export interface CheckLike {
  id: string;
  title?: string;
  verdict: string;
  value: number | null;
  limit: number | null;
  unit: string;
  direction?: CheckDirection | null;
  warnAt?: number;
  hazardClass?: HazardClass | null;
}

/** True for the capacitor hazard checks (they carry a class, or null below it). */
export function isHazardCheck(check: CheckLike): boolean {
  return check.hazardClass !== undefined || /hazard$/.test(check.id);
}

/** "pass", "warn", "fail", "info", or for a hazard check its class ("shock class") or "below class". */
export function verdictLabel(check: CheckLike): string {
  if (isHazardCheck(check)) {
    if (check.hazardClass) return `${HAZARD_CLASS_NAMES[check.hazardClass].replace(/ hazard$/, '')} class`;
    if (check.hazardClass === null || check.verdict === 'info') return 'below class';
    return check.verdict === 'warn' ? 'in class' : 'below class';
  }
  return check.verdict;
}

export const DIRECTION_SYMBOL: Record<CheckDirection, string> = { 'at-most': '\u2264', 'at-least': '\u2265' };

/** A check's unit as the formatter writes fractions. */
function unitOf(check: CheckLike): string {
  return check.unit === '1' || check.unit === '' ? '%' : check.unit;
}

/** Value, limit and warning boundary of one check in one prefix, so the three compare at a glance. */
export function checkFigures(check: CheckLike): { value: string; limit: string; warnAt: string | null } {
  const unit = unitOf(check);
  const scale = (v: number | null | undefined): number | null | undefined => (unit === '%' && typeof v === 'number' ? v * 100 : v);
  const shared = unit === '%' ? null : sharedPrefixFormatter([check.value, check.limit, check.warnAt], unit);
  const format = (v: number | null | undefined): string =>
    v === null || v === undefined ? NO_VALUE : shared ? shared(v) : formatQuantity(scale(v)!, unit);
  const symbol = check.direction ? `${DIRECTION_SYMBOL[check.direction]}\u00A0` : isHazardCheck(check) ? 'class from\u00A0' : '';
  return {
    value: format(check.value),
    limit: check.limit === null ? 'none given' : `${symbol}${format(check.limit)}`,
    warnAt: check.warnAt === undefined ? null : format(check.warnAt),
  };
}

function list(ids: readonly string[]): string {
  return ids.length <= 4 ? ids.join(', ') : `${ids.slice(0, 4).join(', ')} and ${ids.length - 4} more`;
}

function plural(count: number, one: string, many: string): string {
  return `${count} ${count === 1 ? one : many}`;
}

/**
 * What the status rests on, in one sentence: "2 checks warn (contact-force, capacitor-shock-hazard); 1 warning
 * from the shot; the bank is in the shock hazard class."
 */
export function statusSentence(status: ShotStatus): string {
  const parts: string[] = [];
  if (status.failing.length) parts.push(`${plural(status.failing.length, 'check fails', 'checks fail')} (${list(status.failing)})`);
  if (status.warning.length) parts.push(`${plural(status.warning.length, 'check warns', 'checks warn')} (${list(status.warning)})`);
  if (status.warnings) parts.push(`${plural(status.warnings, 'warning', 'warnings')} from the shot`);
  const passed = status.checks.pass;
  if (parts.length === 0) parts.push(passed > 0 ? `all ${plural(passed, 'check passes', 'checks pass')} and the shot raised no warning` : 'no check applies and the shot raised no warning');
  else if (passed > 0) parts.push(`${passed} pass`);
  if (status.checks.info) parts.push(`${status.checks.info} for information`);
  const classes = status.hazardClasses.map((c) => HAZARD_CLASS_NAMES[c]);
  const bank = classes.length ? `; the bank is in the ${classes.join(' and ')} class${classes.length > 1 ? 'es' : ''}` : '';
  return `${parts.join('; ')}${bank}.`;
}
