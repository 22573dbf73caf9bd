/**
 * The self-contained HTML comparison report of `railpulse compare`: several shots side by side, with the
 * waveforms overlaid, the inputs that differ highlighted and the better value of each output marked. Pure
 * string building (the plotly bundle is read from node_modules); same input → same bytes.
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot, ShotResults } from '../solve/types.js';
import { comparisonFigures, legendNames, scenarioColour } from './compare-plots.js';
import type { DecimateOptions } from './decimate.js';
import { escapeHtml, jsonScriptElement } from './escape.js';
import { formatPercent, formatQuantity, formatScientific, NO_VALUE } from './format.js';
import { inputRows, type Leaf } from './inputs.js';
import { PLOTLY_PACKAGE, plotlyBundleSource } from './plotly-bundle.js';
import type { PlotFigure } from './plots.js';
import { bankEnergies } from './safety.js';
import { pageStart } from './styles.js';
import { reportBaseName } from '../output/write.js';

export interface ComparisonEntry {
  /** the scenario file as the user named it */
  file: string;
  /** the scenario JSON as written */
  scenarioRaw: unknown;
  /** the same scenario in SI, defaults filled in */
  scenario: Scenario;
  shot: Shot;
  sha256?: string;
  /** the shot's warnings (src/checks/warnings.ts) */
  warnings?: string[];
}

export interface ComparisonProvenance {
  toolVersion: string;
  nodeVersion: string;
  /** ISO 8601; under SOURCE_DATE_EPOCH the caller passes a fixed date */
  date: string;
  decimate?: DecimateOptions;
}

export const COMPARISON_FORMAT = 'railpulse-comparison-report';
export const COMPARISON_ELEMENT_ID = 'railpulse-comparison';
export const COMPARISON_PLOTS_ID = 'railpulse-compare-plots';

export type BetterDirection = 'higher' | 'lower' | 'none';

export interface ComparedOutput {
  key: string;
  label: string;
  better: BetterDirection;
  /** only shots that left the muzzle compete (a stalled armature's speed is no muzzle velocity) */
  exitOnly: boolean;
  value: (results: ShotResults) => number | null;
  format: (value: number) => string;
}

const maxReversal = (results: ShotResults): number => results.modules.reduce((max, m) => Math.max(max, m.reversal), 0);

export const COMPARED_OUTPUTS: readonly ComparedOutput[] = [
  { key: 'muzzleVelocity', label: 'Muzzle velocity', better: 'higher', exitOnly: true, value: (r) => r.muzzleVelocity, format: (v) => formatQuantity(v, 'm/s', { prefix: false }) },
  { key: 'efficiency', label: 'Efficiency (kinetic / stored)', better: 'higher', exitOnly: true, value: (r) => r.efficiency, format: (v) => formatPercent(v) },
  { key: 'exitTime', label: 'Exit time', better: 'none', exitOnly: true, value: (r) => r.exitTime, format: (v) => formatQuantity(v, 's') },
  { key: 'peakCurrent', label: 'Peak current', better: 'lower', exitOnly: false, value: (r) => r.peakCurrent, format: (v) => formatQuantity(v, 'A') },
  { key: 'peakAcceleration', label: 'Peak acceleration', better: 'lower', exitOnly: false, value: (r) => r.peakAcceleration, format: (v) => formatScientific(v, 'm/s\u00B2') },
  { key: 'actionIntegral', label: 'Action integral \u222BI\u00B2dt', better: 'lower', exitOnly: false, value: (r) => r.actionIntegral, format: (v) => formatScientific(v, 'A\u00B2\u00B7s') },
  { key: 'arcEnergy', label: 'Energy the muzzle arc must absorb (\u00BDL(x)I\u00B2, feed and rails)', better: 'lower', exitOnly: true, value: (r) => r.energy.magneticRails, format: (v) => formatQuantity(v, 'J') },
  { key: 'maxReversal', label: 'Largest capacitor voltage reversal', better: 'lower', exitOnly: false, value: maxReversal, format: (v) => formatPercent(v) },
];

const DIRECTION_TEXT: Record<BetterDirection, string> = {
  higher: 'higher is better',
  lower: 'lower is better',
  none: 'no better direction (for reference)',
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

export interface ComparedInputCell {
  present: boolean;
  written: Leaf | undefined;
  si: Leaf | undefined;
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
export function comparedInputRows(entries: ReadonlyArray<Pick<ComparisonEntry, 'scenarioRaw' | 'scenario'>>): ComparedInputRow[] {
  const perEntry = entries.map((e) => new Map(inputRows(e.scenarioRaw, e.scenario).map((row) => [row.path, row])));
  const order: string[] = [];
  const seen = new Set<string>();
  for (const rows of perEntry) for (const path of rows.keys()) if (!seen.has(path)) (seen.add(path), order.push(path));
  return order.map((path) => {
    const found = perEntry.map((rows) => rows.get(path));
    const cells = found.map((row) => ({ present: row !== undefined, written: row?.written, si: row?.si }));
    const keys = found.map((row) => (row === undefined ? '\u0000absent' : comparisonKey(row.si !== undefined ? row.si : row.written)));
    return { path, unit: found.find((row) => row)?.unit ?? '', cells, differs: new Set(keys).size > 1 };
  });
}

/** e.g. "2026-12-02_compare_bay-2-vs-bay-2-heavy_1a2b3c4d" from the date, the scenario names and a short hash. */
export function comparisonBaseName(date: string | Date, names: string[], shortHash: string): string {
  const [day, slug, hash] = reportBaseName(date, names.join(' vs '), shortHash).split('_');
  return `${day}_compare_${slug}_${hash}`;
}

const COMPARE_CSS = `
tr.differs td{background:#fff1c2}
tr.differs td:first-child{font-weight:700;box-shadow:inset 4px 0 0 #b8430e}
td.better{background:#e6f3e6;font-weight:700}
td.better:after{content:" \\2713";color:#1d5e20}
td.not-eligible{color:#777}
.swatch{display:inline-block;width:.9em;height:.9em;border-radius:2px;vertical-align:-1px;margin-right:5px}
table.inputs td.absent{color:#999;font-style:italic}
table.inputs.only-differences tbody tr:not(.differs){display:none}
.filter input[type=checkbox]{min-width:0;margin:0 6px 0 0}
`;

function cell(text: string, cls = '', attrs = ''): string {
  return `<td${cls ? ` class="${cls}"` : ''}${attrs}>${text}</td>`;
}

function scenarioHeads(entries: ReadonlyArray<ComparisonEntry>, names: string[], colspan = 1): string {
  return entries
    .map((e, i) => `<th class="num"${colspan > 1 ? ` colspan="${colspan}"` : ''} data-entry="${i}"><span class="swatch" style="background:${scenarioColour(i)}"></span>${escapeHtml(names[i])}<div class="note"><code>${escapeHtml(e.file)}</code></div></th>`)
    .join('');
}

function outputsSection(entries: ReadonlyArray<ComparisonEntry>, names: string[]): string {
  const outcomeRow = `<tr data-output="outcome"><td>Outcome</td><td class="note"></td>${entries.map((e) => cell(escapeHtml(e.shot.results.outcome), 'num')).join('')}</tr>`;
  const storedRow = `<tr data-output="storedEnergy"><td>Stored energy E0</td><td class="note">${DIRECTION_TEXT.none}</td>${entries.map((e) => cell(formatQuantity(e.shot.results.energy.initial, 'J'), 'num', ` data-si="${e.shot.results.energy.initial}"`)).join('')}</tr>`;
  const rows = COMPARED_OUTPUTS.map((output) => {
    const values = entries.map((e) => output.value(e.shot.results));
    const eligible = entries.map((e, i) => (output.exitOnly && e.shot.results.outcome !== 'exited' ? null : values[i]!));
    const marked = new Set(betterIndices(eligible, output.better));
    const cells = values.map((v, i) => {
      const text = v === null ? NO_VALUE : output.format(v);
      const excluded = eligible[i] === null && v !== null;
      const cls = ['num', marked.has(i) ? 'better' : '', excluded ? 'not-eligible' : ''].filter(Boolean).join(' ');
      return cell(excluded ? `${text} <span class="note">(no exit)</span>` : text, cls, `${v === null ? '' : ` data-si="${v}"`}${marked.has(i) ? ' data-better="true"' : ''}`);
    });
    return `<tr data-output="${output.key}" data-direction="${output.better}"><td>${escapeHtml(output.label)}</td><td class="note">${DIRECTION_TEXT[output.better]}</td>${cells.join('')}</tr>`;
  }).join('\n');
  return `<section id="outputs"><h2>Outputs</h2>
<p class="note">The better value of each row is marked \u2713. Muzzle velocity, efficiency, exit time and muzzle-arc energy are compared only between shots that left the muzzle; values within 0.1\u00A0% of the best tie and are all marked, and nothing is marked when every shot ties. The arc energy is the feed-and-rails share of the magnetic energy at exit, a lower bound on what the muzzle arc takes.</p>
<div class="scroll"><table class="outputs"><thead><tr><th>Figure</th><th>Better</th>${scenarioHeads(entries, names)}</tr></thead>
<tbody>${outcomeRow}\n${storedRow}\n${rows}</tbody></table></div>
</section>`;
}

function leafText(value: Leaf | undefined): string {
  return typeof value === 'string' ? value : JSON.stringify(value);
}

function inputCells(c: ComparedInputCell, unit: string): string {
  if (!c.present) return '<td class="absent" colspan="2">not in this scenario</td>';
  const written = c.written === undefined ? '<td class="default">default</td>' : `<td class="path">${escapeHtml(leafText(c.written))}</td>`;
  let si: string;
  if (c.si === undefined) si = `<td class="num">${NO_VALUE}</td>`;
  else if (typeof c.si === 'number') si = `<td class="num path">${escapeHtml(String(Number(c.si.toPrecision(12))))}${unit ? '\u00A0' + escapeHtml(unit) : ''}</td>`;
  else si = `<td>${escapeHtml(c.si === null ? 'none' : leafText(c.si))}</td>`;
  return written + si;
}

function inputsSection(entries: ReadonlyArray<ComparisonEntry>, names: string[]): string {
  const rows = comparedInputRows(entries);
  const differing = rows.filter((r) => r.differs);
  const body = rows
    .map((r) => `<tr data-path="${escapeHtml(r.path)}"${r.differs ? ' class="differs" data-differs="true"' : ''}><td class="path">${r.differs ? '\u2260\u00A0' : ''}${escapeHtml(r.path)}</td>${r.cells.map((c) => inputCells(c, r.unit)).join('')}</tr>`)
    .join('\n');
  const sub = entries.map(() => '<th>As written</th><th class="num">SI value used</th>').join('');
  return `<section id="inputs"><h2>Inputs</h2>
<p id="differences-summary">${differing.length} of ${rows.length} inputs differ (highlighted, marked \u2260)${differing.length > 0 && differing.length <= 20 ? `: ${differing.map((r) => `<code>${escapeHtml(r.path)}</code>`).join(', ')}` : ''}.</p>
<p class="filter"><label><input type="checkbox" id="only-differences"> show only the inputs that differ</label></p>
<div class="scroll"><table class="inputs" id="inputs-table"><thead><tr><th rowspan="2">Path</th>${scenarioHeads(entries, names, 2)}</tr><tr>${sub}</tr></thead>
<tbody>${body}</tbody></table></div>
<p class="note">"default" where a file leaves a value out; a row differs when the values the model used differ (the same value written in other units does not count).</p>
</section>`;
}

function warningsSection(entries: ReadonlyArray<ComparisonEntry>, names: string[]): string {
  const items = entries.flatMap((e, i) => [...new Set(e.warnings ?? [])].map((w) => `<li><b>${escapeHtml(names[i])}:</b> ${escapeHtml(w)}</li>`));
  if (items.length === 0) return '<section id="warnings" class="no-warnings" data-warnings="0">No warnings in any of the shots.</section>';
  return `<section id="warnings" class="warnings" role="alert" data-warnings="${items.length}"><h2>Warnings (${items.length})</h2><ul>\n${items.join('\n')}\n</ul></section>`;
}

function safetySection(entries: ReadonlyArray<ComparisonEntry>, names: string[]): string {
  const rows = entries
    .map((e, i) => {
      const groups = bankEnergies(e.scenario);
      const total = groups.reduce((sum, g) => sum + g.energy, 0);
      const volts = groups.reduce((max, g) => Math.max(max, g.voltage), 0);
      return `<tr><td>${escapeHtml(names[i])}</td><td class="num">${formatQuantity(total, 'J')}</td><td class="num">${formatQuantity(volts, 'V')}</td></tr>`;
    })
    .join('');
  return `<section class="safety" id="safety"><h2>Safety: these banks store lethal energy</h2>
<p class="lead"><strong>A charged capacitor bank can kill.</strong> Stored energy (\u03A3 \u00BD\u00B7n\u00B7C\u00B7V0\u00B2) and highest charge voltage of each configuration:</p>
<table><thead><tr><th>Scenario</th><th class="num">Stored energy</th><th class="num">Highest V0</th></tr></thead><tbody>${rows}</tbody></table>
<p>Discharge, short and ground every capacitor before anyone touches the bank, feed, rails or armature; use interlocks, a fail-safe dump and a cleared line of fire. <strong>These figures come from a model and are not a licence to build, charge or fire anything:</strong> follow local electrical codes, your institution's high-voltage safety rules and licensed practice.</p>
</section>`;
}

function plotsSection(figures: PlotFigure[], unsampled: string[]): string {
  const note = unsampled.length ? `<p class="note">No waveforms were sampled for ${unsampled.map(escapeHtml).join(', ')}; only the energy budget shows them.</p>` : '';
  const blocks = figures.map((f) => `<div class="plot-block"><h3>${escapeHtml(f.title)}</h3><p class="caption">${escapeHtml(f.caption)}</p><div class="plot" id="${f.id}" data-plot></div></div>`).join('\n');
  return `<section id="plots"><h2>Waveforms and energy</h2>${note}\n${blocks}\n</section>`;
}

function provenanceSection(entries: ReadonlyArray<ComparisonEntry>, names: string[], provenance: ComparisonProvenance): string {
  const rows = entries
    .map((e, i) => `<tr><td>${escapeHtml(names[i])}</td><td class="path">${escapeHtml(e.file)}</td><td class="path">${escapeHtml(e.sha256 ?? NO_VALUE)}</td><td class="num">${escapeHtml(String(e.shot.stats.relTol))}</td><td class="num">${e.shot.stats.steps}</td><td class="num">${e.shot.stats.rhsEvaluations}</td></tr>`)
    .join('');
  return `<section id="provenance"><h2>Provenance</h2>
<dl class="provenance"><dt>Generated</dt><dd>${escapeHtml(provenance.date)}</dd><dt>Tool</dt><dd>railpulse ${escapeHtml(provenance.toolVersion)}</dd><dt>Node.js</dt><dd>${escapeHtml(provenance.nodeVersion)}</dd><dt>Plots drawn with</dt><dd>${PLOTLY_PACKAGE} (inlined)</dd></dl>
<table><thead><tr><th>Scenario</th><th>File</th><th>SHA-256</th><th class="num">Rel. tolerance</th><th class="num">Steps</th><th class="num">RHS evaluations</th></tr></thead><tbody>${rows}</tbody></table>
</section>`;
}

/** Draw every figure and mark the body when all are drawn; wire the "only differences" filter. */
const PAGE_SCRIPT = `(function () {
  var figures = JSON.parse(document.getElementById('${COMPARISON_PLOTS_ID}').textContent);
  var config = { displaylogo: false, responsive: true, modeBarButtonsToRemove: ['select2d', 'lasso2d'], toImageButtonOptions: { format: 'png', scale: 2 } };
  var drawn = figures.map(function (f) { return Plotly.newPlot(f.id, f.data, f.layout, config); });
  Promise.all(drawn).then(function () { document.body.setAttribute('data-plots', 'rendered'); },
    function (error) { document.body.setAttribute('data-plots', 'failed'); console.error(error); });
  function resizeAll() { figures.forEach(function (f) { Plotly.Plots.resize(document.getElementById(f.id)); }); }
  window.addEventListener('beforeprint', resizeAll);
  window.addEventListener('afterprint', resizeAll);
  var only = document.getElementById('only-differences');
  only.addEventListener('change', function () { document.getElementById('inputs-table').classList.toggle('only-differences', only.checked); });
})();`;

export function buildComparisonReport(entries: ReadonlyArray<ComparisonEntry>, provenance: ComparisonProvenance): string {
  if (entries.length === 0) throw new RangeError('a comparison needs at least one shot');
  const names = legendNames(entries);
  const figures = comparisonFigures(entries, provenance.decimate);
  const embedded = {
    format: COMPARISON_FORMAT,
    formatVersion: 1,
    provenance: { toolVersion: provenance.toolVersion, nodeVersion: provenance.nodeVersion, date: provenance.date },
    scenarios: entries.map((e) => ({ file: e.file, name: e.scenario.name, sha256: e.sha256 ?? null, scenarioRaw: e.scenarioRaw, results: e.shot.results, warnings: e.warnings ?? [] })),
  };
  const title = entries.map((e) => e.scenario.name).join(' vs ');
  const unsampled = entries.flatMap((e, i) => (e.shot.waveforms && e.shot.waveforms.t.length > 0 ? [] : [names[i]!]));
  return `${pageStart(`${title} \u2014 railpulse comparison`, { generator: `railpulse ${provenance.toolVersion}`, css: COMPARE_CSS })}
${jsonScriptElement(COMPARISON_ELEMENT_ID, embedded)}
</head>
<body data-plots="pending">
<main${entries.length > 2 ? ' class="wide"' : ''}>
<header>
<p class="kicker">railpulse \u00B7 comparison of ${entries.length} shots (simulation)</p>
<h1 id="comparison-title">${escapeHtml(title)}</h1>
<div class="meta"><span><b>Date</b> <span data-date>${escapeHtml(provenance.date)}</span></span><span><b>Tool</b> railpulse ${escapeHtml(provenance.toolVersion)}</span><span><b>Baseline</b> ${escapeHtml(names[0])}</span></div>
</header>
${warningsSection(entries, names)}
${outputsSection(entries, names)}
${plotsSection(figures, unsampled)}
${inputsSection(entries, names)}
${safetySection(entries, names)}
${provenanceSection(entries, names, provenance)}
<footer>Comparison produced by railpulse ${escapeHtml(provenance.toolVersion)}; the scenarios and results are embedded in this file. Model results, not measurements. Plots by plotly.js (MIT licence), inlined.</footer>
</main>
${jsonScriptElement(COMPARISON_PLOTS_ID, figures.map((f) => ({ id: f.id, data: f.data, layout: f.layout })))}
<script>${plotlyBundleSource()}</script>
<script>${PAGE_SCRIPT}</script>
</body>
</html>
`;
}
