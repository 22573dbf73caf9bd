/**
 * The study page (study.html): a self-contained page of a finished study in the style of the shot records (no
 * network; data and plotly inlined, strict CSP). Safety banner first, then what was varied, how the points came out
 * (exited, stalled, timed out, error) and their status from the checks, the figures (lines against one varied
 * parameter, heat maps for two on a grid, one panel a parameter otherwise), the points that fail a check, and the
 * full safety procedures. Large studies are thinned (src/study/studyPage.ts); the page says so.
 */
import { dimensionOfPath } from '../scenario/fields.js';
import { formatCount, formatQuantity } from '../units/format.js';
import { escapeHtml, jsonScriptElement } from './escape.js';
import { plotlyBundleSource, STUDY_PLOTLY_PACKAGE } from './plotly-bundle.js';
import { safetyBanner, safetyProcedures, type BankOnPage } from './safety.js';
import { OUTCOME_STYLE, STUDY_FIGURES, studyFigures, type StudyPlotData, type StudyPlotMode } from './study-plots.js';
import { DATE_SCRIPT, dateHtml, pageStart } from './styles.js';
import type { BankHazard } from '../checks/hazard.js';

export { STUDY_FIGURES, type PointOutcome, type StudyPlotData } from './study-plots.js';

/** What the page says about the study (a study manifest has this shape). */
export interface StudyDescription {
  scenario: { file: string; name: string; sha256: string };
  vary: readonly { path: string; spec: string }[];
  design: { kind: string; seed: number };
  points: number;
  created?: string;
  /** the bank at the design's extremes (an upper bound on any point's) */
  safety?: BankHazard;
}

export function plotMode(manifest: Pick<StudyDescription, 'vary' | 'design'>): StudyPlotMode {
  if (manifest.vary.length === 1) return 'line';
  if (manifest.vary.length === 2 && manifest.design.kind === 'grid') return 'heatmap';
  return 'matrix';
}

const PAGE_SCRIPT = `${DATE_SCRIPT}
(function () {
  var figures = JSON.parse(document.getElementById('study-figures').textContent);
  var config = { displaylogo: false, responsive: true, modeBarButtonsToRemove: ['select2d', 'lasso2d'], toImageButtonOptions: { format: 'png', scale: 2 } };
  var drawn = figures.map(function (f) { return Plotly.newPlot(f.id, f.data, f.layout, config); });
  Promise.all(drawn).then(function () { document.body.setAttribute('data-plots', 'rendered'); },
    function (error) { document.body.setAttribute('data-plots', 'failed'); console.error(error); });
})();`;

const STUDY_CSS = `
.outcomes{display:flex;flex-wrap:wrap;gap:4px 18px;margin:8px 0}
.outcomes span{white-space:nowrap}
.mark{display:inline-block;width:1.1em;text-align:center;font-weight:700}
`;

function bankOnStudy(manifest: StudyDescription, data: StudyPlotData): BankOnPage[] {
  if (manifest.safety) return [{ hazard: manifest.safety }];
  if (data.storedEnergy) return [{ hazard: { storedEnergy: data.storedEnergy.max, maxChargeVoltage: 0, classes: [] } }];
  return [];
}

function varyList(manifest: StudyDescription): string {
  return manifest.vary
    .map((axis) => {
      const unit = dimensionOfPath(axis.path);
      return `<li><code>${escapeHtml(axis.path)}</code> = <code>${escapeHtml(axis.spec)}</code>${unit ? ` <span class="note">\u2014 ${escapeHtml(unit.noun)}</span>` : ''}</li>`;
    })
    .join('');
}

const MARKS: Record<keyof StudyPlotData['outcomes'], string> = { exited: '\u25CF', stalled: '\u00D7', timeout: '\u25B3', error: '\u25A1' };

function outcomesSection(data: StudyPlotData): string {
  const outcomes = (Object.keys(data.outcomes) as (keyof StudyPlotData['outcomes'])[])
    .map((o) => `<span data-outcome="${o}" data-count="${data.outcomes[o]}"><span class="mark" style="color:${OUTCOME_STYLE[o].colour}">${MARKS[o]}</span> ${escapeHtml(OUTCOME_STYLE[o].name)}: ${data.outcomes[o]}</span>`)
    .join('');
  const verdict = data.verdicts.fail > 0 ? 'fail' : data.verdicts.warn > 0 ? 'warn' : 'pass';
  return `<section id="status" class="status status-${verdict}" data-status="${verdict}">
<h2><span class="badge">${verdict.toUpperCase()}</span>${formatCount(data.verdicts.fail, 'point fails', 'points fail')} a check, ${formatCount(data.verdicts.warn, 'point warns', 'points warn')}, ${formatCount(data.verdicts.pass, 'point passes', 'points pass')}</h2>
<p class="note">Each point's status is the worst of its engineering checks and its warnings (from the same assessment as a shot record; one column a check in points.csv). Points that fail a check are ringed in red (<span class="mark" style="color:#c0392b">\u25EF</span>) on every plot.</p>
<div class="outcomes" id="outcomes">${outcomes}</div>
</section>`;
}

function failingTable(data: StudyPlotData): string {
  const rows = data.index.flatMap((index, i) => (data.verdict[i] === 'fail' ? [i] : []));
  if (rows.length === 0) return '<section id="failing"><h2>Points that fail a check</h2><p>None of the points shown fails a check.</p></section>';
  const shown = rows.slice(0, 100);
  const head = data.paths.map((p) => `<th class="num">${escapeHtml(p)}</th>`).join('');
  const body = shown
    .map((i) => {
      const values = data.paths.map((p, d) => `<td class="num">${formatQuantity(data.axes[d]![i]!, dimensionOfPath(p)?.display ?? '')}</td>`).join('');
      return `<tr data-point="${data.index[i]}" data-verdict="fail"><td class="num">${data.index[i]}</td>${values}<td>${escapeHtml(OUTCOME_STYLE[data.outcome[i]!].name)}</td><td><span class="verdict verdict-fail">fail</span> ${data.failing[i]!.map((id) => `<code>${escapeHtml(id)}</code>`).join(', ')}</td></tr>`;
    })
    .join('\n');
  return `<section id="failing"><h2>Points that fail a check (${rows.length}${rows.length > shown.length ? `, first ${shown.length} listed` : ''})</h2>
<div class="scroll"><table><thead><tr><th class="num">Point</th>${head}<th>Outcome</th><th>Fails</th></tr></thead><tbody>${body}</tbody></table></div></section>`;
}

export function buildStudyReport(manifest: StudyDescription, data: StudyPlotData): string {
  const mode = plotMode(manifest);
  const figures = studyFigures(data, manifest.vary, mode, manifest.design.kind === 'grid');
  const thinned = data.shown < data.total ? `<p class="note">Showing ${data.shown} of ${data.total} points (every ${Math.ceil(data.total / data.shown)}th by index); points.csv holds them all.</p>` : '';
  const blocks = figures.map((f) => `<div class="plot-block"><h3>${escapeHtml(f.title)}</h3><p class="caption">${escapeHtml(f.caption)}</p><div class="plot" id="${f.id}" data-plot></div></div>`).join('\n');
  const stored = data.storedEnergy ? `<span><b>Stored energy</b> ${formatQuantity(data.storedEnergy.min, 'J')} to ${formatQuantity(data.storedEnergy.max, 'J')}</span>` : '';
  return `${pageStart(`Study: ${manifest.scenario.name} \u2014 railpulse`, { css: STUDY_CSS })}
</head>
<body data-plots="pending" data-mode="${mode}">
<main>
<header>
<p class="kicker">railpulse \u00B7 design study (simulation)</p>
<h1 id="study-title">Study: ${escapeHtml(manifest.scenario.name)}</h1>
<div class="meta"><span><b>Scenario</b> <code>${escapeHtml(manifest.scenario.file)}</code></span><span><b>SHA-256</b> <code>${escapeHtml(manifest.scenario.sha256.slice(0, 16))}</code></span>
<span><b>Design</b> ${escapeHtml(manifest.design.kind)}${manifest.design.kind === 'grid' ? '' : `, seed ${manifest.design.seed}`}, ${formatCount(manifest.points, 'point')}</span>${stored}
${manifest.created ? `<span><b>Started</b> ${dateHtml(manifest.created)}</span>` : ''}</div>
</header>
${safetyBanner(bankOnStudy(manifest, data), 'the points of this study')}
${outcomesSection(data)}
<section id="varied"><h2>Varied</h2><ul>${varyList(manifest)}</ul>${thinned}</section>
<section id="plots"><h2>Figures</h2>
<p class="note">Axes in display units; colour scales run one way (dark: low, yellow: high). Marks: \u25CF exited, \u00D7 stalled in the bore, \u25B3 timed out, \u25A1 error (no result; drawn along the bottom), red ring: fails a check.</p>
${blocks}
</section>
${failingTable(data)}
${safetyProcedures(bankOnStudy(manifest, data))}
<footer>Study page produced by railpulse from points.jsonl in this folder. Model results, not measurements. Plots by plotly.js (MIT licence), ${escapeHtml(STUDY_PLOTLY_PACKAGE)}, inlined.</footer>
</main>
${jsonScriptElement('study-figures', figures.map((f) => ({ id: f.id, data: f.data, layout: f.layout })))}
${jsonScriptElement('study-data', data)}
<script>${plotlyBundleSource(STUDY_PLOTLY_PACKAGE)}</script>
<script>${PAGE_SCRIPT}</script>
</body>
</html>
`;
}
