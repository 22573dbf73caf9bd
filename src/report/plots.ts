/**
 * Plot specifications (plotly figure JSON) for a shot report. Pure: waveforms in, figures out. Values
 * are scaled to an engineering prefix per axis and rounded to 6 significant figures, which is far
 * below what a plot can show and keeps a report of a long multi-group shot small.
 */
import type { Scenario } from '../scenario/types.js';
import { LOSS_KEYS, type LossKey, type ShotEvent, type ShotResults, type Waveforms } from '../solve/types.js';
import { formatPercent, scaleFor, type Scale } from '../units/format.js';
import { decimateIndices, pick, type DecimateOptions } from './decimate.js';
import { plotlyText } from './escape.js';
import { eventMarks, markLayout, type EventMark } from './eventMarks.js';

export interface PlotTrace {
  [key: string]: unknown;
  name: string;
}

export interface PlotFigure {
  /** id of the div the figure is drawn into */
  id: string;
  title: string;
  /** one sentence under the plot saying what to read from it */
  caption: string;
  data: PlotTrace[];
  layout: Record<string, unknown>;
}

export const LOSS_LABELS: Record<LossKey, string> = {
  bank: 'capacitor ESR',
  crowbar: 'crowbar diodes',
  modules: 'module resistance',
  feed: 'feed',
  rails: 'rails',
  armature: 'armature',
  contacts: 'contacts',
  arc: 'arc drop',
  friction: 'friction',
  drag: 'gas drag',
};

/** 6 significant figures; -0 becomes 0 so the JSON stays short and stable. */
export function round6(value: number): number | null {
  if (!Number.isFinite(value)) return null;
  const rounded = Number(value.toPrecision(6));
  return rounded === 0 ? 0 : rounded;
}

/** Largest finite magnitude over several series (chooses a plot's SI prefix). */
export function maxAbs(series: ReadonlyArray<ArrayLike<number>>): number {
  let max = 0;
  for (const values of series) {
    for (let i = 0; i < values.length; i++) {
      const v = Math.abs(values[i]!);
      if (Number.isFinite(v) && v > max) max = v;
    }
  }
  return max;
}

function scaled(values: ArrayLike<number>, indices: readonly number[], scale: Scale): Array<number | null> {
  return pick(values, indices).map((v) => round6(v * scale.factor));
}

// Distinct, print-safe colours (dark enough on white, distinguishable in greyscale by order of use).
const COLOURS = [
  '#1f3b73', '#b8430e', '#2f7d32', '#7b2d8b', '#8a6d00', '#0f7c8c', '#a3243b', '#4d4d4d',
  '#5b8bd0', '#e08a3c', '#7fbf6a', '#c27bd0', '#d6b43a', '#4fb7c4',
];
const colour = (i: number): string => COLOURS[i % COLOURS.length]!;

/** A plotly axis in the records' style. */
export function axis(title: string, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    title: { text: title },
    showline: true,
    linecolor: '#222',
    mirror: true,
    ticks: 'outside',
    gridcolor: '#e3e3e3',
    zeroline: true,
    zerolinecolor: '#9a9a9a',
    ...extra,
  };
}

/** A plotly layout in the records' style; `overrides` replace top-level keys. */
export function baseLayout(timeTitle: string, yTitle: string, height = 340, overrides: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    height,
    margin: { l: 72, r: 24, t: 12, b: 56 },
    font: { family: 'Helvetica, Arial, sans-serif', size: 12, color: '#111' },
    paper_bgcolor: '#fff',
    plot_bgcolor: '#fff',
    hovermode: 'x',
    showlegend: true,
    legend: { orientation: 'h', x: 0, y: -0.22, yanchor: 'top' },
    xaxis: axis(timeTitle),
    yaxis: axis(yTitle),
    ...overrides,
  };
}

interface SeriesSpec {
  name: string;
  values: ArrayLike<number>;
  /** palette index, so one group keeps its colour in every plot */
  colourIndex?: number;
  extra?: Record<string, unknown>;
  /** half-width of an uncertainty band drawn around it */
  band?: { halfWidth: ArrayLike<number>; label: string };
}

/**
 * Uncertainty bands for the current and velocity plots: half-widths on the waveforms' own time grid (one per
 * sample), and what they are, e.g. "±1σ (linear propagation)".
 */
export interface WaveformBands {
  current: ArrayLike<number>;
  velocity: ArrayLike<number>;
  label: string;
}

/** A shaded band value ± half-width: a lower edge and an upper edge filled down to it. */
function bandTraces(x: Array<number | null>, values: ArrayLike<number>, halfWidth: ArrayLike<number>, indices: readonly number[], scale: Scale, label: string, yaxis?: string): PlotTrace[] {
  const edge = (sign: number): Array<number | null> => indices.map((i) => round6((values[i]! + sign * halfWidth[i]!) * scale.factor));
  const common = { type: 'scatter', mode: 'lines', x, line: { width: 0, color: '#6b7fa8' }, hoverinfo: 'skip', ...(yaxis ? { xaxis: 'x', yaxis } : {}) };
  return [
    { ...common, name: plotlyText(`${label} (lower)`), y: edge(-1), showlegend: false },
    { ...common, name: plotlyText(label), y: edge(1), fill: 'tonexty', fillcolor: 'rgba(107, 127, 168, 0.28)' },
  ];
}

/** Lines sharing one decimated time base and one y scale. */
function lineFigure(
  id: string,
  title: string,
  caption: string,
  waveforms: Waveforms,
  series: SeriesSpec[],
  unit: string,
  quantity: string,
  decimate: DecimateOptions,
  marks: readonly EventMark[] = [],
): PlotFigure {
  const time = timeScale(waveforms);
  const indices = decimateIndices(waveforms.t, series.map((s) => s.values), decimate);
  const yScale = scaleFor(maxAbs(series.map((s) => s.values)));
  const x = scaled(waveforms.t, indices, time);
  const data = series.flatMap((s, i) => [
    ...(s.band ? bandTraces(x, s.values, s.band.halfWidth, indices, yScale, s.band.label) : []),
    {
      type: 'scatter',
      mode: 'lines',
      name: plotlyText(s.name),
      x,
      y: scaled(s.values, indices, yScale),
      line: { width: 1.6, color: colour(s.colourIndex ?? i) },
      ...s.extra,
    },
  ]);
  const layout = { ...baseLayout(`Time (${time.prefix}s)`, `${quantity} (${yScale.prefix}${unit})`), ...markLayout(marks, time) };
  return { id, title, caption, data, layout };
}

function timeScale(waveforms: Waveforms): Scale {
  return scaleFor(waveforms.t[waveforms.t.length - 1] ?? 0);
}

function motionFigure(waveforms: Waveforms, decimate: DecimateOptions, marks: readonly EventMark[], bands?: WaveformBands): PlotFigure {
  const time = timeScale(waveforms);
  const rows: Array<[string, ArrayLike<number>, string]> = [
    ['Position', waveforms.position, 'm'],
    ['Velocity', waveforms.velocity, 'm/s'],
    ['Acceleration', waveforms.acceleration, 'm/s\u00B2'],
  ];
  const indices = decimateIndices(waveforms.t, rows.map((r) => r[1]), decimate);
  const x = scaled(waveforms.t, indices, time);
  const domains = [
    [0.7, 1],
    [0.36, 0.64],
    [0, 0.3],
  ];
  const layout = baseLayout(`Time (${time.prefix}s)`, '', 560);
  layout['showlegend'] = false;
  layout['margin'] = { l: 72, r: 24, t: 12, b: 48 };
  layout['xaxis'] = axis(`Time (${time.prefix}s)`, { anchor: 'y3' });
  Object.assign(layout, markLayout(marks, time));
  const data = rows.flatMap(([name, values, unit], i) => {
    const yScale = scaleFor(maxAbs([values]));
    const axisKey = i === 0 ? 'yaxis' : `yaxis${i + 1}`;
    layout[axisKey] = axis(`${name} (${yScale.prefix}${unit})`, { domain: domains[i] });
    const band = bands && name === 'Velocity' ? bandTraces(x, values, bands.velocity, indices, yScale, bands.label, `y${i + 1}`) : [];
    return [...band, {
      type: 'scatter',
      mode: 'lines',
      name,
      x,
      y: scaled(values, indices, yScale),
      xaxis: 'x',
      yaxis: i === 0 ? 'y' : `y${i + 1}`,
      line: { width: 1.6, color: colour(i) },
    }];
  });
  if (bands) layout['showlegend'] = true;
  return {
    id: 'plot-motion',
    title: 'Armature position, velocity and acceleration',
    caption: `Position measured from the breech; acceleration from the net force on the armature.${bands ? ` Shaded: ${bands.label} on the velocity.` : ''}`,
    data,
    layout,
  };
}

function isUsed(values: ArrayLike<number>, scale: number): boolean {
  return maxAbs([values]) > 1e-12 * scale;
}

function ledgerFigure(waveforms: Waveforms, initial: number, decimate: DecimateOptions, marks: readonly EventMark[]): PlotFigure {
  const parts: SeriesSpec[] = [
    { name: 'capacitors', values: waveforms.energy.capacitors },
    { name: 'magnetic', values: waveforms.energy.magnetic },
    { name: 'kinetic', values: waveforms.energy.kinetic },
    ...LOSS_KEYS.filter((key) => isUsed(waveforms.energy.losses[key], initial)).map((key) => ({
      name: `loss: ${LOSS_LABELS[key]}`,
      values: waveforms.energy.losses[key],
    })),
  ].map((part) => ({ ...part, extra: { stackgroup: 'ledger', line: { width: 0.6 } } }));
  const figure = lineFigure(
    'plot-energy',
    'Energy ledger',
    'Stacked: stored, kinetic and dissipated energy add up to the initial stored energy E0 at every instant.',
    waveforms,
    parts,
    'J',
    'Energy',
    // ten stacked areas: a thousand points each is all a plot a thousand pixels wide shows, and a third of the work
    { target: 1000, max: 1500, ...decimate },
    marks,
  );
  // Stacked areas read best with fills that differ more than line colours do.
  figure.data.forEach((trace, i) => {
    trace['line'] = { width: 0.6, color: colour(i) };
    trace['fillcolor'] = colour(i) + 'b3';
  });
  // Many parts: a legend beside the plot, in stacking order from the bottom up.
  figure.layout['legend'] = { orientation: 'v', x: 1.02, y: 0, yanchor: 'bottom', traceorder: 'reversed' };
  figure.layout['margin'] = { l: 72, r: 24, t: 12, b: 56 };
  figure.layout['height'] = 380;
  return figure;
}

export interface BudgetPart {
  key: string;
  label: string;
  energy: number;
}

/** The end-of-bore energy budget: parts that add up to E0 (with the ledger residual as its own part). */
export function energyBudgetParts(results: ShotResults): BudgetPart[] {
  const e = results.energy;
  const parts: BudgetPart[] = [
    { key: 'capacitors', label: 'left in the capacitors', energy: e.capacitors },
    { key: 'magneticRails', label: 'magnetic, feed and rails (the muzzle arc must absorb it)', energy: e.magneticRails },
    { key: 'magneticModules', label: 'magnetic, module inductors', energy: e.magnetic - e.magneticRails },
    { key: 'kinetic', label: 'kinetic (armature)', energy: e.kinetic },
    ...LOSS_KEYS.map((key) => ({ key: `losses.${key}`, label: `loss: ${LOSS_LABELS[key]}`, energy: e.losses[key] })),
    { key: 'residual', label: 'ledger residual', energy: e.residual },
  ];
  return parts;
}

function budgetFigure(results: ShotResults): PlotFigure {
  const initial = results.energy.initial;
  // A residual within the ledger tolerance is noise, not a part of the budget worth a bar (the table lists it).
  const parts = energyBudgetParts(results).filter(
    (p) => Math.abs(p.energy) > (p.key === 'residual' ? 1e-6 : 1e-9) * initial,
  );
  const scale = scaleFor(initial);
  const data = [
    {
      type: 'bar',
      orientation: 'h',
      name: 'share of E0',
      y: parts.map((p) => plotlyText(p.label)),
      x: parts.map((p) => round6(p.energy * scale.factor)),
      text: parts.map((p) => formatPercent(p.energy / initial)),
      textposition: 'outside',
      cliponaxis: false,
      marker: { color: parts.map((p) => (p.key.startsWith('losses') ? '#8a8a8a' : '#1f3b73')) },
    },
  ];
  const layout = baseLayout(`Energy (${scale.prefix}J)`, '', Math.max(220, 60 + 28 * parts.length));
  layout['showlegend'] = false;
  layout['margin'] = { l: 330, r: 72, t: 12, b: 48 };
  layout['yaxis'] = axis('', { autorange: 'reversed', automargin: true, zeroline: false });
  layout['hovermode'] = 'closest';
  return {
    id: 'plot-budget',
    title: 'Energy budget at the end of the in-bore phase',
    caption: 'The bars add up to the stored energy E0; grey bars are losses.',
    data,
    layout,
  };
}

/**
 * All figures of a shot report, in page order. Without waveforms only the energy budget remains. Every time plot
 * carries the event marks (triggers, crowbar onsets, armature start, end of the in-bore phase).
 */
export function shotFigures(
  scenario: Scenario,
  results: ShotResults,
  waveforms: Waveforms | null,
  decimate: DecimateOptions = {},
  events: readonly ShotEvent[] = [],
  bands?: WaveformBands,
): PlotFigure[] {
  if (!waveforms || waveforms.t.length === 0) return [budgetFigure(results)];
  const labels = scenario.bank.map((group, i) => results.modules[i]?.label ?? group.label);
  const marks = eventMarks(events, labels);
  const groups = waveforms.groupCurrent.map((values, i) => ({ name: labels[i] ?? `group ${i + 1}`, values, colourIndex: i }));
  const currents: SeriesSpec[] = [
    {
      name: 'total current I',
      values: waveforms.current,
      extra: { line: { width: 2.2, color: '#111' } },
      ...(bands ? { band: { halfWidth: bands.current, label: bands.label } } : {}),
    },
    ...(groups.length > 1 ? groups : []),
  ];
  return [
    lineFigure('plot-current', 'Current', `Total rail current and, for a bank of several groups, the current of each group (all its modules).${bands ? ` Shaded: ${bands.label} on the total current.` : ''}`,
      waveforms, currents, 'A', 'Current', decimate, marks),
    lineFigure('plot-capacitor', 'Capacitor voltages', 'Voltage across one capacitor of each group; below zero is voltage reversal.',
      waveforms, waveforms.groupVoltage.map((values, i) => ({ name: labels[i] ?? `group ${i + 1}`, values, colourIndex: i })), 'V', 'Voltage', decimate, marks),
    lineFigure('plot-rail-voltage', 'Breech and muzzle voltage', 'Breech: across the rails at the breech. Muzzle: across the armature (resistive and arc drop).',
      waveforms, [{ name: 'breech', values: waveforms.breechVoltage }, { name: 'muzzle (armature)', values: waveforms.muzzleVoltage }], 'V', 'Voltage', decimate, marks),
    motionFigure(waveforms, decimate, marks, bands),
    ledgerFigure(waveforms, results.energy.initial, decimate, marks),
    budgetFigure(results),
  ];
}
