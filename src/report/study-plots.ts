/**
 * The figures of the study page as plotly JSON, built here (not in the page) so they are tested like the shot
 * record's. In the records' style: axes in display units with a prefix chosen per axis (kV, not "V (SI)"), a
 * sequential colour scale (every figure shown is one-directional), heat-map cells drawn at their true grid values
 * (cell edges halfway between neighbours; geometric halfway and a log axis for a log range), each point's outcome
 * by its own mark (exited, stalled, timed out, error) and the points that fail a check ringed in red.
 */
import { dimensionOfPath } from '../scenario/fields.js';
import { axisScale, formatQuantity } from '../units/format.js';
import { plotlyText } from './escape.js';
import { axis, round6, type PlotFigure, type PlotTrace } from './plots.js';

export type PointOutcome = 'exited' | 'stalled' | 'timeout' | 'error';

/** The points a study page draws (SI values; thinned for very large studies). */
export interface StudyPlotData {
  paths: string[];
  /** the point's index in the design */
  index: number[];
  /** [axis][point] SI values */
  axes: number[][];
  /** figure key → SI values, null where the point has none (an error) */
  figures: Record<string, (number | null)[]>;
  outcome: PointOutcome[];
  /** the point's status from its verdicts: the worst of its checks and warnings ('' for an error) */
  verdict: ('pass' | 'warn' | 'fail' | '')[];
  /** ids of the checks the point fails */
  failing: string[][];
  /** error messages ('' when the point ran) */
  reasons: string[];
  shown: number;
  total: number;
  /** over all points, not only those shown */
  outcomes: Record<PointOutcome, number>;
  verdicts: Record<'pass' | 'warn' | 'fail', number>;
  storedEnergy: { min: number; max: number } | null;
}

export const STUDY_FIGURES = [
  { key: 'muzzleVelocity', label: 'Muzzle velocity', unit: 'm/s', percent: false, note: 'the final velocity where the armature did not leave' },
  { key: 'efficiency', label: 'Efficiency (kinetic / stored)', unit: '%', percent: true, note: '' },
  { key: 'peakCurrent', label: 'Peak current', unit: 'A', percent: false, note: '' },
  { key: 'peakAcceleration', label: 'Peak acceleration', unit: 'm/s\u00B2', percent: false, note: '' },
  { key: 'actionIntegral', label: 'Action integral \u222BI\u00B2dt', unit: 'A\u00B2\u00B7s', percent: false, note: '' },
] as const;

export const OUTCOME_STYLE: Record<PointOutcome, { name: string; symbol: string; colour: string }> = {
  exited: { name: 'exited', symbol: 'circle', colour: '#1f3b73' },
  stalled: { name: 'stalled', symbol: 'x', colour: '#b8430e' },
  timeout: { name: 'timed out', symbol: 'triangle-up', colour: '#7b2d8b' },
  error: { name: 'error (no result)', symbol: 'square-open', colour: '#777777' },
};
export const FAIL_MARK = { name: 'fails a check', symbol: 'circle-open', colour: '#c0392b' };

/** Viridis: sequential, perceptually even and readable by the colour-blind; every figure here runs one way. */
const SEQUENTIAL = 'Viridis';

interface AxisView {
  path: string;
  title: string;
  factor: number;
  powers: boolean;
  log: boolean;
  /** distinct display values, ascending */
  values: number[];
}

function maxAbs(values: ReadonlyArray<number | null>): number {
  return values.reduce<number>((m, v) => (v !== null && Number.isFinite(v) ? Math.max(m, Math.abs(v)) : m), 0);
}

function axisView(path: string, spec: string, si: readonly number[]): AxisView {
  const unit = dimensionOfPath(path)?.display ?? '';
  const scale = unit ? axisScale(unit, maxAbs(si)) : { factor: 1, unit: '', powers: false };
  const values = [...new Set(si.map((v) => round6(v * scale.factor) ?? 0))].sort((a, b) => a - b);
  return { path, title: scale.unit ? `${path} (${scale.unit})` : path, factor: scale.factor, powers: scale.powers, log: spec.startsWith('log:'), values };
}

function figureScale(figure: (typeof STUDY_FIGURES)[number], values: ReadonlyArray<number | null>): { factor: number; unit: string; powers: boolean } {
  if (figure.percent) return { factor: 100, unit: '%', powers: false };
  return axisScale(figure.unit, maxAbs(values));
}

/** Ticks at the grid's own values when there are few of them (a grid is read at its points). */
function ticksAt(view: AxisView, grid: boolean): Record<string, unknown> {
  const extra: Record<string, unknown> = view.powers ? { exponentformat: 'power' } : {};
  if (view.log) extra['type'] = 'log';
  if (grid && view.values.length <= 12) {
    extra['tickvals'] = view.values;
    extra['ticktext'] = view.values.map((v) => String(Number(v.toPrecision(4))));
  }
  return extra;
}

/** Cell edges for a heat map: halfway between neighbouring grid values (geometrically on a log axis). */
export function cellEdges(values: readonly number[], log: boolean): number[] {
  if (values.length === 1) {
    const v = values[0]!;
    return log || v !== 0 ? [v * (log ? 0.8 : 0.9), v * (log ? 1.25 : 1.1)].sort((a, b) => a - b) : [-0.5, 0.5];
  }
  const mid = (a: number, b: number): number => (log ? Math.sqrt(a * b) : (a + b) / 2);
  const inner = values.slice(1).map((v, i) => mid(values[i]!, v));
  const first = log ? values[0]! ** 2 / inner[0]! : 2 * values[0]! - inner[0]!;
  const last = log ? values[values.length - 1]! ** 2 / inner[inner.length - 1]! : 2 * values[values.length - 1]! - inner[inner.length - 1]!;
  return [first, ...inner, last];
}

/** One line of hover text per point: index, varied values, outcome, status and what fails. */
export function pointTexts(data: StudyPlotData): string[] {
  return data.index.map((index, i) => {
    const values = data.paths.map((path, d) => `${path} = ${formatQuantity(data.axes[d]![i]!, dimensionOfPath(path)?.display ?? '')}`);
    const verdict = data.verdict[i] ? `status ${data.verdict[i]!.toUpperCase()}` : '';
    const fails = data.failing[i]!.length ? `fails: ${data.failing[i]!.join(', ')}` : '';
    const reason = data.reasons[i] ? `error: ${data.reasons[i]}` : '';
    return [`point ${index}`, ...values, OUTCOME_STYLE[data.outcome[i]!].name, verdict, fails, reason].filter(Boolean).map(plotlyText).join('<br>');
  });
}

function studyLayout(height: number): Record<string, unknown> {
  return {
    height,
    margin: { l: 80, r: 24, t: 12, b: 64 },
    font: { family: 'Helvetica, Arial, sans-serif', size: 12, color: '#111' },
    paper_bgcolor: '#fff',
    plot_bgcolor: '#fff',
    hovermode: 'closest',
    showlegend: true,
    legend: { orientation: 'h', x: 0, y: -0.22, yanchor: 'top' },
  };
}

function pick<T>(values: readonly T[], keep: readonly number[]): T[] {
  return keep.map((i) => values[i]!);
}

/** One figure against each varied parameter, side by side (one parameter: a line through the exited points). */
function matrixFigure(figure: (typeof STUDY_FIGURES)[number], data: StudyPlotData, views: AxisView[], texts: string[], grid: boolean): PlotFigure {
  const raw = data.figures[figure.key] ?? [];
  const scale = figureScale(figure, raw);
  const y = raw.map((v) => (v === null ? null : round6(v * scale.factor)));
  const layout = studyLayout(380);
  const columns = views.length;
  const gap = columns > 1 ? 0.04 : 0;
  const traces: PlotTrace[] = [];
  views.forEach((view, d) => {
    const xKey = d === 0 ? 'x' : `x${d + 1}`;
    layout[d === 0 ? 'xaxis' : `xaxis${d + 1}`] = axis(view.title, { domain: [d / columns + gap / 2, (d + 1) / columns - gap / 2], anchor: 'y', ...ticksAt(view, grid) });
    const x = data.axes[d]!.map((v) => round6(v * view.factor));
    const first = d === 0;
    for (const outcome of ['exited', 'stalled', 'timeout'] as const) {
      const keep = data.outcome.flatMap((o, i) => (o === outcome && y[i] !== null ? [i] : []));
      if (keep.length === 0) continue;
      const line = outcome === 'exited' && columns === 1 && grid;
      const ordered = line ? [...keep].sort((a, b) => x[a]! - x[b]!) : keep;
      const style = OUTCOME_STYLE[outcome];
      traces.push({
        type: 'scatter', mode: line ? 'lines+markers' : 'markers', name: style.name, legendgroup: outcome, showlegend: first,
        xaxis: xKey, yaxis: 'y', x: pick(x, ordered), y: pick(y, ordered), text: pick(texts, ordered), hoverinfo: 'text+y',
        marker: { symbol: style.symbol, color: style.colour, size: outcome === 'exited' ? 7 : 10 }, line: { color: style.colour, width: 1.6 },
      });
    }
    const errors = data.outcome.flatMap((o, i) => (o === 'error' ? [i] : []));
    if (errors.length) {
      // no value to place: a mark along the bottom of the plot at the point's parameter value
      traces.push({ type: 'scatter', mode: 'markers', name: OUTCOME_STYLE.error.name, legendgroup: 'error', showlegend: first, xaxis: xKey, yaxis: 'y2', x: pick(x, errors), y: errors.map(() => 0.03), text: pick(texts, errors), hoverinfo: 'text', marker: { symbol: OUTCOME_STYLE.error.symbol, color: OUTCOME_STYLE.error.colour, size: 10 } });
    }
    const fails = data.verdict.flatMap((v, i) => (v === 'fail' && y[i] !== null ? [i] : []));
    if (fails.length) {
      traces.push({ type: 'scatter', mode: 'markers', name: FAIL_MARK.name, legendgroup: 'fail', showlegend: first, xaxis: xKey, yaxis: 'y', x: pick(x, fails), y: pick(y, fails), text: pick(texts, fails), hoverinfo: 'text', marker: { symbol: FAIL_MARK.symbol, color: FAIL_MARK.colour, size: 17, line: { width: 2, color: FAIL_MARK.colour } } });
    }
  });
  layout['yaxis'] = axis(`${figure.label} (${scale.unit})`, { anchor: 'x', ...(scale.powers ? { exponentformat: 'power' } : {}) });
  layout['yaxis2'] = { overlaying: 'y', range: [0, 1], visible: false, fixedrange: true };
  return {
    id: `study-${figure.key}`,
    title: `${figure.label} (${scale.unit})`,
    caption: columns === 1 ? `Against ${views[0]!.path}.${figure.note ? ` Not exited: ${figure.note}.` : ''}` : `Against each varied parameter (one panel a parameter).${figure.note ? ` Not exited: ${figure.note}.` : ''}`,
    data: traces,
    layout,
  };
}

/** Two varied parameters on a grid: a heat map of the figure with cells at the grid's own values. */
function heatmapFigure(figure: (typeof STUDY_FIGURES)[number], data: StudyPlotData, views: AxisView[], texts: string[]): PlotFigure {
  const [rowView, colView] = views as [AxisView, AxisView];
  const raw = data.figures[figure.key] ?? [];
  const scale = figureScale(figure, raw);
  const z = rowView.values.map(() => colView.values.map((): number | null => null));
  const hover = rowView.values.map(() => colView.values.map(() => ''));
  const xs = data.axes[1]!.map((v) => round6(v * colView.factor)!);
  const ys = data.axes[0]!.map((v) => round6(v * rowView.factor)!);
  data.index.forEach((_, i) => {
    const r = rowView.values.indexOf(ys[i]!);
    const c = colView.values.indexOf(xs[i]!);
    if (r < 0 || c < 0) return;
    const v = raw[i];
    z[r]![c] = v === null || v === undefined ? null : round6(v * scale.factor);
    hover[r]![c] = texts[i]!;
  });
  const traces: PlotTrace[] = [
    {
      type: 'heatmap', name: plotlyText(figure.label), x: cellEdges(colView.values, colView.log), y: cellEdges(rowView.values, rowView.log), z, text: hover, hoverinfo: 'text+z',
      colorscale: SEQUENTIAL, colorbar: { title: { text: scale.unit }, ...(scale.powers ? { exponentformat: 'power' } : {}) }, showscale: true,
    },
  ];
  for (const outcome of ['stalled', 'timeout', 'error'] as const) {
    const keep = data.outcome.flatMap((o, i) => (o === outcome ? [i] : []));
    if (keep.length === 0) continue;
    const style = OUTCOME_STYLE[outcome];
    traces.push({ type: 'scatter', mode: 'markers', name: style.name, x: pick(xs, keep), y: pick(ys, keep), text: pick(texts, keep), hoverinfo: 'text', marker: { symbol: style.symbol, color: outcome === 'error' ? '#777777' : '#ffffff', size: 11, line: { width: 2, color: style.colour } } });
  }
  const fails = data.verdict.flatMap((v, i) => (v === 'fail' ? [i] : []));
  if (fails.length) {
    traces.push({ type: 'scatter', mode: 'markers', name: FAIL_MARK.name, x: pick(xs, fails), y: pick(ys, fails), text: pick(texts, fails), hoverinfo: 'text', marker: { symbol: FAIL_MARK.symbol, color: FAIL_MARK.colour, size: 18, line: { width: 2.5, color: FAIL_MARK.colour } } });
  }
  const layout = studyLayout(440);
  layout['xaxis'] = axis(colView.title, { ...ticksAt(colView, true), showgrid: false, zeroline: false });
  layout['yaxis'] = axis(rowView.title, { ...ticksAt(rowView, true), showgrid: false, zeroline: false });
  return { id: `study-${figure.key}`, title: `${figure.label} (${scale.unit})`, caption: `Each cell is one point of the grid, centred on its values; blank cells have no result.${figure.note ? ` Not exited: ${figure.note}.` : ''}`, data: traces, layout };
}

export type StudyPlotMode = 'line' | 'heatmap' | 'matrix';

/** `grid`: the design is a grid (lines through the points of one parameter, ticks at the grid values). */
export function studyFigures(data: StudyPlotData, vary: readonly { path: string; spec: string }[], mode: StudyPlotMode, grid: boolean): PlotFigure[] {
  const views = vary.map((v, d) => axisView(v.path, v.spec, data.axes[d] ?? []));
  const texts = pointTexts(data);
  return STUDY_FIGURES.map((figure) => (mode === 'heatmap' ? heatmapFigure(figure, data, views, texts) : matrixFigure(figure, data, views, texts, grid)));
}
