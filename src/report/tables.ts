/**
 * The tabular sections of a shot report: module groups, events, checks, inputs, provenance.
 * Every piece of user or data text goes through escapeHtml; every number through the one formatter, one prefix per
 * column where a column holds one quantity.
 */
import type { Scenario } from '../scenario/types.js';
import type { ShotEvent, ShotResults } from '../solve/types.js';
import { checkFigures, isHazardCheck, verdictLabel } from '../output/verdicts.js';
import { columnFormatter, formatExact, formatPercent, formatQuantity, NO_VALUE } from '../units/format.js';
import type { ReportCheck, ReportProvenance } from './embedded.js';
import { escapeHtml } from './escape.js';
import { groupBySection, inputRows, keyInSection, unwrittenSource, type InputRow, type Leaf } from './inputs.js';
import { dateHtml } from './styles.js';

function section(id: string, title: string, body: string): string {
  return `<section id="${id}"><h2>${escapeHtml(title)}</h2>\n${body}\n</section>`;
}

export function modulesSection(scenario: Scenario, results: ShotResults): string {
  const bank = scenario.bank;
  const capacitance = columnFormatter(bank.map((g) => g.capacitance), 'F');
  const voltage = columnFormatter(bank.map((g) => g.voltage), 'V');
  const inductance = columnFormatter(bank.map((g) => g.inductance), 'H');
  const trigger = columnFormatter(bank.map((g) => g.trigger), 's');
  const current = columnFormatter(results.modules.map((m) => m.peakCurrent), 'A');
  const rows = bank
    .map((group, i) => {
      const result = results.modules[i];
      return (
        `<tr><td>${escapeHtml(result?.label ?? group.label)}</td><td class="num">${group.count}</td>` +
        `<td class="num">${capacitance.format(group.capacitance)}</td><td class="num">${voltage.format(group.voltage)}</td>` +
        `<td class="num">${inductance.format(group.inductance)}</td><td class="num">${trigger.format(group.trigger)}</td>` +
        `<td>${group.crowbar ? 'yes' : 'no'}</td>` +
        `<td class="num">${current.format(result?.peakCurrent)}</td><td class="num">${formatPercent(result?.reversal)}</td></tr>`
      );
    })
    .join('\n');
  return section(
    'modules',
    'Module groups',
    `<table><thead><tr><th>Group</th><th class="num">Modules n</th><th class="num">C per module</th><th class="num">V0</th><th class="num">L per module</th>` +
      `<th class="num">Trigger</th><th>Crowbar</th><th class="num">Peak current per module</th><th class="num">Voltage reversal</th></tr></thead>` +
      `<tbody>${rows}</tbody></table>`,
  );
}

export const EVENT_TEXT: Record<ShotEvent['kind'], string> = {
  trigger: 'trigger',
  'turn-on': 'switch turns on',
  crowbar: 'crowbar diode conducts',
  transition: 'contact turns into an arc',
  'turn-off': 'switch turns off',
  start: 'armature starts moving',
  stop: 'armature stops',
  exit: 'muzzle exit',
  stall: 'stall (end of shot)',
  timeout: 'end time reached',
  discharged: 'bank discharged (end of ring-down)',
};

export function eventsSection(events: ShotEvent[], results: ShotResults): string {
  if (events.length === 0) return '';
  // one unit for the whole column, with enough digits for the instants to the integrator's tolerance
  const time = columnFormatter(events.map((e) => e.t), 's', 7);
  const rows = events
    .map((event) => {
      const group = event.group !== undefined ? (results.modules[event.group]?.label ?? `group ${event.group + 1}`) : '';
      return `<tr data-event="${escapeHtml(event.kind)}"><td class="num">${time.format(event.t)}</td><td>${escapeHtml(EVENT_TEXT[event.kind] ?? event.kind)}</td><td>${escapeHtml(group)}</td></tr>`;
    })
    .join('\n');
  return section(
    'events',
    'Events',
    `<p class="note">Instants located by root finding on the integrator's dense output; the integration restarts at each. Times in ${escapeHtml(time.unit)} from the first trigger; the time plots mark the triggers, crowbar onsets and the end of the in-bore phase.</p>` +
      `<table><thead><tr><th class="num">Time (${escapeHtml(time.unit)})</th><th>Event</th><th>Group</th></tr></thead><tbody>${rows}</tbody></table>`,
  );
}

export function checksSection(checks: ReportCheck[] | undefined): string {
  if (!checks || checks.length === 0) return '';
  const rows = checks
    .map((check) => {
      const figures = checkFigures(check);
      const hazard = isHazardCheck(check);
      const verdictClass = hazard ? (check.verdict === 'warn' ? 'warn' : 'info') : /^[a-z]+$/.test(check.verdict) ? check.verdict : 'warn';
      return (
        `<tr data-check="${escapeHtml(check.id)}" data-verdict="${escapeHtml(check.verdict)}"${check.direction ? ` data-direction="${escapeHtml(check.direction)}"` : ''}>` +
        `<td><span class="verdict verdict-${verdictClass}">${escapeHtml(verdictLabel(check))}</span></td>` +
        `<td>${escapeHtml(check.title)}<div class="note"><code>${escapeHtml(check.id)}</code>${check.note ? ` \u2014 ${escapeHtml(check.note)}` : ''}</div></td>` +
        `<td class="num">${figures.value}</td><td class="num">${figures.limit}${figures.warnAt ? `<div class="note">warns from ${figures.warnAt}</div>` : ''}</td>` +
        `<td class="note">${escapeHtml(check.source)}</td></tr>`
      );
    })
    .join('\n');
  return section(
    'checks',
    'Engineering checks',
    `<p class="note">Advice for a designer, not certification. \u2264: the figure must stay at most the limit; \u2265: at least. "info": no limit was given, so no verdict. The capacitor hazard checks give the bank's class (DOE-HDBK-1092), never a pass.</p>` +
      `<table class="checks"><thead><tr><th>Verdict</th><th>Check</th><th class="num">Figure</th><th class="num">Limit</th><th>Source of the limit</th></tr></thead>` +
      `<tbody>${rows}</tbody></table>`,
  );
}

const UNWRITTEN_TEXT = { default: 'default', geometry: 'from geometry', material: 'from the material' } as const;

function writtenCell(value: Leaf | undefined, unwritten: keyof typeof UNWRITTEN_TEXT = 'default'): string {
  if (value === undefined) return `<td class="default">${UNWRITTEN_TEXT[unwritten]}</td>`;
  return `<td class="path">${escapeHtml(typeof value === 'string' ? value : JSON.stringify(value))}</td>`;
}

/**
 * The used-value cell: numbers right-aligned in SI (exactly as given; a figure computed from geometry to the same
 * four significant digits as every computed figure); text the model used as written is not repeated.
 */
export function usedCell(value: Leaf | undefined, written: Leaf | undefined, unit: string, path = '', computed = false): string {
  if (value === undefined && typeof written === 'string' && /(^|\.)material$/.test(path)) return '<td class="note">its values, listed in this section</td>';
  if (typeof value === 'number' && computed) return `<td class="num">${formatQuantity(value, unit)}</td>`;
  if (typeof value === 'number') return `<td class="num">${usedValueText(value, unit)}</td>`;
  if (typeof value === 'string' && value === written) return '<td class="note">as written</td>';
  return `<td>${usedValueText(value, unit)}</td>`;
}

/** The value the model used: numbers exactly, in SI with their unit; text and flags as they are. */
export function usedValueText(value: Leaf | undefined, unit: string): string {
  if (value === undefined) return NO_VALUE;
  if (value === null) return 'none';
  if (typeof value === 'number') return formatExact(value, unit);
  return escapeHtml(String(value));
}

const SECTION_TITLES: Record<string, string> = {
  '': 'Scenario',
  record: 'Record (filing; no effect on the shot)',
  feed: 'Feed',
  rails: 'Rails',
  armature: 'Armature',
  friction: 'Friction',
  drag: 'Gas drag',
  materials: 'Materials given in the scenario',
  limits: 'Check thresholds given in the scenario',
  target: 'Sizing target',
  solver: 'Solver',
};

/** A section's heading: "Bank group 1 (B2)" for a bank group, the section's name otherwise. */
export function sectionTitle(section: string, scenario: Pick<Scenario, 'bank'>): string {
  const group = /^bank\[(\d+)\]$/.exec(section);
  if (group) {
    const index = Number(group[1]);
    const label = scenario.bank[index]?.label;
    return `Bank group ${index + 1}${label ? ` (${label})` : ''}`;
  }
  return SECTION_TITLES[section] ?? section;
}

function inputRowHtml(row: InputRow, section: string, scenario: Scenario, scenarioRaw: unknown): string {
  const source = row.written === undefined ? unwrittenSource(row.path, scenario, scenarioRaw) : 'default';
  return `<tr data-path="${escapeHtml(row.path)}"><td class="key">${escapeHtml(keyInSection(row.path, section))}</td>${writtenCell(row.written, source)}${usedCell(row.si, row.written, row.unit, row.path, source === 'geometry')}</tr>`;
}

export function inputsSection(scenarioRaw: unknown, scenario: Scenario): string {
  const body = groupBySection(inputRows(scenarioRaw, scenario))
    .map(({ section, rows }) => `<tr class="section-head" data-section="${escapeHtml(section)}"><th colspan="3">${escapeHtml(sectionTitle(section, scenario))}</th></tr>\n${rows.map((row) => inputRowHtml(row, section, scenario, scenarioRaw)).join('\n')}`)
    .join('\n');
  return section(
    'inputs',
    'Inputs',
    `<p class="note">Every scenario value, by section: as written in the scenario file, and the value the model used, in SI ("default" where the file leaves it out). Derived values (rails and armature from geometry, materials by name) appear under their section.</p>` +
      `<table class="inputs"><thead><tr><th>Key</th><th>As written</th><th class="num">Used (SI)</th></tr></thead><tbody>${body}</tbody></table>`,
  );
}

export function provenanceSection(provenance: ReportProvenance, plotlyPackage: string): string {
  const items: Array<[string, string]> = [
    ['Generated', dateHtml(provenance.date)],
    ['Tool', escapeHtml(`railpulse ${provenance.toolVersion}`)],
    ['Node.js', escapeHtml(provenance.nodeVersion)],
    ['Scenario SHA-256', escapeHtml(provenance.scenarioSha256)],
    ['Relative tolerance', formatExact(provenance.relTol, '')],
    ['Integrator steps', String(provenance.steps)],
    ['Right-hand-side evaluations', String(provenance.rhsEvaluations)],
    ['Plots drawn with', escapeHtml(`${plotlyPackage} (inlined)`)],
  ];
  const body = items.map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd data-provenance="${escapeHtml(k)}">${v}</dd>`).join('\n');
  return section('provenance', 'Provenance', `<dl class="provenance">${body}</dl>`);
}
