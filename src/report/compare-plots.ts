/**
 * Plot specifications for the comparison report: the shots' waveforms overlaid on one time axis (one colour
 * a scenario) and their end-of-bore energy budgets as grouped bars. Pure: shots in, plotly figure JSON out.
 * Trace names go through plotlyText because plotly reads a few HTML tags in legend text and decodes &amp;, &lt;
 * and &gt; (but not &quot;), so a name escaped that way shows literally.
 */
import type { Scenario } from '../scenario/types.js';
import type { Shot, Waveforms } from '../solve/types.js';
import { decimateIndices, pick, type DecimateOptions } from './decimate.js';
import { plotlyText } from './escape.js';
import { formatPercent, formatQuantity, scaleFor, type Scale } from '../units/format.js';
import { axis, baseLayout, energyBudgetParts, maxAbs, round6, type PlotFigure } from './plots.js';

export interface ComparedShotInput {
  scenario: Scenario;
  shot: Shot;
}

// The shot report's palette order: one colour a scenario, kept in every plot.
const COLOURS = ['#1f3b73', '#b8430e', '#2f7d32', '#7b2d8b', '#8a6d00', '#0f7c8c', '#a3243b', '#4d4d4d'];
export const scenarioColour = (i: number): string => COLOURS[i % COLOURS.length]!;
// Groups of one scenario share its colour and differ by dash.
const DASHES = ['solid', 'dash', 'dot', 'dashdot', 'longdash', 'longdashdot'];

export { plotlyText };

const layout = (xTitle: string, yTitle: string, height = 360): Record<string, unknown> =>
  baseLayout(xTitle, yTitle, height, { hovermode: 'closest', legend: { orientation: 'h', x: 0, y: -0.2, yanchor: 'top' } });

interface Series {
  /** index of the scenario: its colour */
  entry: number;
  name: string;
  waveforms: Waveforms;
  values: ArrayLike<number>;
  dash?: string;
}

/**
 * Each shot's end of the in-bore phase (exit, stall, end time) and its first trigger, as thin lines in the shot's
 * colour: the event marks of a comparison, where every shot's triggers and crowbars would crowd the plot.
 */
function endMarks(entries: ReadonlyArray<ComparedShotInput>, names: string[], time: Scale): Record<string, unknown> {
  const ends = entries.flatMap((e, i) => {
    const end = e.shot.events.find((event) => event.kind === 'exit' || event.kind === 'stall' || event.kind === 'timeout');
    return end ? [{ i, t: end.t, label: `${names[i]}: ${end.kind === 'exit' ? 'muzzle exit' : end.kind === 'stall' ? 'stall' : 'end time'}` }] : [];
  });
  return {
    shapes: ends.map((end) => ({ type: 'line', xref: 'x', yref: 'paper', x0: end.t * time.factor, x1: end.t * time.factor, y0: 0, y1: 1, line: { color: scenarioColour(end.i), width: 1, dash: 'dot' }, layer: 'below' })),
    annotations: ends.map((end) => ({
      x: end.t * time.factor, xref: 'x', y: 1, yref: 'paper', text: plotlyText(end.label), hovertext: plotlyText(`${end.label} at ${formatQuantity(end.t, 's')}`),
      showarrow: false, textangle: -90, xanchor: 'left', yanchor: 'top', font: { size: 9, color: scenarioColour(end.i) }, bgcolor: 'rgba(255,255,255,0.7)',
    })),
  };
}

/** Each series keeps its own shot's time base, decimated with its own peaks and events. */
function overlayFigure(id: string, title: string, caption: string, series: Series[], time: Scale, unit: string, quantity: string, decimate: DecimateOptions, marks: Record<string, unknown> = {}): PlotFigure {
  const yScale = scaleFor(maxAbs(series.map((s) => s.values)));
  const data = series.map((s) => {
    const indices = decimateIndices(s.waveforms.t, [s.values], decimate);
    return {
      type: 'scatter',
      mode: 'lines',
      name: s.name,
      x: pick(s.waveforms.t, indices).map((t) => round6(t * time.factor)),
      y: pick(s.values, indices).map((v) => round6(v * yScale.factor)),
      line: { width: 1.7, color: scenarioColour(s.entry), dash: s.dash ?? 'solid' },
    };
  });
  return { id, title, caption, data, layout: { ...layout(`Time (${time.prefix}s)`, `${quantity} (${yScale.prefix}${unit})`), ...marks } };
}

/** Names as the legend shows them: the scenario's name, numbered so two scenarios of one name stay apart. */
export function legendNames(entries: ReadonlyArray<{ scenario: Scenario }>): string[] {
  return entries.map((e, i) => `${i + 1}: ${e.scenario.name}`);
}

function budgetFigure(entries: ReadonlyArray<ComparedShotInput>, names: string[]): PlotFigure {
  const budgets = entries.map((e) => energyBudgetParts(e.shot.results));
  const first = budgets[0] ?? [];
  // A part is drawn when it matters in any shot; a residual within the ledger tolerance is noise.
  const keep = first.filter((part) =>
    entries.some((e, i) => {
      const energy = budgets[i]!.find((p) => p.key === part.key)?.energy ?? 0;
      return Math.abs(energy) > (part.key === 'residual' ? 1e-6 : 1e-9) * e.shot.results.energy.initial;
    }),
  );
  const scale = scaleFor(Math.max(...entries.map((e) => e.shot.results.energy.initial), 0));
  const data = entries.map((e, i) => {
    const parts = keep.map((part) => budgets[i]!.find((p) => p.key === part.key)?.energy ?? 0);
    return {
      type: 'bar',
      orientation: 'h',
      name: plotlyText(names[i]),
      y: keep.map((p) => plotlyText(p.label)),
      x: parts.map((energy) => round6(energy * scale.factor)),
      text: parts.map((energy) => formatPercent(energy / e.shot.results.energy.initial)),
      textposition: 'outside',
      cliponaxis: false,
      marker: { color: scenarioColour(i) },
    };
  });
  const figureLayout = layout(`Energy (${scale.prefix}J)`, '', Math.max(260, 60 + 16 * keep.length * Math.max(1, entries.length)));
  figureLayout['barmode'] = 'group';
  figureLayout['margin'] = { l: 330, r: 72, t: 12, b: 56 };
  figureLayout['yaxis'] = axis('', { autorange: 'reversed', automargin: true, zeroline: false });
  figureLayout['legend'] = { orientation: 'h', x: 0, y: -0.12, yanchor: 'top', traceorder: 'normal' };
  return {
    id: 'plot-budget',
    title: 'Energy budget at the end of the in-bore phase',
    caption: 'Where each shot\u2019s stored energy is when the armature leaves (or the run ends); labels give the share of that shot\u2019s own E0.',
    data,
    layout: figureLayout,
  };
}

/** All figures of a comparison report, in page order. Shots without waveforms appear only in the budget. */
export function comparisonFigures(entries: ReadonlyArray<ComparedShotInput>, decimate: DecimateOptions = {}): PlotFigure[] {
  const names = legendNames(entries);
  const sampled = entries.flatMap((e, entry) => (e.shot.waveforms && e.shot.waveforms.t.length > 0 ? [{ entry, e, waveforms: e.shot.waveforms }] : []));
  const figures: PlotFigure[] = [];
  if (sampled.length > 0) {
    const time = scaleFor(Math.max(...sampled.map((s) => s.waveforms.t[s.waveforms.t.length - 1] ?? 0)));
    const one = (pickValues: (w: Waveforms) => number[]): Series[] =>
      sampled.map((s) => ({ entry: s.entry, name: plotlyText(names[s.entry]), waveforms: s.waveforms, values: pickValues(s.waveforms) }));
    const groups: Series[] = sampled.flatMap((s) =>
      s.waveforms.groupVoltage.map((values, g) => ({
        entry: s.entry,
        name: plotlyText(`${names[s.entry]} \u00B7 ${s.e.shot.results.modules[g]?.label ?? s.e.scenario.bank[g]?.label ?? `group ${g + 1}`}`),
        waveforms: s.waveforms,
        values,
        dash: DASHES[g % DASHES.length],
      })),
    );
    const marks = endMarks(entries, names, time);
    figures.push(
      overlayFigure('plot-current', 'Total rail current', 'One colour a scenario; time from the first trigger of each shot; dotted lines mark where each shot leaves the bore.', one((w) => w.current), time, 'A', 'Current', decimate, marks),
      overlayFigure('plot-velocity', 'Armature velocity', 'Each line ends where its shot ends (muzzle exit, stall or end time).', one((w) => w.velocity), time, 'm/s', 'Velocity', decimate, marks),
      overlayFigure('plot-capacitor', 'Capacitor voltages', 'Voltage across one capacitor of each group (dashes tell the groups of one scenario apart); below zero is reversal.', groups, time, 'V', 'Voltage', decimate, marks),
      overlayFigure('plot-breech', 'Breech voltage', 'Across the rails at the breech.', one((w) => w.breechVoltage), time, 'V', 'Voltage', decimate, marks),
    );
  }
  figures.push(budgetFigure(entries, names));
  return figures;
}
