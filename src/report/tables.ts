/**
 * The tabular sections of a shot report: module groups, events, checks, inputs, provenance.
 * Every piece of user or data text goes through escapeHtml.
 */
import type { Scenario } from '../scenario/types.js';
import type { ShotEvent, ShotResults } from '../solve/types.js';
import type { ReportCheck, ReportProvenance } from './embedded.js';
import { escapeHtml } from './escape.js';
import { formatPercent, formatPlain, formatQuantity, formatScientific, NO_VALUE } from './format.js';
import { inputRows, type Leaf } from './inputs.js';

function section(id: string, title: string, body: string): string {
  return `<section id="${id}"><h2>${escapeHtml(title)}</h2>\n${body}\n</section>`;
}

export function modulesSection(scenario: Scenario, results: ShotResults): string {
  const rows = scenario.bank
    .map((group, i) => {
      const result = results.modules[i];
      return (
        `<tr><td>${escapeHtml(result?.label ?? group.label)}</td><td class="num">${group.count}</td>` +
        `<td class="num">${formatQuantity(group.capacitance, 'F')}</td><td class="num">${formatQuantity(group.voltage, 'V')}</td>` +
        `<td class="num">${formatQuantity(group.inductance, 'H')}</td><td class="num">${formatQuantity(group.trigger, 's')}</td>` +
        `<td>${group.crowbar ? 'yes' : 'no'}</td>` +
        `<td class="num">${formatQuantity(result?.peakCurrent, 'A')}</td><td class="num">${formatPercent(result?.reversal)}</td></tr>`
      );
    })
    .join('\n');
  return section(
    'modules',
    'Module groups',
    `<table><thead><tr><th>Group</th><th class="num">n</th><th class="num">C</th><th class="num">V0</th><th class="num">L</th>` +
      `<th class="num">Trigger</th><th>Crowbar</th><th class="num">Peak current per module</th><th class="num">Voltage reversal</th></tr></thead>` +
      `<tbody>${rows}</tbody></table>`,
  );
}

export function eventsSection(events: ShotEvent[], results: ShotResults): string {
  if (events.length === 0) return '';
  const rows = events
    .map((event) => {
      const group = event.group !== undefined ? (results.modules[event.group]?.label ?? `group ${event.group + 1}`) : '';
      return `<tr><td class="num">${formatQuantity(event.t, 's', { digits: 6 })}</td><td>${escapeHtml(event.kind)}</td><td>${escapeHtml(group)}</td></tr>`;
    })
    .join('\n');
  return section(
    'events',
    'Events',
    `<p class="note">Instants located by root finding on the integrator's dense output; the integration restarts at each.</p>` +
      `<table><thead><tr><th class="num">Time</th><th>Event</th><th>Group</th></tr></thead><tbody>${rows}</tbody></table>`,
  );
}

/**
 * A check's figure in its unit: fractions as per cent, kelvin and compound units without an SI prefix
 * (a "kK" or "GA²·s/m⁴" reads badly), simple units with one.
 */
function checkValue(value: number | null, unit: string): string {
  if (value === null) return NO_VALUE;
  if (unit === '' || unit === '1') return formatPercent(value);
  if (unit === 'K') return formatQuantity(value, unit, { prefix: false });
  if (/[²³⁴·/^]/.test(unit)) return formatScientific(value, unit, 3);
  return formatQuantity(value, unit);
}

export function checksSection(checks: ReportCheck[] | undefined): string {
  if (!checks || checks.length === 0) return '';
  const rows = checks
    .map((check) => {
      const verdict = escapeHtml(check.verdict);
      const verdictClass = /^[a-z]+$/.test(check.verdict) ? ` verdict-${check.verdict}` : '';
      return (
        `<tr data-check="${escapeHtml(check.id)}"><td><code>${escapeHtml(check.id)}</code></td><td>${escapeHtml(check.title)}` +
        `${check.note ? `<div class="note">${escapeHtml(check.note)}</div>` : ''}</td>` +
        `<td><span class="verdict${verdictClass}">${verdict}</span></td>` +
        `<td class="num">${checkValue(check.value, check.unit)}</td><td class="num">${checkValue(check.limit, check.unit)}</td>` +
        `<td class="note">${escapeHtml(check.source)}</td></tr>`
      );
    })
    .join('\n');
  return section(
    'checks',
    'Engineering checks',
    `<table><thead><tr><th>Check</th><th>What</th><th>Verdict</th><th class="num">Value</th><th class="num">Limit</th><th>Source</th></tr></thead>` +
      `<tbody>${rows}</tbody></table>`,
  );
}

function writtenCell(value: Leaf | undefined): string {
  if (value === undefined) return '<td class="default">default</td>';
  return `<td class="path">${escapeHtml(typeof value === 'string' ? value : JSON.stringify(value))}</td>`;
}

function siCell(value: Leaf | undefined, unit: string): string {
  if (value === undefined) return `<td class="num">${NO_VALUE}</td>`;
  if (value === null) return '<td>none</td>';
  if (typeof value === 'number') {
    // 12 significant figures: the exact value less the binary noise of unit conversion (4e-4, not 3.9999…e-4)
    return `<td class="num path">${escapeHtml(String(Number(value.toPrecision(12))))}${unit ? '\u00A0' + escapeHtml(unit) : ''}</td>`;
  }
  return `<td>${escapeHtml(String(value))}</td>`;
}

export function inputsSection(scenarioRaw: unknown, scenario: Scenario): string {
  const rows = inputRows(scenarioRaw, scenario)
    .map((row) => `<tr><td class="path">${escapeHtml(row.path)}</td>${writtenCell(row.written)}${siCell(row.si, row.unit)}</tr>`)
    .join('\n');
  return section(
    'inputs',
    'Inputs',
    `<p class="note">Every scenario value by path: as written in the scenario file, and the SI value the model used ("default" where the file leaves it out).</p>` +
      `<table><thead><tr><th>Path</th><th>As written</th><th class="num">SI value used</th></tr></thead><tbody>${rows}</tbody></table>`,
  );
}

export function provenanceSection(provenance: ReportProvenance, plotlyPackage: string): string {
  const items: Array<[string, string]> = [
    ['Generated', provenance.date],
    ['Tool', `railpulse ${provenance.toolVersion}`],
    ['Node.js', provenance.nodeVersion],
    ['Scenario SHA-256', provenance.scenarioSha256],
    ['Relative tolerance', formatPlain(provenance.relTol, 3)],
    ['Integrator steps', String(provenance.steps)],
    ['Right-hand-side evaluations', String(provenance.rhsEvaluations)],
    ['Plots drawn with', `${plotlyPackage} (inlined)`],
  ];
  const body = items.map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd data-provenance="${escapeHtml(k)}">${escapeHtml(v)}</dd>`).join('\n');
  return section('provenance', 'Provenance', `<dl class="provenance">${body}</dl>`);
}
