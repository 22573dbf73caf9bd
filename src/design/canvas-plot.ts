/// <reference lib="dom" />
/**
 * A small canvas renderer for the design page's figures. The figures themselves are the records' (plots.ts: same
 * traces, colours, scales and axis titles); only the drawing differs. Plotly redraws the six figures of a shot in
 * about half a second on a modest machine, too slow to follow a slider; a canvas draws them in a few milliseconds.
 * The saved record has the interactive plotly plots. Supports what plots.ts produces: lines on one or several
 * stacked y axes (domains), stacked areas (stackgroup), horizontal bars, vertical event lines, and a ghost (the
 * previous shot) drawn in light grey under the current traces.
 */

interface Trace {
  type?: string;
  name?: string;
  x?: ArrayLike<number | string | null>;
  y?: ArrayLike<number | string | null>;
  yaxis?: string;
  line?: { color?: string; width?: number };
  fill?: string;
  fillcolor?: string;
  stackgroup?: string;
  orientation?: string;
  marker?: { color?: string | string[] };
}

export interface CanvasFigure {
  data: readonly Record<string, unknown>[];
  layout: Record<string, unknown>;
}

const FONT = '12px Helvetica, Arial, sans-serif';
const GHOST = 'rgba(120,120,120,0.38)';
const PREFIXES: Record<string, number> = { p: 1e-12, n: 1e-9, '\u00B5': 1e-6, u: 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9, T: 1e12 };

/** Plot text decodes the three entities plotlyText writes. */
function text(value: unknown): string {
  return String(value ?? '').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');
}

function titleOf(axis: unknown): string {
  const title = (axis as { title?: { text?: string } } | undefined)?.title?.text;
  return text(title ?? '');
}

/** The factor that takes values on the ghost's axis ("Current (MA)") to the current axis ("Current (kA)"). */
export function unitRatio(ghostTitle: string, currentTitle: string): number {
  const inner = (title: string): string => /\(([^()]*)\)\s*$/.exec(title)?.[1] ?? '';
  const a = inner(ghostTitle);
  const b = inner(currentTitle);
  let common = 0;
  while (common < Math.min(a.length, b.length) && a[a.length - 1 - common] === b[b.length - 1 - common]) common++;
  const pa = PREFIXES[a.slice(0, a.length - common)];
  const pb = PREFIXES[b.slice(0, b.length - common)];
  return pa !== undefined && pb !== undefined ? pa / pb : 1;
}

/** Round tick steps: 1, 2, 5 × 10^k, about `count` of them over [low, high]. */
function ticks(low: number, high: number, count = 5): number[] {
  const span = high - low || Math.abs(high) || 1;
  const raw = span / count;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw) ?? 10 * power;
  const out: number[] = [];
  for (let v = Math.ceil(low / step) * step; v <= high + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

const tickText = (value: number): string => String(Number(value.toPrecision(6)));

interface Panel {
  key: string;
  top: number;
  bottom: number;
  title: string;
  min: number;
  max: number;
}

function numbers(values: ArrayLike<number | string | null> | undefined): number[] {
  const out: number[] = [];
  if (!values) return out;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    out.push(typeof v === 'number' ? v : NaN);
  }
  return out;
}

/** y values as drawn: stacked traces add the ones before them in their stack group. */
function stackedY(traces: readonly Trace[]): { trace: Trace; y: number[]; base: number[] | null }[] {
  const sums = new Map<string, number[]>();
  return traces.map((trace) => {
    const y = numbers(trace.y);
    if (!trace.stackgroup) return { trace, y, base: null };
    const below = sums.get(trace.stackgroup) ?? y.map(() => 0);
    const top = y.map((v, i) => (Number.isFinite(v) ? v : 0) + below[i]!);
    sums.set(trace.stackgroup, top);
    return { trace, y: top, base: below };
  });
}

/** Canvas widths are read once per redraw, before any canvas changes size (each read after a change forces a layout). */
const widths = new WeakMap<HTMLCanvasElement, number>();
export function measureCanvases(canvases: readonly HTMLCanvasElement[]): void {
  for (const canvas of canvases) widths.set(canvas, canvas.clientWidth || 800);
}
const widthOf = (canvas: HTMLCanvasElement): number => widths.get(canvas) ?? (canvas.clientWidth || 800);

function prepareCanvas(canvas: HTMLCanvasElement, height: number): CanvasRenderingContext2D {
  const ratio = window.devicePixelRatio || 1;
  const width = widthOf(canvas);
  if (canvas.style.height !== `${height}px`) canvas.style.height = `${height}px`;
  if (canvas.width !== Math.round(width * ratio) || canvas.height !== Math.round(height * ratio)) {
    canvas.width = Math.round(width * ratio);
    canvas.height = Math.round(height * ratio);
  }
  const context = canvas.getContext('2d')!;
  context.setTransform(ratio, 0, 0, ratio, 0, 0);
  context.clearRect(0, 0, width, height);
  context.font = FONT;
  return context;
}

/** Draw a figure (and its ghost) into a canvas. */
export function drawFigure(canvas: HTMLCanvasElement, figure: CanvasFigure, ghost: CanvasFigure | null): void {
  const traces = figure.data as readonly Trace[];
  if (traces.some((t) => t.type === 'bar')) {
    drawBars(canvas, figure, ghost);
    return;
  }
  drawLines(canvas, figure, ghost);
}

function legendRows(context: CanvasRenderingContext2D, names: { name: string; colour: string }[], width: number): number {
  let x = 0;
  let rows = 1;
  for (const entry of names) {
    const w = context.measureText(entry.name).width + 34;
    if (x + w > width && x > 0) {
      rows += 1;
      x = 0;
    }
    x += w;
  }
  return rows;
}

function drawLines(canvas: HTMLCanvasElement, figure: CanvasFigure, ghost: CanvasFigure | null): void {
  const layout = figure.layout;
  const stacked = stackedY(figure.data as readonly Trace[]);
  const legend = stacked.filter((s) => s.trace.name && !s.trace.fill?.startsWith('tonext')).map((s) => ({ name: text(s.trace.name), colour: s.trace.line?.color ?? '#111' }));
  const width = widthOf(canvas);
  const measure = canvas.getContext('2d')!;
  measure.font = FONT;
  const plotWidth = width - 80;
  const rows = legendRows(measure, legend, plotWidth);
  const baseHeight = Number(layout.height ?? 340);
  const height = baseHeight + Math.max(0, rows - 1) * 16;
  const context = prepareCanvas(canvas, height);
  const left = 72;
  const right = width - 16;
  const top = 10;
  const bottom = height - 44 - rows * 16;
  // x range over every trace, ghost included
  let xMin = Infinity;
  let xMax = -Infinity;
  for (const s of stacked) for (const v of numbers(s.trace.x)) if (Number.isFinite(v)) { xMin = Math.min(xMin, v); xMax = Math.max(xMax, v); }
  const ghostStacked = ghost ? stackedY(ghost.data as readonly Trace[]) : [];
  const xRatio = ghost ? unitRatio(titleOf(ghost.layout.xaxis), titleOf(layout.xaxis)) : 1;
  if (!(xMax > xMin)) { xMin = 0; xMax = 1; }
  const panels: Panel[] = Object.keys(layout)
    .filter((key) => /^yaxis\d*$/.test(key))
    .map((key) => {
      const axis = layout[key] as { domain?: [number, number] };
      const [d0, d1] = axis.domain ?? [0, 1];
      return { key: key === 'yaxis' ? 'y' : `y${key.slice(5)}`, top: bottom - (bottom - top) * d1, bottom: bottom - (bottom - top) * d0, title: titleOf(axis), min: Infinity, max: -Infinity };
    });
  const panelOf = (trace: Trace): Panel => panels.find((p) => p.key === (trace.yaxis ?? 'y')) ?? panels[0]!;
  const yRatio = (trace: Trace): number => {
    if (!ghost) return 1;
    const key = trace.yaxis && trace.yaxis !== 'y' ? `yaxis${trace.yaxis.slice(1)}` : 'yaxis';
    return unitRatio(titleOf(ghost.layout[key]), titleOf(layout[key]));
  };
  const extend = (panel: Panel, values: number[], ratio: number): void => {
    for (const v of values) if (Number.isFinite(v)) { panel.min = Math.min(panel.min, v * ratio); panel.max = Math.max(panel.max, v * ratio); }
  };
  for (const s of stacked) {
    extend(panelOf(s.trace), s.y, 1);
    if (s.base) extend(panelOf(s.trace), s.base, 1);
  }
  for (const s of ghostStacked) extend(panelOf(s.trace), s.y, yRatio(s.trace));
  for (const panel of panels) {
    if (!(panel.max > panel.min)) { panel.min = Math.min(0, panel.min) || 0; panel.max = panel.min + 1; }
    const pad = (panel.max - panel.min) * 0.04;
    panel.min -= pad;
    panel.max += pad;
  }
  const px = (x: number): number => left + ((x - xMin) / (xMax - xMin)) * (right - left);
  const py = (panel: Panel, y: number): number => panel.bottom - ((y - panel.min) / (panel.max - panel.min)) * (panel.bottom - panel.top);
  // grid, axes, ticks
  context.lineWidth = 1;
  context.fillStyle = '#111';
  for (const panel of panels) {
    context.strokeStyle = '#e3e3e3';
    context.textAlign = 'right';
    context.textBaseline = 'middle';
    for (const t of ticks(panel.min, panel.max, Math.max(2, Math.round((panel.bottom - panel.top) / 50)))) {
      const y = py(panel, t);
      context.strokeStyle = t === 0 ? '#9a9a9a' : '#e3e3e3';
      context.beginPath(); context.moveTo(left, y); context.lineTo(right, y); context.stroke();
      context.fillText(tickText(t), left - 6, y);
    }
    context.strokeStyle = '#222';
    context.strokeRect(left, panel.top, right - left, panel.bottom - panel.top);
    context.save();
    context.translate(14, (panel.top + panel.bottom) / 2);
    context.rotate(-Math.PI / 2);
    context.textAlign = 'center';
    context.fillText(panel.title, 0, 0);
    context.restore();
  }
  context.textAlign = 'center';
  context.textBaseline = 'top';
  const lowest = panels.reduce((a, p) => Math.max(a, p.bottom), 0);
  for (const t of ticks(xMin, xMax, Math.max(3, Math.round((right - left) / 90)))) {
    const x = px(t);
    context.strokeStyle = '#e3e3e3';
    for (const panel of panels) { context.beginPath(); context.moveTo(x, panel.top); context.lineTo(x, panel.bottom); context.stroke(); }
    context.fillText(tickText(t), x, lowest + 5);
  }
  context.fillText(titleOf(layout.xaxis), (left + right) / 2, lowest + 22);
  // event marks: the vertical lines of the layout's shapes
  context.save();
  context.setLineDash([3, 3]);
  context.strokeStyle = 'rgba(60,60,60,0.35)';
  for (const shape of (layout.shapes as { type?: string; x0?: number; xref?: string }[] | undefined) ?? []) {
    if (shape.type !== 'line' || typeof shape.x0 !== 'number' || shape.xref === 'paper') continue;
    const x = px(shape.x0);
    context.beginPath(); context.moveTo(x, top); context.lineTo(x, lowest); context.stroke();
  }
  context.restore();
  const path = (xs: number[], ys: number[], panel: Panel, ratioX: number, ratioY: number): void => {
    context.beginPath();
    let pen = false;
    for (let i = 0; i < xs.length; i++) {
      const x = xs[i]! * ratioX;
      const y = ys[i]! * ratioY;
      if (!Number.isFinite(x) || !Number.isFinite(y)) { pen = false; continue; }
      if (pen) context.lineTo(px(x), py(panel, y)); else context.moveTo(px(x), py(panel, y));
      pen = true;
    }
  };
  context.save();
  for (const panel of panels) {
    context.save();
    context.beginPath();
    context.rect(left, panel.top, right - left, panel.bottom - panel.top);
    context.clip();
    // ghost first, underneath: solid and light (dashed paths cost several times more to rasterise)
    context.lineWidth = 2.2;
    context.strokeStyle = GHOST;
    for (const s of ghostStacked) {
      if (panelOf(s.trace) !== panel || s.trace.fill?.startsWith('tonext')) continue;
      path(numbers(s.trace.x), s.y, panel, xRatio, yRatio(s.trace));
      context.stroke();
    }
    context.setLineDash([]);
    for (const s of stacked) {
      if (panelOf(s.trace) !== panel) continue;
      const xs = numbers(s.trace.x);
      if (s.base || s.trace.fill) {
        // a stacked area, or an uncertainty band (filled to the trace before it)
        const base = s.base ?? numbers((stacked[stacked.indexOf(s) - 1]?.trace.y) ?? []);
        context.beginPath();
        for (let i = 0; i < xs.length; i++) context.lineTo(px(xs[i]!), py(panel, s.y[i]!));
        for (let i = xs.length - 1; i >= 0; i--) context.lineTo(px(xs[i]!), py(panel, Number.isFinite(base[i]!) ? base[i]! : 0));
        context.closePath();
        context.fillStyle = s.trace.fillcolor ?? 'rgba(31,59,115,0.2)';
        context.fill();
        if (!s.base) continue;
      }
      context.strokeStyle = s.trace.line?.color ?? '#111';
      context.lineWidth = s.trace.line?.width ?? 1.6;
      path(xs, s.y, panel, 1, 1);
      context.stroke();
    }
    context.restore();
  }
  context.restore();
  // legend under the plot
  let lx = left;
  let ly = height - rows * 16 - 4;
  context.textAlign = 'left';
  context.textBaseline = 'middle';
  for (const entry of legend) {
    const w = context.measureText(entry.name).width + 34;
    if (lx + w > right && lx > left) { lx = left; ly += 16; }
    context.strokeStyle = entry.colour;
    context.lineWidth = 2.5;
    context.beginPath(); context.moveTo(lx, ly + 6); context.lineTo(lx + 22, ly + 6); context.stroke();
    context.fillStyle = '#111';
    context.fillText(entry.name, lx + 26, ly + 6);
    lx += w;
  }
}

function drawBars(canvas: HTMLCanvasElement, figure: CanvasFigure, previous: CanvasFigure | null): void {
  const bars = (figure.data as readonly Trace[]).find((t) => t.type === 'bar')!;
  const labels = Array.from(bars.y ?? [], (v) => text(v));
  const values = numbers(bars.x);
  const ghost = ((previous?.data ?? []) as readonly Trace[]).find((t) => t.type === 'bar');
  const ratio = previous ? unitRatio(titleOf(previous.layout.xaxis), titleOf(figure.layout.xaxis)) : 1;
  const ghostValues = ghost ? numbers(ghost.x).map((v) => v * ratio) : [];
  const ghostByLabel = new Map(Array.from(ghost?.y ?? [], (label, i) => [text(label), ghostValues[i]!] as const));
  const row = 22;
  const height = labels.length * row + 56;
  const context = prepareCanvas(canvas, height);
  const width = widthOf(canvas);
  const labelWidth = Math.min(width * 0.5, Math.max(...labels.map((l) => context.measureText(l).width)) + 12);
  const left = labelWidth;
  const right = width - 16;
  const all = [...values, ...ghostByLabel.values()].filter(Number.isFinite);
  const low = Math.min(0, ...all);
  const high = Math.max(0, ...all) || 1;
  const px = (v: number): number => left + ((v - low) / (high - low)) * (right - left);
  const colours = bars.marker?.color;
  context.textBaseline = 'middle';
  labels.forEach((label, i) => {
    const y = 8 + i * row;
    context.fillStyle = '#111';
    context.textAlign = 'right';
    context.fillText(label, left - 6, y + row / 2);
    const value = values[i]!;
    context.fillStyle = Array.isArray(colours) ? colours[i] ?? '#1f3b73' : colours ?? '#1f3b73';
    if (Number.isFinite(value)) context.fillRect(Math.min(px(0), px(value)), y + 4, Math.abs(px(value) - px(0)), row - 8);
    const before = ghostByLabel.get(label);
    if (before !== undefined && Number.isFinite(before)) {
      context.save();
      context.setLineDash([2, 3]);
      context.strokeStyle = GHOST;
      context.lineWidth = 1.5;
      context.strokeRect(Math.min(px(0), px(before)), y + 2, Math.abs(px(before) - px(0)), row - 4);
      context.restore();
    }
  });
  context.strokeStyle = '#222';
  context.beginPath(); context.moveTo(px(0), 4); context.lineTo(px(0), 8 + labels.length * row); context.stroke();
  context.fillStyle = '#111';
  context.textAlign = 'center';
  context.textBaseline = 'top';
  for (const t of ticks(low, high, 5)) context.fillText(tickText(t), px(t), 12 + labels.length * row);
  context.fillText(titleOf(figure.layout.xaxis), (left + right) / 2, 30 + labels.length * row);
}
