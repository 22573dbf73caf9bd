/**
 * The tables of the comparison page: the outputs side by side (a "better" mark only where better is defined:
 * higher muzzle velocity and efficiency), the margins to the engineering limits (more margin is better), and the
 * inputs by section with the differences highlighted. Differences to the baseline are relative changes, except for
 * quantities that are themselves percentages, whose differences are in percentage points.
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot, ShotResults } from '../solve/types.js';
import { checkFigures, verdictLabel, isHazardCheck } from '../output/verdicts.js';
import { formatChange, formatPercent, formatPercentagePoints, formatQuantity, NO_VALUE } from '../units/format.js';
import { scenarioColour } from './compare-plots.js';
import type { ReportCheck } from './embedded.js';
import { escapeHtml } from './escape.js';
import { groupBySection, inputRows, keyInSection, unwrittenSource, type Leaf } from './inputs.js';
import { sectionTitle, usedCell } from './tables.js';

export interface ComparedEntryView {
  file: string;
  scenarioRaw: unknown;
  scenario: Scenario;
  shot: Shot;
  checks?: ReportCheck[];
}

export type BetterDirection = 'higher' | 'lower' | 'none';

export interface ComparedOutput {
  key: string;
  label: string;
  better: BetterDirection;
  /** only shots that left the muzzle compete (a stalled armature's speed is no muzzle velocity) */
  exitOnly: boolean;
  /** a fraction shown in per cent: differences in percentage points */
  percentage: boolean;
  value: (results: ShotResults) => number | null;
  format: (value: number) => string;
}

const maxReversal = (results: ShotResults): number => results.modules.reduce((max, m) => Math.max(max, m.reversal), 0);

/**
 * "Better" is marked only where it is defined for any design: more muzzle velocity, more efficiency. A lower peak
 * current or acceleration is not better in itself (the weakest shot has the lowest); how close a shot comes to its
 * limits is in the margins table.
 */
export const COMPARED_OUTPUTS: readonly ComparedOutput[] = [
  { key: 'muzzleVelocity', label: 'Muzzle velocity', better: 'higher', exitOnly: true, percentage: false, value: (r) => r.muzzleVelocity, format: (v) => formatQuantity(v, 'm/s') },
  { key: 'efficiency', label: 'Efficiency (kinetic / stored)', better: 'higher', exitOnly: true, percentage: true, value: (r) => r.efficiency, format: (v) => formatPercent(v) },
  { key: 'kineticEnergy', label: 'Kinetic energy at the end', better: 'none', exitOnly: false, percentage: false, value: (r) => r.energy.kinetic, format: (v) => formatQuantity(v, 'J') },
  { key: 'exitTime', label: 'Exit time', better: 'none', exitOnly: true, percentage: false, value: (r) => r.exitTime, format: (v) => formatQuantity(v, 's') },
  { key: 'peakCurrent', label: 'Peak current', better: 'none', exitOnly: false, percentage: false, value: (r) => r.peakCurrent, format: (v) => formatQuantity(v, 'A') },
  { key: 'peakAcceleration', label: 'Peak acceleration', better: 'none', exitOnly: false, percentage: false, value: (r) => r.peakAcceleration, format: (v) => formatQuantity(v, 'm/s\u00B2') },
  { key: 'actionIntegral', label: 'Action integral \u222BI\u00B2dt', better: 'none', exitOnly: false, percentage: false, value: (r) => r.actionIntegral, format: (v) => formatQuantity(v, 'A\u00B2\u00B7s') },
  { key: 'arcEnergy', label: 'Energy the muzzle arc must absorb (\u00BDL(x)I\u00B2, feed and rails)', better: 'none', exitOnly: true, percentage: false, value: (r) => r.energy.magneticRails, format: (v) => formatQuantity(v, 'J') },
  { key: 'maxReversal', label: 'Largest capacitor voltage reversal', better: 'none', exitOnly: false, percentage: true, value: maxReversal, format: (v) => formatPercent(v) },
];

export const DIRECTION_TEXT: Record<BetterDirection, string> = {
  higher: 'higher is better',
  lower: 'lower is better',
  none: 'for reference',
};

/**
 * Values within this relative distance of the best tie: below what the table shows (4 significant figures)
 * and below the model's own accuracy, so a "better" mark there would claim a difference nobody can see.
 */
export const TIE_TOLERANCE = 1e-3;

/**
 * Indices of the better values: the highest or lowest of the eligible ones (null is not eligible), ties
 * within TIE_TOLERANCE all marked. Nothing is marked when every entry ties, or with no direction.
 */
export function betterIndices(values: ReadonlyArray<number | null>, better: BetterDirection): number[] {
  if (better === 'none') return [];
  const eligible = values.flatMap((v, i) => (v !== null && Number.isFinite(v) ? [{ v, i }] : []));
  if (eligible.length === 0) return [];
  const best = eligible.reduce((b, e) => (better === 'higher' ? Math.max(b, e.v) : Math.min(b, e.v)), eligible[0]!.v);
  const tolerance = TIE_TOLERANCE * Math.abs(best);
  const marked = eligible.filter((e) => Math.abs(e.v - best) <= tolerance).map((e) => e.i);
  return marked.length === values.length ? [] : marked;
}

/** The difference to the baseline: percentage points for a percentage, a relative change otherwise. */
export function differenceText(value: number | null, baseline: number | null, percentage: boolean): string {
  if (value === null || baseline === null || !Number.isFinite(value) || !Number.isFinite(baseline)) return '';
  if (percentage) return formatPercentagePoints(value - baseline);
  if (baseline === 0) return '';
  return formatChange((value - baseline) / Math.abs(baseline));
}

export function cell(text: string, cls = '', attrs = ''): string {
  return `<td${cls ? ` class="${cls}"` : ''}${attrs}>${text}</td>`;
}

export function scenarioHeads(entries: ReadonlyArray<Pick<ComparedEntryView, 'file'>>, names: string[], colspan = 1): string {
  return entries
    .map((e, i) => `<th class="num"${colspan > 1 ? ` colspan="${colspan}"` : ''} data-entry="${i}"><span class="swatch" style="background:${scenarioColour(i)}"></span>${escapeHtml(names[i])}<div class="note"><code>${escapeHtml(e.file)}</code></div></th>`)
    .join('');
}

function outputRow(output: ComparedOutput, entries: ReadonlyArray<ComparedEntryView>): string {
  const values = entries.map((e) => output.value(e.shot.results));
  const eligible = entries.map((e, i) => (output.exitOnly && e.shot.results.outcome !== 'exited' ? null : values[i]!));
  const marked = new Set(betterIndices(eligible, output.better));
  const cells = values.map((v, i) => {
    const text = v === null ? NO_VALUE : output.format(v);
    const excluded = eligible[i] === null && v !== null;
    const difference = i === 0 || excluded ? '' : differenceText(eligible[i]!, eligible[0]!, output.percentage);
    const cls = ['num', marked.has(i) ? 'better' : '', excluded ? 'not-eligible' : ''].filter(Boolean).join(' ');
    const content = `${excluded ? `${text} <span class="note">(no exit)</span>` : text}${difference ? `<div class="note difference" data-difference>${difference}</div>` : ''}`;
    return cell(content, cls, `${v === null ? '' : ` data-si="${v}"`}${marked.has(i) ? ' data-better="true"' : ''}`);
  });
  return `<tr data-output="${output.key}" data-direction="${output.better}"><td>${escapeHtml(output.label)}</td><td class="note">${DIRECTION_TEXT[output.better]}</td>${cells.join('')}</tr>`;
}

export function outputsSection(entries: ReadonlyArray<ComparedEntryView>, names: string[]): string {
  const outcomeRow = `<tr data-output="outcome"><td>Outcome</td><td class="note"></td>${entries.map((e) => cell(escapeHtml(e.shot.results.outcome), 'num')).join('')}</tr>`;
  const storedRow = `<tr data-output="storedEnergy"><td>Stored energy E0</td><td class="note">${DIRECTION_TEXT.none}</td>${entries.map((e, i) => cell(`${formatQuantity(e.shot.results.energy.initial, 'J')}${i > 0 ? `<div class="note difference">${differenceText(e.shot.results.energy.initial, entries[0]!.shot.results.energy.initial, false)}</div>` : ''}`, 'num', ` data-si="${e.shot.results.energy.initial}"`)).join('')}</tr>`;
  const rows = COMPARED_OUTPUTS.map((output) => outputRow(output, entries)).join('\n');
  return `<section id="outputs"><h2>Outputs</h2>
<p class="note">A \u2713 marks the better value only where better is defined: the higher muzzle velocity and the higher efficiency, among the shots that left the muzzle (values within 0.1\u00A0% of the best tie; nothing is marked when every shot ties). The other figures are for reference: a lower peak current is not better in itself; how close each shot comes to its limits is in the margins below. Under each value: its difference to the first shot, in percentage points for percentages and as a relative change otherwise.</p>
<div class="scroll"><table class="outputs"><thead><tr><th>Figure</th><th>Better</th>${scenarioHeads(entries, names)}</tr></thead>
<tbody>${outcomeRow}\n${storedRow}\n${rows}</tbody></table></div>
</section>`;
}

/** Margin of a check to its limit, as a fraction of the limit: positive inside the limit, negative beyond it. */
export function marginOf(check: Pick<ReportCheck, 'value' | 'limit' | 'direction'>): number | null {
  if (check.value === null || check.limit === null || !check.direction || check.limit === 0) return null;
  const margin = check.direction === 'at-most' ? check.limit - check.value : check.value - check.limit;
  return margin / Math.abs(check.limit);
}

export function marginsSection(entries: ReadonlyArray<ComparedEntryView>, names: string[]): string {
  const order: string[] = [];
  const titles = new Map<string, string>();
  for (const e of entries) for (const c of e.checks ?? []) if (!titles.has(c.id)) (titles.set(c.id, c.title), order.push(c.id));
  if (order.length === 0) return '';
  const rows = order.map((id) => {
    const checks = entries.map((e) => (e.checks ?? []).find((c) => c.id === id));
    const hazard = checks.some((c) => c && isHazardCheck(c));
    const margins = checks.map((c) => (c && !hazard ? marginOf(c) : null));
    const marked = new Set(betterIndices(margins, hazard ? 'none' : 'higher'));
    const cells = checks.map((c, i) => {
      if (!c) return cell('not checked', 'num note');
      const verdict = `<span class="verdict verdict-${c.verdict === 'fail' ? 'fail' : c.verdict === 'warn' ? 'warn' : c.verdict === 'pass' ? 'pass' : 'info'}">${escapeHtml(verdictLabel(c))}</span>`;
      const margin = margins[i];
      const figures = checkFigures(c);
      const text = margin === null || margin === undefined ? `${figures.value}` : `${formatChange(margin)} of the limit`;
      return cell(`${verdict} ${text}<div class="note">${figures.value}, limit ${figures.limit}</div>`, `num${marked.has(i) ? ' better' : ''}`, `${margin === null || margin === undefined ? '' : ` data-si="${margin}"`}${marked.has(i) ? ' data-better="true"' : ''} data-verdict="${escapeHtml(c.verdict)}"`);
    });
    return `<tr data-margin="${escapeHtml(id)}"><td>${escapeHtml(titles.get(id))}<div class="note"><code>${escapeHtml(id)}</code></div></td><td class="note">${hazard ? 'hazard class' : 'more margin is better'}</td>${cells.join('')}</tr>`;
  });
  return `<section id="margins"><h2>Margins to the engineering limits</h2>
<p class="note">How far each shot stays inside each limit, as a fraction of the limit (negative: beyond it), with the check's verdict. A \u2713 marks the largest margin. The hazard classes describe the bank and are not compared.</p>
<div class="scroll"><table class="outputs"><thead><tr><th>Check</th><th>Better</th>${scenarioHeads(entries, names)}</tr></thead>
<tbody>${rows.join('\n')}</tbody></table></div>
</section>`;
}

export interface ComparedInputCell {
  present: boolean;
  written: Leaf | undefined;
  si: Leaf | undefined;
  /** computed from geometry (shown to four significant digits), not given */
  computed?: boolean;
}

export interface ComparedInputRow {
  path: string;
  unit: string;
  cells: ComparedInputCell[];
  /** the values the model used (SI to 12 significant figures; the written value where there is no SI one) are not all the same */
  differs: boolean;
}

/** Numbers to 12 significant figures, as the table shows them: 0.4 µH and 400 nH differ only by conversion noise. */
function comparisonKey(value: Leaf | undefined): string {
  return JSON.stringify(typeof value === 'number' ? Number(value.toPrecision(12)) : value);
}

/** One row per scenario path found in any entry, in order of first appearance. */
export function comparedInputRows(entries: ReadonlyArray<Pick<ComparedEntryView, 'scenarioRaw' | 'scenario'>>): ComparedInputRow[] {
  const perEntry = entries.map((e) => new Map(inputRows(e.scenarioRaw, e.scenario).map((row) => [row.path, { ...row, computed: row.written === undefined && unwrittenSource(row.path, e.scenario, e.scenarioRaw) === 'geometry' }])));
  const order: string[] = [];
  const seen = new Set<string>();
  for (const rows of perEntry) for (const path of rows.keys()) if (!seen.has(path)) (seen.add(path), order.push(path));
  return order.map((path) => {
    const found = perEntry.map((rows) => rows.get(path));
    const cells = found.map((row) => ({ present: row !== undefined, written: row?.written, si: row?.si, ...(row?.computed ? { computed: true } : {}) }));
    const keys = found.map((row) => (row === undefined ? '\u0000absent' : comparisonKey(row.si !== undefined ? row.si : row.written)));
    return { path, unit: found.find((row) => row)?.unit ?? '', cells, differs: new Set(keys).size > 1 };
  });
}

function leafText(value: Leaf | undefined): string {
  return typeof value === 'string' ? value : JSON.stringify(value);
}

function inputCells(c: ComparedInputCell, unit: string): string {
  if (!c.present) return '<td class="absent" colspan="2">not in this scenario</td>';
  const written = c.written === undefined ? '<td class="default">default</td>' : `<td class="path">${escapeHtml(leafText(c.written))}</td>`;
  return `${written}${usedCell(c.si, c.written, unit, '', c.computed ?? false)}`;
}

export function inputsSection(entries: ReadonlyArray<ComparedEntryView>, names: string[]): string {
  const rows = comparedInputRows(entries);
  const differing = rows.filter((r) => r.differs);
  const body = groupBySection(rows)
    .map(({ section, rows: grouped }) => {
      const head = `<tr class="section-head" data-section="${escapeHtml(section)}"><th colspan="${1 + 2 * entries.length}">${escapeHtml(sectionTitle(section, entries[0]!.scenario))}</th></tr>`;
      const lines = grouped.map(
        (r) => `<tr data-path="${escapeHtml(r.path)}"${r.differs ? ' class="differs" data-differs="true"' : ''}><td class="key">${r.differs ? '\u2260\u00A0' : ''}${escapeHtml(keyInSection(r.path, section))}</td>${r.cells.map((c) => inputCells(c, r.unit)).join('')}</tr>`,
      );
      return [head, ...lines].join('\n');
    })
    .join('\n');
  const sub = entries.map(() => '<th>As written</th><th class="num">Used (SI)</th>').join('');
  return `<section id="inputs"><h2>Inputs</h2>
<p id="differences-summary">${differing.length} of ${rows.length} inputs differ (highlighted, marked \u2260)${differing.length > 0 && differing.length <= 20 ? `: ${differing.map((r) => `<code>${escapeHtml(r.path)}</code>`).join(', ')}` : ''}.</p>
<p class="filter"><label><input type="checkbox" id="only-differences"> show only the inputs that differ</label></p>
<div class="scroll"><table class="inputs" id="inputs-table"><thead><tr><th rowspan="2">Key</th>${scenarioHeads(entries, names, 2)}</tr><tr>${sub}</tr></thead>
<tbody>${body}</tbody></table></div>
<p class="note">"default" where a file leaves a value out; a row differs when the values the model used differ (the same value written in other units does not count).</p>
</section>`;
}
