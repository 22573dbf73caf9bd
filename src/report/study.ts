/**
 * The study page (study.html): a self-contained page of a finished study (no network; data and plotly inlined, strict CSP).
 * One varied parameter: line plots of the figures against it. Two on a grid: heat maps. Otherwise (or for sampled
 * designs): a scatter matrix coloured by muzzle velocity. Failing points (an error, or no muzzle exit) are marked.
 * Large studies are thinned (src/study/studyPage.ts); the page says so.
 */
import { escapeHtml, jsonScriptElement } from './escape.js';
import { plotlyBundleSource, STUDY_PLOTLY_PACKAGE } from './plotly-bundle.js';
import { RECORD_CSP, RECORD_CSS } from './styles.js';

/** What the page says about the study (a study manifest has this shape). */
export interface StudyDescription {
  scenario: { file: string; name: string; sha256: string };
  vary: readonly { path: string; spec: string }[];
  design: { kind: string; seed: number };
  points: number;
}

export const STUDY_FIGURES = [
  { key: 'muzzleVelocity', label: 'muzzle velocity', unit: 'm/s', scale: 1 },
  { key: 'efficiency', label: 'efficiency', unit: '%', scale: 100 },
  { key: 'peakCurrent', label: 'peak current', unit: 'kA', scale: 1e-3 },
  { key: 'peakAcceleration', label: 'peak acceleration', unit: 'km/s²', scale: 1e-3 },
  { key: 'actionIntegral', label: 'action integral', unit: 'A²·s', scale: 1 },
] as const;

export interface StudyPlotData {
  paths: string[];
  /** [axis][point] SI values */
  axes: number[][];
  /** figure key → values (display units), null where the point failed */
  figures: Record<string, (number | null)[]>;
  failed: boolean[];
  reasons: string[];
  shown: number;
  total: number;
  failures: number;
}

// Runs in the page: draws the figures from the embedded data. Kept as plain ES2017 text.
const PAGE_SCRIPT = `
(function () {
  var data = JSON.parse(document.getElementById('study-data').textContent);
  var figures = JSON.parse(document.getElementById('study-figures').textContent);
  var mode = document.getElementById('study-data').getAttribute('data-mode');
  var root = document.getElementById('plots');
  function panel() { var div = document.createElement('div'); div.className = 'plot'; root.appendChild(div); return div; }
  function pick(values, keep) { return values.filter(function (_, i) { return keep(i); }); }
  var ok = function (i) { return !data.failed[i]; };
  var bad = function (i) { return data.failed[i]; };
  var config = { responsive: true, displaylogo: false };
  if (mode === 'line') {
    figures.forEach(function (f) {
      var x = data.axes[0], y = data.figures[f.key];
      Plotly.newPlot(panel(), [
        { x: pick(x, ok), y: pick(y, ok), mode: 'lines+markers', name: f.label },
        { x: pick(x, bad), y: pick(y, bad).map(function (v) { return v === null ? 0 : v; }), mode: 'markers', name: 'failed',
          marker: { symbol: 'x', color: '#c0392b', size: 9 }, text: pick(data.reasons, bad) }
      ], { title: { text: f.label + ' (' + f.unit + ')' }, xaxis: { title: { text: data.paths[0] + ' (SI)' } }, yaxis: { title: { text: f.unit } } }, config);
    });
  } else if (mode === 'heatmap') {
    var xs = Array.from(new Set(data.axes[1])).sort(function (a, b) { return a - b; });
    var ys = Array.from(new Set(data.axes[0])).sort(function (a, b) { return a - b; });
    figures.forEach(function (f) {
      var z = ys.map(function () { return xs.map(function () { return null; }); });
      var failX = [], failY = [];
      data.axes[0].forEach(function (yv, i) {
        var row = ys.indexOf(yv), col = xs.indexOf(data.axes[1][i]);
        z[row][col] = data.failed[i] ? null : data.figures[f.key][i];
        if (data.failed[i]) { failX.push(data.axes[1][i]); failY.push(yv); }
      });
      Plotly.newPlot(panel(), [
        { type: 'heatmap', x: xs, y: ys, z: z, colorbar: { title: { text: f.unit } } },
        { x: failX, y: failY, mode: 'markers', name: 'failed', marker: { symbol: 'x', color: '#c0392b', size: 9 } }
      ], { title: { text: f.label + ' (' + f.unit + ')' }, xaxis: { title: { text: data.paths[1] + ' (SI)' } }, yaxis: { title: { text: data.paths[0] + ' (SI)' } } }, config);
    });
  } else {
    var dims = data.paths.map(function (p, d) { return { label: p, values: data.axes[d] }; });
    figures.forEach(function (f) { dims.push({ label: f.label + ' (' + f.unit + ')', values: data.figures[f.key] }); });
    Plotly.newPlot(panel(), [{ type: 'splom', dimensions: dims, showupperhalf: false,
      marker: { size: 4, color: data.failed.map(function (b, i) { return b ? null : data.figures.muzzleVelocity[i]; }),
        colorscale: 'Viridis', showscale: true, colorbar: { title: { text: 'm/s' } },
        symbol: data.failed.map(function (b) { return b ? 'x' : 'circle'; }) } }],
      { title: { text: 'all points (failed: ×)' }, height: 900 }, config);
  }
})();
`;

export function plotMode(manifest: StudyDescription): 'line' | 'heatmap' | 'splom' {
  if (manifest.vary.length === 1) return 'line';
  if (manifest.vary.length === 2 && manifest.design.kind === 'grid') return 'heatmap';
  return 'splom';
}

export function buildStudyReport(manifest: StudyDescription, data: StudyPlotData): string {
  const mode = plotMode(manifest);
  const vary = manifest.vary.map((axis) => `<li><code>${escapeHtml(axis.path)}</code> = <code>${escapeHtml(axis.spec)}</code></li>`).join('');
  const thinned = data.shown < data.total ? `<p>Showing ${data.shown} of ${data.total} points (every ${Math.ceil(data.total / data.shown)}th by index); points.csv holds them all.</p>` : '';
  const figures = STUDY_FIGURES.map(({ key, label, unit }) => ({ key, label, unit }));
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${escapeHtml(RECORD_CSP)}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Study: ${escapeHtml(manifest.scenario.name)}</title>
<style>${RECORD_CSS}
.plot { min-height: 380px; margin: 1em 0; }</style>
</head>
<body>
<h1>Study: ${escapeHtml(manifest.scenario.name)}</h1>
<p>Scenario <code>${escapeHtml(manifest.scenario.file)}</code> (sha256 <code>${escapeHtml(manifest.scenario.sha256.slice(0, 16))}…</code>),
${escapeHtml(manifest.design.kind)} design, ${manifest.points} points${manifest.design.kind === 'grid' ? '' : `, seed ${manifest.design.seed}`}.
${data.failures} point${data.failures === 1 ? '' : 's'} failed (an error, or the armature did not leave the muzzle); they are marked ×.</p>
<ul>${vary}</ul>
${thinned}
<p class="caution">Simulated figures only. A charged capacitor bank can kill: follow your institution's safety rules, local codes and licensed practice before building or firing anything.</p>
<div id="plots"></div>
${jsonScriptElement('study-figures', figures)}
${jsonScriptElement('study-data', data).replace('<script ', `<script data-mode="${mode}" `)}
<script>${plotlyBundleSource(STUDY_PLOTLY_PACKAGE)}</script>
<script>${PAGE_SCRIPT}</script>
</body>
</html>
`;
}
