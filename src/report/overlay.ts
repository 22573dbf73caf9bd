/**
 * The measured-shot part of a shot report: the measurement against the model (plots in ./overlay-plots.ts),
 * the goodness-of-fit figures, which samples were compared (the rule at switching instants) and, for a
 * calibrated shot, the fitted parameters with their uncertainties and correlations and the samples the fit
 * down-weighted. Pure: the goodness of fit is computed by src/measure and passed in; nothing is re-derived.
 */
import { escapeHtml, jsonScriptElement } from './escape.js';
import { formatExact, formatNumber, formatPercent, formatQuantity, formatWithUncertainty, NO_VALUE } from '../units/format.js';
import type { PlotFigure } from './plots.js';
import { SIGNALS, type Comparison, type GoodnessOfFit, type Measurement, type OverlayFit, type OverlayInput, type SignalName } from './overlay-types.js';

export { overlayFigures } from './overlay-plots.js';
export type * from './overlay-types.js';

export const OVERLAY_ELEMENT_ID = 'railpulse-overlay';

function comparisonRow(key: string, label: string, c: Comparison | undefined, unit: string): string {
  if (!c) return '';
  const q = (v: number): string => formatQuantity(v, unit);
  return `<tr data-goodness="${key}" data-error="${c.error}"><td>${escapeHtml(label)}</td><td class="num">${q(c.model)}</td><td class="num">${q(c.measured)}</td><td class="num">${q(c.error)}</td><td class="num">${formatRelative(c.relativeError)}</td></tr>`;
}

function formatRelative(fraction: number): string {
  return formatPercent(fraction);
}

function goodnessTable(goodness: GoodnessOfFit): string {
  const signalRows = (Object.keys(SIGNALS) as SignalName[])
    .map((name) => {
      const s = goodness.signals[name];
      if (!s) return '';
      return `<tr data-goodness="rms.${name}" data-error="${s.rms}"><td>RMS error, ${escapeHtml(SIGNALS[name].label)} (${s.points} samples)</td><td class="num">${NO_VALUE}</td><td class="num">${NO_VALUE}</td><td class="num">${formatQuantity(s.rms, SIGNALS[name].unit)}</td><td class="num">${formatRelative(s.relativeRms)} of peak</td></tr>`;
    })
    .join('');
  const rows =
    signalRows +
    comparisonRow('peakCurrent', 'Peak current', goodness.peakCurrent, 'A') +
    comparisonRow('peakCurrentTime', 'Time of peak current', goodness.peakCurrentTime, 's') +
    comparisonRow('exitTime', 'Exit time', goodness.exitTime, 's') +
    comparisonRow('muzzleVelocity', 'Muzzle velocity', goodness.muzzleVelocity, 'm/s');
  const arrivals = goodness.arrivalTimeErrors
    ? `<p class="note" data-goodness="arrivalTimes">Probe arrival-time errors (model − measured): ${goodness.arrivalTimeErrors.map((e) => (e === null ? 'not reached' : formatQuantity(e, 's'))).join(', ')}.</p>`
    : '';
  if (!rows) return `<p class="note">Nothing measured to compare with.</p>${arrivals}`;
  return `<table class="goodness"><thead><tr><th>Goodness of fit</th><th class="num">Model</th><th class="num">Measured</th><th class="num">Error (model − measured)</th><th class="num">Relative</th></tr></thead><tbody>${rows}</tbody></table>${arrivals}`;
}

const short = (x: number): string => formatExact(x, '');

function columnsTable(measurement: Measurement): string {
  const rows = measurement.columns
    .map((c) => `<tr><td>${escapeHtml(c.header)}</td><td>${escapeHtml(c.role)}</td><td>${escapeHtml(c.unit)}</td><td class="num">${short(c.scale)}</td><td class="num">${short(c.offset)}</td></tr>`)
    .join('');
  return `<table><thead><tr><th>Column</th><th>Read as</th><th>Unit</th><th class="num">Scale</th><th class="num">Offset (column unit)</th></tr></thead><tbody>${rows}</tbody></table>`;
}

function fitTables(fit: OverlayFit): string {
  const names = Object.keys(fit.parameters);
  const rows = names
    .map((name) => {
      const p = fit.parameters[name]!;
      const fitted = Number.isFinite(p.uncertainty) ? formatWithUncertainty(p.value, p.uncertainty, p.unit) : `${formatQuantity(p.value, p.unit)} (on a bound)`;
      return `<tr data-parameter="${escapeHtml(name)}" data-value="${p.value}"><td class="path">${escapeHtml(name)}</td><td class="num">${fitted}</td><td class="num">${formatQuantity(p.initial, p.unit)}</td></tr>`;
    })
    .join('');
  const r = (a: string, b: string): number => (a === b ? 1 : fit.correlations[`${a}|${b}`] ?? fit.correlations[`${b}|${a}`] ?? NaN);
  const matrix =
    names.length > 1
      ? `<table class="correlations"><thead><tr><th>Correlation</th>${names.map((n) => `<th class="num">${escapeHtml(n)}</th>`).join('')}</tr></thead><tbody>${names
          .map((a) => `<tr><td class="path">${escapeHtml(a)}</td>${names.map((b) => `<td class="num">${Number.isFinite(r(a, b)) ? r(a, b).toFixed(3) : NO_VALUE}</td>`).join('')}</tr>`)
          .join('')}</tbody></table>`
      : '';
  const warnings = fit.warnings.length ? `<ul class="fit-warnings">${fit.warnings.map((w) => `<li>${escapeHtml(w)}</li>`).join('')}</ul>` : '';
  const decimated = fit.blockSize > 1 ? ` The record was decimated for the fit into means of ${fit.blockSize} samples, single samples kept next to every switching instant.` : '';
  return `<h3>Calibration</h3><p class="note">Bounded Levenberg–Marquardt on the measured signals, each residual divided by its noise and passed through Huber's loss (quadratic within ${fit.huberThreshold} noise units, linear beyond); samples closer than one sample interval to a switching instant of the model are left out, the set re-evaluated after each of the ${fit.outerIterations} run(s).${decimated} One standard uncertainty from the covariance of the linearised model at the optimum, (JᵀJ)⁻¹, scaled by √(χ²/ν) when the misfit exceeds the noise. ${fit.shots} shots, ${fit.iterations} iterations in the last run; χ²/ν = ${formatNumber(fit.residual.chiSquaredReduced)}.</p>
<table class="fitted"><thead><tr><th>Parameter</th><th class="num">Fitted value \u00B1 standard uncertainty (1σ)</th><th class="num">Initial</th></tr></thead><tbody>${rows}</tbody></table>${matrix}${warnings}${downWeightedTable(fit)}`;
}

/** Rows shown of the down-weighted list; the embedded data hold all of them. */
const SHOWN_DOWN_WEIGHTED = 100;

function downWeightedTable(fit: OverlayFit): string {
  const list = fit.downWeighted;
  if (list.length === 0) return `<p class="note" data-down-weighted="0">No sample lay beyond ${fit.huberThreshold} noise units at the optimum: every compared sample counted with full weight.</p>`;
  const rows = list
    .slice(0, SHOWN_DOWN_WEIGHTED)
    .map((d) => `<tr data-down-weighted-t="${d.t ?? ''}"><td>${escapeHtml(d.group)}</td><td class="num">${d.t === null ? NO_VALUE : formatQuantity(d.t, 's')}</td><td class="num">${formatNumber(d.residual)}</td><td class="num">${formatNumber(d.weight)}</td></tr>`)
    .join('');
  const more = list.length > SHOWN_DOWN_WEIGHTED ? `<p class="note">… and ${list.length - SHOWN_DOWN_WEIGHTED} more (all are in the embedded data).</p>` : '';
  return `<table class="down-weighted" data-down-weighted="${list.length}"><thead><tr><th>Down-weighted (Huber)</th><th class="num">Time</th><th class="num">Residual (σ)</th><th class="num">Weight</th></tr></thead><tbody>${rows}</tbody></table>${more}`;
}

/** Which samples were compared, and which were left out at switching instants. */
function samplesNote(goodness: GoodnessOfFit): string {
  const rule = goodness.samples;
  if (!rule) return '';
  const shown = rule.excluded.slice(0, 40).map((t) => formatQuantity(t, 's')).join(', ');
  const more = rule.excluded.length > 40 ? ` and ${rule.excluded.length - 40} more` : '';
  const left = rule.excluded.length > 0 ? `${rule.excluded.length} sample(s) lie closer than one sample interval (${formatQuantity(rule.interval, 's')}) to one of the model's ${rule.instants.length} switching instants and are not compared, as in the fit (at ${shown}${more}; marked ○ on the plots).` : `No sample lies closer than one sample interval (${formatQuantity(rule.interval, 's')}) to one of the model's ${rule.instants.length} switching instants.`;
  const outside = rule.outside > 0 ? ` ${rule.outside} sample(s) lie outside the model's span.` : '';
  return `<p class="note" data-excluded="${rule.excluded.length}">${left}${outside}</p>`;
}

/** The page section; `figures` are those of overlayFigures, drawn by the report's render script. */
export function overlaySection(overlay: OverlayInput, figures: PlotFigure[]): string {
  const source = overlay.measurement?.source ?? overlay.positions?.source ?? 'figures given on the command line';
  const blocks = figures
    .map((f) => `<div class="plot-block"><h3>${escapeHtml(f.title)}</h3><p class="caption">${escapeHtml(f.caption)}</p><div class="plot" id="${f.id}" data-plot></div></div>`)
    .join('\n');
  return `<section id="overlay"><h2>Measured against model</h2>
<p class="note">Measured data from <code>${escapeHtml(source)}</code>, as read (scaled and offset as listed); everything else on this page is model output.</p>
${overlay.fit ? fitTables(overlay.fit) : ''}
${goodnessTable(overlay.goodness)}
${samplesNote(overlay.goodness)}
${overlay.measurement ? columnsTable(overlay.measurement) : ''}
${blocks}
</section>`;
}

/** Machine-readable overlay data (SI): what was measured, how well the model matches, the calibration. */
export function overlayElement(overlay: OverlayInput): string {
  return jsonScriptElement(OVERLAY_ELEMENT_ID, {
    source: overlay.measurement?.source ?? null,
    signals: overlay.measurement ? Object.keys(overlay.measurement.signals) : [],
    columns: overlay.measurement?.columns ?? [],
    positions: overlay.positions ? { source: overlay.positions.source, x: overlay.positions.x, t: overlay.positions.t } : null,
    measured: overlay.measured,
    goodness: overlay.goodness,
    fit: overlay.fit ?? null,
  });
}
