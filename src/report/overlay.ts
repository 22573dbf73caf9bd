/**
 * The measured-shot part of a shot report: measured traces drawn over the simulated ones with their
 * residuals (model − measured) underneath, probe arrival points over the simulated x(t), the goodness-of-fit
 * figures and, for a calibrated shot, the fitted parameters with their uncertainties and correlations.
 * Pure: the goodness of fit is computed by src/measure/goodness.ts and passed in; nothing is re-derived.
 */
import { interpolateSorted } from '../core/interpolate.js';
import type { Waveforms } from '../solve/types.js';
import { decimateIndices, pick, type DecimateOptions } from './decimate.js';
import { escapeHtml, jsonScriptElement } from './escape.js';
import { formatExact, formatNumber, formatPercent, formatQuantity, formatWithUncertainty, scaleFor, NO_VALUE, type Scale } from '../units/format.js';
import { axis, baseLayout, maxAbs, round6, type PlotFigure } from './plots.js';

export const OVERLAY_ELEMENT_ID = 'railpulse-overlay';

/*
 * What the page draws of a measured shot. Declared here, by the page, so that the report does not depend on
 * the room that reads and fits measured records (src/measure): its types have this shape.
 */
export type SignalName = 'I' | 'V_breech' | 'V_muzzle';

export interface Measurement {
  /** sample times (s), increasing */
  t: readonly number[];
  /** SI signals on the same samples */
  signals: Partial<Record<SignalName, readonly number[]>>;
  source: string;
  columns: readonly { role: string; header: string; unit: string; scale: number; offset: number }[];
}

export interface PositionPoints {
  x: readonly number[];
  t: readonly number[];
  source: string;
}

export interface Comparison {
  model: number;
  measured: number;
  error: number;
  relativeError: number;
}

export interface GoodnessOfFit {
  signals: Partial<Record<SignalName, { rms: number; relativeRms: number; points: number }>>;
  peakCurrent?: Comparison;
  peakCurrentTime?: Comparison;
  exitTime?: Comparison;
  muzzleVelocity?: Comparison;
  arrivalTimeErrors?: readonly (number | null)[];
}

export interface OverlayFitParameter {
  value: number;
  /** NaN (null in JSON) when the parameter stopped on a bound */
  uncertainty: number;
  initial: number;
  /** SI unit symbol for display ('' for plain numbers) */
  unit: string;
}

export interface OverlayFit {
  parameters: Record<string, OverlayFitParameter>;
  /** 'pathA|pathB' → correlation coefficient */
  correlations: Record<string, number>;
  residual: { rms: number; chiSquaredReduced: number };
  shots: number;
  iterations: number;
  warnings: string[];
}

export interface OverlayInput {
  measurement?: Measurement;
  positions?: PositionPoints;
  /** measured figures given on the command line (SI) */
  measured: { muzzleVelocity?: number; exitTime?: number };
  goodness: GoodnessOfFit;
  fit?: OverlayFit;
}

const SIGNALS: Record<SignalName, { key: 'current' | 'breechVoltage' | 'muzzleVoltage'; label: string; unit: string }> = {
  I: { key: 'current', label: 'rail current I', unit: 'A' },
  V_breech: { key: 'breechVoltage', label: 'breech voltage', unit: 'V' },
  V_muzzle: { key: 'muzzleVoltage', label: 'muzzle voltage', unit: 'V' },
};

const MODEL_COLOUR = '#1f3b73';
const MEASURED_COLOUR = '#b8430e';


const scaleAll = (values: readonly number[], scale: Scale): (number | null)[] => values.map((v) => round6(v * scale.factor));

const layoutFor = (timeTitle: string, height: number): Record<string, unknown> => {
  const { yaxis: _unused, ...layout } = baseLayout(timeTitle, '', height, {
    legend: { orientation: 'h', x: 0, y: -0.16, yanchor: 'top' },
    xaxis: axis(timeTitle, { anchor: 'y2' }),
  });
  return layout;
};



/** One signal: simulated and measured on top, the residual at the measured samples underneath. */
function signalFigure(name: SignalName, waveforms: Waveforms, measurement: Measurement, time: Scale, decimate: DecimateOptions): PlotFigure | undefined {
  const measured = measurement.signals[name];
  if (!measured) return undefined;
  const spec = SIGNALS[name];
  const model = waveforms[spec.key];
  const yScale = scaleFor(Math.max(maxAbs([model]), maxAbs([measured])));
  const modelIdx = decimateIndices(waveforms.t, [model], decimate);
  const measuredIdx = decimateIndices(measurement.t, [measured], decimate);
  // residuals only where the model exists: outside its span a held end value would be a made-up number
  const tStart = waveforms.t[0] ?? 0;
  const tEnd = waveforms.t.at(-1) ?? 0;
  const inside = measurement.t.map((_, j) => j).filter((j) => measurement.t[j]! >= tStart && measurement.t[j]! <= tEnd);
  const insideT = inside.map((j) => measurement.t[j]!);
  const modelAt = interpolateSorted(waveforms.t, model, insideT);
  const residual = modelAt.map((v, k) => v - measured[inside[k]!]!);
  const residualIdx = decimateIndices(insideT, [residual], decimate);
  const rScale = scaleFor(maxAbs([residual]));
  const layout = layoutFor(`Time (${time.prefix}s)`, 460);
  layout['yaxis'] = axis(`${spec.label} (${yScale.prefix}${spec.unit})`, { domain: [0.36, 1] });
  layout['yaxis2'] = axis(`residual (${rScale.prefix}${spec.unit})`, { domain: [0, 0.26] });
  const data = [
    // measured first, so the (smooth) model line stays visible on top of a noisy record
    { type: 'scatter', mode: 'lines', name: `measured ${name}`, x: scaleAll(pick(measurement.t, measuredIdx), time), y: scaleAll(pick(measured, measuredIdx), yScale), xaxis: 'x', yaxis: 'y', line: { width: 1.1, color: MEASURED_COLOUR } },
    { type: 'scatter', mode: 'lines', name: `simulated ${name}`, x: scaleAll(pick(waveforms.t, modelIdx), time), y: scaleAll(pick(model, modelIdx), yScale), xaxis: 'x', yaxis: 'y', line: { width: 1.8, color: MODEL_COLOUR } },
    { type: 'scatter', mode: 'lines', name: `residual ${name} (model − measured)`, x: scaleAll(pick(insideT, residualIdx), time), y: scaleAll(pick(residual, residualIdx), rScale), xaxis: 'x', yaxis: 'y2', line: { width: 1, color: '#4d4d4d' } },
  ];
  return {
    id: `plot-overlay-${name}`,
    title: `Measured and simulated ${spec.label}`,
    caption: `Measured ${name} from ${measurement.source} over the simulated one; below, the residual (model − measured) at the measured samples within the simulated span.`,
    data,
    layout,
  };
}

function positionFigure(waveforms: Waveforms, positions: PositionPoints, time: Scale, decimate: DecimateOptions): PlotFigure {
  const idx = decimateIndices(waveforms.t, [waveforms.position], decimate);
  const xScale = scaleFor(Math.max(maxAbs([waveforms.position]), maxAbs([positions.x])));
  const layout = layoutFor(`Time (${time.prefix}s)`, 340);
  layout['xaxis'] = axis(`Time (${time.prefix}s)`);
  layout['yaxis'] = axis(`Position (${xScale.prefix}m)`);
  layout['hovermode'] = 'closest';
  return {
    id: 'plot-overlay-position',
    title: 'Probe arrival times and simulated position',
    caption: `Measured probe arrivals from ${positions.source} (points) on the simulated armature position x(t) (line).`,
    data: [
      { type: 'scatter', mode: 'lines', name: 'simulated x(t)', x: scaleAll(pick(waveforms.t, idx), time), y: scaleAll(pick(waveforms.position, idx), xScale), line: { width: 2, color: MODEL_COLOUR } },
      { type: 'scatter', mode: 'markers', name: 'measured probe arrivals', x: scaleAll(positions.t, time), y: scaleAll(positions.x, xScale), marker: { size: 8, color: MEASURED_COLOUR, symbol: 'x' } },
    ],
    layout,
  };
}

/** Overlay figures in page order: I, V_breech, V_muzzle (those measured), then probe positions. */
export function overlayFigures(waveforms: Waveforms | null, overlay: OverlayInput, decimate: DecimateOptions = {}): PlotFigure[] {
  if (!waveforms || waveforms.t.length === 0) return [];
  const tMax = Math.max(waveforms.t.at(-1) ?? 0, overlay.measurement?.t.at(-1) ?? 0, ...(overlay.positions?.t ?? []));
  const time = scaleFor(tMax);
  const figures: PlotFigure[] = [];
  if (overlay.measurement) {
    for (const name of Object.keys(SIGNALS) as SignalName[]) {
      const figure = signalFigure(name, waveforms, overlay.measurement, time, decimate);
      if (figure) figures.push(figure);
    }
  }
  if (overlay.positions && overlay.positions.x.length > 0) figures.push(positionFigure(waveforms, overlay.positions, time, decimate));
  return figures;
}

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
  return `<h3>Calibration</h3><p class="note">Bounded least squares on the measured signals (each residual divided by its noise); one standard uncertainty from the covariance of the linearised model at the optimum, (JᵀJ)⁻¹, scaled by √(χ²/ν) when the misfit exceeds the noise. ${fit.shots} shots, ${fit.iterations} iterations; χ²/ν = ${formatNumber(fit.residual.chiSquaredReduced)}.</p>
<table class="fitted"><thead><tr><th>Parameter</th><th class="num">Fitted value \u00B1 standard uncertainty (1σ)</th><th class="num">Initial</th></tr></thead><tbody>${rows}</tbody></table>${matrix}${warnings}`;
}

/** The page section; `figures` are those of overlayFigures, drawn by the report's render script. */
export function overlaySection(overlay: OverlayInput, figures: PlotFigure[]): string {
  const source = overlay.measurement?.source ?? overlay.positions?.source ?? 'figures given on the command line';
  const blocks = figures
    .map((f) => `<div class="plot-block"><h3>${escapeHtml(f.title)}</h3><p class="caption">${escapeHtml(f.caption)}</p><div class="plot" id="${f.id}" data-plot></div></div>`)
    .join('\n');
  return `<section id="overlay"><h2>Measured and simulated</h2>
<p class="note">Measured data from <code>${escapeHtml(source)}</code>, as read (scaled and offset as listed); everything else on this page is model output.</p>
${overlay.fit ? fitTables(overlay.fit) : ''}
${goodnessTable(overlay.goodness)}
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
