/**
 * The self-contained HTML comparison report of `railpulse compare`: several shots side by side. Safety banner
 * first, then each shot's status, the outputs (better marked only where it is defined), the margins to the limits,
 * the waveforms overlaid, the inputs by section with the differences highlighted, and the full safety procedures.
 * Pure string building (the plotly bundle is read from node_modules); same input → same bytes.
 */
import { statusOf } from '../checks/assess.js';
import { bankHazard } from '../checks/hazard.js';
import { statusSentence } from '../output/verdicts.js';
import type { Scenario } from '../scenario/types.js';
import type { Shot } from '../solve/types.js';
import { formatExact, NO_VALUE } from '../units/format.js';
import { comparisonFigures, legendNames } from './compare-plots.js';
import { inputsSection, marginsSection, outputsSection } from './compare-tables.js';
import type { DecimateOptions } from './decimate.js';
import type { ReportCheck } from './embedded.js';
import { escapeHtml, jsonScriptElement } from './escape.js';
import { PLOTLY_PACKAGE, plotlyBundleSource } from './plotly-bundle.js';
import type { PlotFigure } from './plots.js';
import { safetyBanner, safetyProcedures, type BankOnPage } from './safety.js';
import { DATE_SCRIPT, dateHtml, pageStart } from './styles.js';
import { reportBaseName } from '../output/write.js';

export {
  betterIndices,
  comparedInputRows,
  COMPARED_OUTPUTS,
  marginOf,
  TIE_TOLERANCE,
  type BetterDirection,
  type ComparedInputCell,
  type ComparedInputRow,
  type ComparedOutput,
} from './compare-tables.js';

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
  /** the shot's engineering checks (src/checks/assess.ts) */
  checks?: ReportCheck[];
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
.difference{font-weight:400}
.swatch{display:inline-block;width:.9em;height:.9em;border-radius:2px;vertical-align:-1px;margin-right:5px}
table.inputs td.absent{color:#999;font-style:italic}
table.inputs.only-differences tbody tr:not(.differs){display:none}
.filter input[type=checkbox]{min-width:0;margin:0 6px 0 0}
`;

function entryStatus(e: ComparisonEntry) {
  return statusOf(e.checks ?? [], [...new Set(e.warnings ?? [])]);
}

/** Each shot's status (the worst of its checks and warnings), what it rests on, and its warnings. */
function statusSection(entries: ReadonlyArray<ComparisonEntry>, names: string[]): string {
  const statuses = entries.map(entryStatus);
  const worst = statuses.some((s) => s.verdict === 'fail') ? 'fail' : statuses.some((s) => s.verdict === 'warn') ? 'warn' : 'pass';
  const items = entries
    .map((e, i) => {
      const status = statuses[i]!;
      const warnings = [...new Set(e.warnings ?? [])].map((w) => `<li>${escapeHtml(w)}</li>`).join('');
      return `<li data-entry="${i}" data-status="${status.verdict}"><span class="badge verdict-${status.verdict}">${status.verdict.toUpperCase()}</span><b>${escapeHtml(names[i])}:</b> ${escapeHtml(statusSentence(status))}${warnings ? `<ul class="entry-warnings">${warnings}</ul>` : ''}</li>`;
    })
    .join('\n');
  const warningCount = entries.reduce((n, e) => n + new Set(e.warnings ?? []).size, 0);
  return `<section id="status" class="status status-${worst}" data-status="${worst}" data-warnings="${warningCount}" role="${worst === 'pass' ? 'status' : 'alert'}">
<h2><span class="badge">${worst.toUpperCase()}</span>status of each shot: the worst of its engineering checks and its warnings</h2>
<ul>\n${items}\n</ul>
</section>`;
}

function plotsSection(figures: PlotFigure[], unsampled: string[]): string {
  const note = unsampled.length ? `<p class="note">No waveforms were sampled for ${unsampled.map(escapeHtml).join(', ')}; only the energy budget shows them.</p>` : '';
  const blocks = figures.map((f) => `<div class="plot-block"><h3>${escapeHtml(f.title)}</h3><p class="caption">${escapeHtml(f.caption)}</p><div class="plot" id="${f.id}" data-plot></div></div>`).join('\n');
  return `<section id="plots"><h2>Waveforms and energy</h2>${note}\n${blocks}\n</section>`;
}

function provenanceSection(entries: ReadonlyArray<ComparisonEntry>, names: string[], provenance: ComparisonProvenance): string {
  const rows = entries
    .map((e, i) => `<tr><td>${escapeHtml(names[i])}</td><td class="path">${escapeHtml(e.file)}</td><td class="path">${escapeHtml(e.sha256 ?? NO_VALUE)}</td><td class="num">${formatExact(e.shot.stats.relTol, '')}</td><td class="num">${e.shot.stats.steps}</td><td class="num">${e.shot.stats.rhsEvaluations}</td></tr>`)
    .join('');
  return `<section id="provenance"><h2>Provenance</h2>
<dl class="provenance"><dt>Generated</dt><dd>${dateHtml(provenance.date)}</dd><dt>Tool</dt><dd>railpulse ${escapeHtml(provenance.toolVersion)}</dd><dt>Node.js</dt><dd>${escapeHtml(provenance.nodeVersion)}</dd><dt>Plots drawn with</dt><dd>${PLOTLY_PACKAGE} (inlined)</dd></dl>
<table><thead><tr><th>Scenario</th><th>File</th><th>SHA-256</th><th class="num">Rel. tolerance</th><th class="num">Steps</th><th class="num">RHS evaluations</th></tr></thead><tbody>${rows}</tbody></table>
</section>`;
}

/** Draw every figure and mark the body when all are drawn; wire the "only differences" filter. */
const PAGE_SCRIPT = `${DATE_SCRIPT}
(function () {
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
  const banks: BankOnPage[] = entries.map((e, i) => ({ hazard: bankHazard(e.scenario.bank, e.scenario.limits), groups: e.scenario.bank, name: names[i]! }));
  const embedded = {
    format: COMPARISON_FORMAT,
    formatVersion: 1,
    provenance: { toolVersion: provenance.toolVersion, nodeVersion: provenance.nodeVersion, date: provenance.date },
    scenarios: entries.map((e, i) => ({
      file: e.file,
      name: e.scenario.name,
      sha256: e.sha256 ?? null,
      scenarioRaw: e.scenarioRaw,
      results: e.shot.results,
      warnings: e.warnings ?? [],
      checks: e.checks ?? [],
      status: entryStatus(e),
      hazard: banks[i]!.hazard,
    })),
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
<div class="meta"><span><b>Date</b> ${dateHtml(provenance.date)}</span><span><b>Tool</b> railpulse ${escapeHtml(provenance.toolVersion)}</span><span><b>Baseline</b> ${escapeHtml(names[0])}</span></div>
</header>
${safetyBanner(banks, entries.length > 1 ? 'the banks of these shots' : 'this bank')}
${statusSection(entries, names)}
${outputsSection(entries, names)}
${marginsSection(entries, names)}
${plotsSection(figures, unsampled)}
${inputsSection(entries, names)}
${provenanceSection(entries, names, provenance)}
${safetyProcedures(banks)}
<footer>Comparison produced by railpulse ${escapeHtml(provenance.toolVersion)}; the scenarios and results are embedded in this file. Model results, not measurements. Plots by plotly.js (MIT licence), inlined.</footer>
</main>
${jsonScriptElement(COMPARISON_PLOTS_ID, figures.map((f) => ({ id: f.id, data: f.data, layout: f.layout })))}
<script>${plotlyBundleSource()}</script>
<script>${PAGE_SCRIPT}</script>
</body>
</html>
`;
}
