/**
 * The status banner of a shot record: the worst of the engineering checks' verdicts and the shot's warnings, what
 * it rests on (each failing and warning check with its figure and limit, each warning), so the banner can never
 * disagree with the checks table below it.
 */
import { statusOf, type ShotStatus } from '../checks/assess.js';
import { checkFigures, statusSentence, verdictLabel, type CheckLike } from '../output/verdicts.js';
import { escapeHtml } from './escape.js';

const HEADLINE: Record<ShotStatus['verdict'], string> = {
  pass: 'every check passes and the shot raised no warning',
  warn: 'look at the warnings below before relying on this design',
  fail: 'at least one check fails: this design is outside a limit',
};

function reasonItem(check: CheckLike & { title?: string }): string {
  const figures = checkFigures(check);
  const against = check.limit === null ? '' : ` against ${figures.limit}`;
  return `<li data-check="${escapeHtml(check.id)}"><span class="verdict verdict-${check.verdict === 'fail' ? 'fail' : 'warn'}">${escapeHtml(verdictLabel(check))}</span> ${escapeHtml(check.title ?? check.id)}: ${figures.value}${against}</li>`;
}

/** `checks` and `warnings` as the record holds them; the status is computed from them, as the index does. */
export function statusBanner(checks: ReadonlyArray<CheckLike>, warnings: readonly string[]): string {
  const status = statusOf(checks, warnings);
  const reasons = [...checks.filter((c) => c.verdict === 'fail'), ...checks.filter((c) => c.verdict === 'warn')].map(reasonItem).join('\n');
  const warningItems = warnings.map((w) => `<li>${escapeHtml(w)}</li>`).join('\n');
  return `<section id="status" class="status status-${status.verdict}" data-status="${status.verdict}" role="${status.verdict === 'pass' ? 'status' : 'alert'}">
<h2><span class="badge">${status.verdict.toUpperCase()}</span>${escapeHtml(HEADLINE[status.verdict])}</h2>
<p class="note">The status is the worst of the engineering checks and the shot's warnings: ${escapeHtml(statusSentence(status))}</p>
${reasons ? `<ul id="status-checks">\n${reasons}\n</ul>` : ''}
${warnings.length ? `<h3>Warnings (${warnings.length})</h3>` : ''}<ul id="warnings" data-warnings="${warnings.length}">${warningItems}</ul>
</section>`;
}
