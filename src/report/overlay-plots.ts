/**
 * The plots of a measured shot against the model: per signal, the model and the measurement on top (the
 * measurement drawn above the model, so it shows where they overlap), the residual underneath, the samples
 * the fit left out at switching instants and those it down-weighted marked; probe arrivals over x(t).
 * The time axis spans the record (the model past it only on request). Records of millions of samples are
 * decimated for display (./decimate.ts keeps every extreme and event); nothing here copies a whole record
 * into a plain array.
 */
import { interpolationCursor } from '../core/interpolate.js';
import type { Waveforms } from '../solve/types.js';
import { decimateIndices, pick, type DecimateOptions } from './decimate.js';
import { scaleFor, type Scale } from '../units/format.js';
import { axis, baseLayout, maxAbs, round6, type PlotFigure, type PlotTrace } from './plots.js';
import { SIGNALS, type OverlayInput, type PositionPoints, type SignalName } from './overlay-types.js';

const MODEL_COLOUR = '#1f3b73';
const MEASURED_COLOUR = '#b8430e';
const MARK_COLOUR = '#2f7d32';
/** Markers drawn at most per kind and plot; the embedded data list every one. */
const MAX_MARKERS = 2000;

const scaleAll = (values: ArrayLike<number>, scale: Scale): (number | null)[] => Array.from(values, (v) => round6(v * scale.factor));

/** A view of [from, to) without copying a typed array. */
function part(values: ArrayLike<number>, from: number, to: number): ArrayLike<number> {
  if (values instanceof Float64Array) return values.subarray(from, to);
  return Array.prototype.slice.call(values, from, to) as number[];
}

/** First index with values[i] ≥ x, and first with values[i] > x (values increasing). */
function bound(values: ArrayLike<number>, x: number, strict: boolean): number {
  let lo = 0;
  let hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (strict ? values[mid]! <= x : values[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

interface Span {
  start: number;
  end: number;
}

/** The time axis: the record's span, or (whole shot) the union of the record and the model. */
function timeSpan(waveforms: Waveforms, overlay: OverlayInput): Span {
  const t = overlay.measurement?.t;
  let start = t && t.length ? t[0]! : Infinity;
  let end = t && t.length ? t[t.length - 1]! : -Infinity;
  for (const probe of overlay.positions?.t ?? []) {
    start = Math.min(start, probe);
    end = Math.max(end, probe);
  }
  if (overlay.wholeShot || !(end > start)) {
    start = Math.min(start, waveforms.t[0]!);
    end = Math.max(end, waveforms.t[waveforms.t.length - 1]!);
  }
  return { start, end };
}

const layoutFor = (time: Scale, span: Span, height: number): Record<string, unknown> => {
  const title = `Time (${time.prefix}s)`;
  const { yaxis: _unused, ...layout } = baseLayout(title, '', height, {
    legend: { orientation: 'h', x: 0, y: -0.16, yanchor: 'top' },
    xaxis: axis(title, { anchor: 'y2', range: [round6(span.start * time.factor), round6(span.end * time.factor)] }),
  });
  return layout;
};

/** Markers at the given times on a measured series (the nearest sample), at most MAX_MARKERS of them. */
function markers(t: ArrayLike<number>, times: readonly number[], values: readonly number[] | null, measured: ArrayLike<number>): { x: number[]; y: number[] } {
  const stride = Math.max(1, Math.ceil(times.length / MAX_MARKERS));
  const x: number[] = [];
  const y: number[] = [];
  for (let k = 0; k < times.length; k += stride) {
    const time = times[k]!;
    x.push(time);
    if (values) y.push(values[k]!);
    else {
      const i = Math.min(t.length - 1, bound(t, time, false));
      y.push(measured[i]!);
    }
  }
  return { x, y };
}

/** One signal: model and measurement on top, the residual at the measured samples underneath. */
function signalFigure(name: SignalName, waveforms: Waveforms, overlay: OverlayInput, span: Span, time: Scale, decimate: DecimateOptions): PlotFigure | undefined {
  const measurement = overlay.measurement!;
  const measured = measurement.signals[name];
  if (!measured) return undefined;
  const spec = SIGNALS[name];
  const model = waveforms[spec.key];
  // the model over the axis' span only (both event samples at its ends kept)
  const m0 = bound(waveforms.t, span.start, false);
  const m1 = bound(waveforms.t, span.end, true);
  const modelT = part(waveforms.t, m0, m1);
  const modelY = part(model, m0, m1);
  const yScale = scaleFor(Math.max(maxAbs([modelY]), maxAbs([measured])));
  const modelIdx = decimateIndices(modelT, [modelY], decimate);
  const measuredIdx = decimateIndices(measurement.t, [measured], decimate);
  // residuals only where the model exists: outside its span a held end value would be a made-up number
  const r0 = bound(measurement.t, waveforms.t[0]!, false);
  const r1 = bound(measurement.t, waveforms.t[waveforms.t.length - 1]!, true);
  const residualT = part(measurement.t, r0, r1);
  const residual = new Float64Array(r1 - r0);
  const modelAt = interpolationCursor(waveforms.t, model);
  for (let i = r0; i < r1; i++) residual[i - r0] = modelAt(measurement.t[i]!) - measured[i]!;
  const residualIdx = decimateIndices(residualT, [residual], decimate);
  const rScale = scaleFor(maxAbs([residual]));
  const layout = layoutFor(time, span, 460);
  layout['yaxis'] = axis(`${spec.label} (${yScale.prefix}${spec.unit})`, { domain: [0.36, 1] });
  layout['yaxis2'] = axis(`residual (${rScale.prefix}${spec.unit})`, { domain: [0, 0.26] });
  const data: PlotTrace[] = [
    { type: 'scatter', mode: 'lines', name: `model ${name}`, x: scaleAll(pick(modelT, modelIdx), time), y: scaleAll(pick(modelY, modelIdx), yScale), xaxis: 'x', yaxis: 'y', line: { width: 2.2, color: MODEL_COLOUR } },
    // drawn after the model, so on top of it: the measurement shows wherever the two overlap
    { type: 'scatter', mode: 'lines', name: `measured ${name}`, x: scaleAll(pick(measurement.t, measuredIdx), time), y: scaleAll(pick(measured, measuredIdx), yScale), xaxis: 'x', yaxis: 'y', opacity: 0.85, line: { width: 1.1, color: MEASURED_COLOUR } },
    { type: 'scatter', mode: 'lines', name: `residual ${name} (model − measured)`, x: scaleAll(pick(residualT, residualIdx), time), y: scaleAll(pick(residual, residualIdx), rScale), xaxis: 'x', yaxis: 'y2', line: { width: 1, color: '#4d4d4d' } },
  ];
  const excluded = overlay.goodness.samples?.excluded ?? [];
  if (excluded.length > 0) {
    const m = markers(measurement.t, excluded, null, measured);
    data.push({ type: 'scatter', mode: 'markers', name: `left out: within one sample interval of a switching instant (${excluded.length})`, x: scaleAll(m.x, time), y: scaleAll(m.y, yScale), xaxis: 'x', yaxis: 'y', marker: { size: 9, symbol: 'circle-open', color: MARK_COLOUR, line: { width: 1.5 } } });
  }
  const downWeighted = (overlay.fit?.downWeighted ?? []).filter((d) => d.group === name && d.t !== null);
  if (downWeighted.length > 0) {
    const m = markers(measurement.t, downWeighted.map((d) => d.t!), downWeighted.map((d) => d.measured), measured);
    data.push({ type: 'scatter', mode: 'markers', name: `down-weighted by the fit (beyond ${overlay.fit!.huberThreshold} σ, Huber; ${downWeighted.length})`, x: scaleAll(m.x, time), y: scaleAll(m.y, yScale), xaxis: 'x', yaxis: 'y', marker: { size: 9, symbol: 'x-thin-open', color: '#a3243b', line: { width: 2 } } });
  }
  return {
    id: `plot-overlay-${name}`,
    title: `Measured ${spec.label} against the model`,
    caption: `Measured ${name} from ${measurement.source} drawn over the model; below, the residual (model − measured) at the measured samples within the model's span. The time axis spans the record${overlay.wholeShot ? ' and the whole simulated shot' : ''}.`,
    data,
    layout,
  };
}

function positionFigure(waveforms: Waveforms, positions: PositionPoints, span: Span, time: Scale, decimate: DecimateOptions): PlotFigure {
  const m0 = bound(waveforms.t, span.start, false);
  const m1 = bound(waveforms.t, span.end, true);
  const modelT = part(waveforms.t, m0, m1);
  const modelX = part(waveforms.position, m0, m1);
  const idx = decimateIndices(modelT, [modelX], decimate);
  const xScale = scaleFor(Math.max(maxAbs([modelX]), maxAbs([positions.x])));
  const layout = layoutFor(time, span, 340);
  layout['xaxis'] = axis(`Time (${time.prefix}s)`, { range: [round6(span.start * time.factor), round6(span.end * time.factor)] });
  layout['yaxis'] = axis(`Position (${xScale.prefix}m)`);
  layout['hovermode'] = 'closest';
  return {
    id: 'plot-overlay-position',
    title: 'Measured probe arrivals against the model position',
    caption: `Measured probe arrivals from ${positions.source} (points) over the model's armature position x(t) (line).`,
    data: [
      { type: 'scatter', mode: 'lines', name: 'model x(t)', x: scaleAll(pick(modelT, idx), time), y: scaleAll(pick(modelX, idx), xScale), line: { width: 2, color: MODEL_COLOUR } },
      { type: 'scatter', mode: 'markers', name: 'measured probe arrivals', x: scaleAll(positions.t, time), y: scaleAll(positions.x, xScale), marker: { size: 8, color: MEASURED_COLOUR, symbol: 'x' } },
    ],
    layout,
  };
}

/** Overlay figures in page order: I, V_breech, V_muzzle (those measured), then probe positions. */
export function overlayFigures(waveforms: Waveforms | null, overlay: OverlayInput, decimate: DecimateOptions = {}): PlotFigure[] {
  if (!waveforms || waveforms.t.length === 0) return [];
  const span = timeSpan(waveforms, overlay);
  const time = scaleFor(Math.max(Math.abs(span.start), Math.abs(span.end)));
  const figures: PlotFigure[] = [];
  if (overlay.measurement) {
    for (const name of Object.keys(SIGNALS) as SignalName[]) {
      const figure = signalFigure(name, waveforms, overlay, span, time, decimate);
      if (figure) figures.push(figure);
    }
  }
  if (overlay.positions && overlay.positions.x.length > 0) figures.push(positionFigure(waveforms, overlay.positions, span, time, decimate));
  return figures;
}
