/// <reference lib="dom" />
/// <reference lib="dom.iterable" />
/**
 * The design page in the browser: controls for every numeric quantity of the scenario; each change reloads the
 * scenario through the CLI's loader, simulates, assesses and redraws, with the previous shot as a ghost on every
 * plot. A bad entry shows the CLI's message beside its control and the last good shot stays drawn.
 */
import { InputError } from '../core/errors.js';
import type { AssessedShot } from '../pipeline/shoot.js';
import { inFile } from '../pipeline/shoot.js';
import { escapeHtml } from '../report/escape.js';
import { shotFigures, type PlotFigure } from '../report/plots.js';
import { safetyBanner } from '../report/safety.js';
import { bankOnPage, budgetTable, figuresSection } from '../report/shot-record.js';
import { statusBanner } from '../report/status.js';
import { checksSection } from '../report/tables.js';
import { parseJson } from '../scenario/load.js';
import { designRecord, designResults, designShot, loadDesign, scenarioText, type PageEnvironment } from './engine.js';
import { drawFigure, measureCanvases } from './canvas-plot.js';
import { controlGroups, enteredValue, roundedNumber, sliderSpan, splitWritten, withValue, type NumericControl } from './fields.js';

interface DesignData {
  file: string;
  source: string;
}

const data = JSON.parse(document.getElementById('railpulse-design')!.textContent!) as DesignData;
const HISTORY_LIMIT = 200;

/** The scenario as last simulated without error, and its shot. */
let committed: { raw: Record<string, unknown>; shot: AssessedShot };
/** The shot before the last change: drawn as a ghost. */
let ghost: AssessedShot | null = null;
const history: Record<string, unknown>[] = [];
let shotsDrawn = 0;

function environment(): PageEnvironment {
  const chromium = /(?:Chrome|Chromium)\/([\d.]+)/.exec(navigator.userAgent);
  const date = new Date(Math.floor(Date.now() / 1000) * 1000).toISOString();
  return { runtime: `browser (${chromium ? `Chromium ${chromium[1]}` : navigator.userAgent}): railpulse design page`, date };
}

/** Load and shoot a scenario object; throws the loader's InputError (with the file name, as the CLI says it). */
function simulate(raw: Record<string, unknown>): AssessedShot {
  const started = performance.now();
  const shot = inFile(data.file, () => designShot(loadDesign(raw, data.file), environment()));
  document.body.setAttribute('data-simulate-ms', (performance.now() - started).toFixed(1));
  return shot;
}

// ---------- drawing ----------

const figureCache = new WeakMap<AssessedShot, PlotFigure[]>();

/** The record's figures of a shot (computed once: the shot is drawn again as the next one's ghost). */
function figuresOf(assessed: AssessedShot): PlotFigure[] {
  const cached = figureCache.get(assessed);
  if (cached) return cached;
  const figures = shotFigures(assessed.scenario, assessed.shot.results, assessed.shot.waveforms, { target: 700, max: 1000 }, assessed.shot.events);
  figureCache.set(assessed, figures);
  return figures;
}

function ensurePlotBlocks(figures: PlotFigure[]): void {
  const holder = document.getElementById('design-plots')!;
  for (const figure of figures) {
    if (document.getElementById(figure.id)) continue;
    const block = document.createElement('div');
    block.className = 'plot-block';
    block.innerHTML = `<h3>${escapeHtml(figure.title)}</h3><p class="caption">${escapeHtml(figure.caption)} Light grey: the shot before the last change. The saved record has these plots with zoom and hover.</p><canvas class="plot-canvas" id="${figure.id}" role="img" aria-label="${escapeHtml(figure.title)}"></canvas>${figure.id === 'plot-budget' ? '<div id="design-budget"></div>' : ''}`;
    holder.appendChild(block);
  }
}

/** Replace an element's content only when it changed: the page is laid out again only where something moved. */
const shownHtml = new Map<string, string>();
function setHtml(id: string, html: string): void {
  if (shownHtml.get(id) === html) return;
  shownHtml.set(id, html);
  document.getElementById(id)!.innerHTML = html;
}

function draw(current: AssessedShot, previous: AssessedShot | null): void {
  const { results } = current.shot;
  const started = performance.now();
  setHtml('design-safety', safetyBanner([bankOnPage(current.scenario)]));
  setHtml('design-status', statusBanner(current.assessment.checks, current.assessment.warnings.map((w) => w.message)));
  setHtml('design-figures', figuresSection(results));
  setHtml('design-checks', checksSection(current.assessment.checks));
  document.getElementById('design-results')!.textContent = JSON.stringify(designResults(current));
  const tables = performance.now();
  const figures = figuresOf(current);
  const before = previous ? new Map(figuresOf(previous).map((f) => [f.id, f])) : new Map<string, PlotFigure>();
  ensurePlotBlocks(figures);
  setHtml('design-budget', budgetTable(results));
  const prepared = performance.now();
  const canvases = figures.map((f) => document.getElementById(f.id) as HTMLCanvasElement);
  measureCanvases(canvases);
  figures.forEach((f, i) => drawFigure(canvases[i]!, f, before.get(f.id) ?? null));
  const split = [tables - started, prepared - tables, performance.now() - prepared].map((ms) => ms.toFixed(1));
  // where the drawing time goes, for bench/design.ts: text and tables, the records' figures, the canvases
  document.body.setAttribute('data-draw-split', split.join(' '));
  shotsDrawn += 1;
  document.body.setAttribute('data-shots', String(shotsDrawn));
}

// ---------- controls ----------

function setState(text: string, error = false): void {
  const state = document.getElementById('design-state')!;
  state.textContent = text;
  state.className = error ? 'state error' : 'state';
  document.body.setAttribute('data-state', error ? 'error' : 'drawn');
}

function clearErrors(): void {
  for (const message of document.querySelectorAll<HTMLElement>('.control .message')) message.textContent = '';
  for (const control of document.querySelectorAll<HTMLElement>('.control.bad')) control.classList.remove('bad');
}

/** Show an InputError beside the control it names (or under the header when no control does). */
function showError(error: unknown): void {
  const line = error instanceof InputError ? error.line() : `internal error: ${error instanceof Error ? error.message : String(error)}`;
  const where = error instanceof InputError ? error.where : '';
  const control = [...document.querySelectorAll<HTMLElement>('.control')].find((element) => element.dataset.path === where);
  if (control) {
    control.classList.add('bad');
    control.querySelector('.message')!.textContent = line;
  }
  setState(`${control ? 'Not simulated (see the entry marked in red)' : line}; the last good shot stays drawn.`, true);
}

async function show(next: AssessedShot, previous: AssessedShot | null): Promise<void> {
  const started = performance.now();
  draw(next, previous);
  const drawing = performance.now() - started;
  document.body.setAttribute('data-draw-ms', drawing.toFixed(1));
  setState(`Shot ${shotsDrawn} drawn (simulated in ${document.body.getAttribute('data-simulate-ms')} ms, drawn in ${drawing.toFixed(0)} ms).`);
}

/** Simulate a new scenario object and make it the current one; a bad one leaves everything as it was. */
async function commit(raw: Record<string, unknown>, rebuild = false): Promise<boolean> {
  let next: AssessedShot;
  try {
    next = simulate(raw);
  } catch (error) {
    showError(error);
    return false;
  }
  clearErrors();
  history.push(committed.raw);
  if (history.length > HISTORY_LIMIT) history.shift();
  ghost = committed.shot;
  committed = { raw, shot: next };
  if (rebuild) buildControls();
  updateUndo();
  await show(next, ghost);
  return true;
}

/** A slider being dragged: simulate and draw without touching the history (the release commits). */
async function preview(raw: Record<string, unknown>): Promise<void> {
  try {
    const next = simulate(raw);
    clearErrors();
    await show(next, committed.shot);
  } catch (error) {
    showError(error);
  }
}

async function undo(): Promise<void> {
  const raw = history.pop();
  if (!raw) return;
  try {
    const next = simulate(raw);
    ghost = committed.shot;
    committed = { raw, shot: next };
    clearErrors();
    buildControls();
    updateUndo();
    await show(next, ghost);
  } catch (error) {
    showError(error);
  }
}

function updateUndo(): void {
  (document.getElementById('design-undo') as HTMLButtonElement).disabled = history.length === 0;
}

function labelOf(control: NumericControl): string {
  const unitText = control.field.kind === 'quantity' && control.field.dimension.si ? ` [${control.field.dimension.si}]` : '';
  return `${control.key}${unitText}`;
}

function controlElement(control: NumericControl, siblings: number[]): HTMLElement {
  const element = document.createElement('div');
  element.className = 'control';
  element.dataset.path = control.path;
  const defaultText = control.field.default === undefined ? '' : ` (default ${control.field.default} SI)`;
  element.innerHTML = `<label><span class="name" title="${escapeHtml(control.field.description)}">${escapeHtml(labelOf(control))}</span>
<input type="text" class="entry" spellcheck="false" aria-label="${escapeHtml(control.path)}"></label>
<input type="range" class="slider" min="0" max="1000" step="1" aria-label="${escapeHtml(control.path)} slider"><div class="message" role="alert"></div>`;
  const entry = element.querySelector<HTMLInputElement>('.entry')!;
  const slider = element.querySelector<HTMLInputElement>('.slider')!;
  entry.value = control.written === undefined ? '' : String(control.written);
  entry.placeholder = control.written === undefined ? `not given${defaultText}` : '';
  let span = { min: 0, max: 1, log: false };
  let unit = '';
  const place = (): void => {
    const split = splitWritten(enteredValue(entry.value));
    slider.disabled = split === null;
    if (!split) return;
    unit = split.unit;
    span = sliderSpan(split.number, siblings);
    if (control.field.kind === 'integer') span = { min: Math.max(1, Math.floor(span.min)), max: Math.max(2, Math.ceil(span.max)), log: false };
    slider.value = String(Math.round(1000 * fraction(split.number)));
  };
  const fraction = (value: number): number =>
    span.log ? Math.log(value / span.min) / Math.log(span.max / span.min) : (value - span.min) / (span.max - span.min);
  const sliderText = (): string => {
    const at = Number(slider.value) / 1000;
    const value = span.log ? span.min * (span.max / span.min) ** at : span.min + at * (span.max - span.min);
    const number = control.field.kind === 'integer' ? Math.round(value) : roundedNumber(value);
    return unit ? `${number} ${unit}` : String(number);
  };
  place();
  entry.addEventListener('change', () => {
    void commit(withValue(committed.raw, control.path, enteredValue(entry.value))).then((ok) => ok && place());
  });
  let dragStart: Record<string, unknown> | null = null;
  slider.addEventListener('input', () => {
    dragStart ??= committed.raw;
    entry.value = sliderText();
    schedule(() => preview(withValue(dragStart!, control.path, enteredValue(entry.value))));
  });
  slider.addEventListener('change', () => {
    const start = dragStart ?? committed.raw;
    dragStart = null;
    entry.value = sliderText();
    schedule(() => commit(withValue(start, control.path, enteredValue(entry.value))).then((ok) => ok && place()));
  });
  return element;
}

/** One simulation at a time; while one runs, only the latest request waits. */
let running: Promise<unknown> | null = null;
let waiting: (() => Promise<unknown>) | null = null;
function schedule(work: () => Promise<unknown>): void {
  if (running) {
    waiting = work;
    return;
  }
  running = work().finally(() => {
    running = null;
    const next = waiting;
    waiting = null;
    if (next) schedule(next);
  });
}

function bankOf(raw: Record<string, unknown>): Record<string, unknown>[] {
  return raw.bank as Record<string, unknown>[];
}

function groupButtons(index: number): HTMLElement {
  const bar = document.createElement('div');
  bar.className = 'group-buttons';
  const button = (text: string, action: () => Record<string, unknown>, disabled = false): void => {
    const element = document.createElement('button');
    element.type = 'button';
    element.textContent = text;
    element.disabled = disabled;
    element.dataset.action = text.toLowerCase();
    element.addEventListener('click', () => schedule(() => commit(action(), true)));
    bar.appendChild(element);
  };
  button('Duplicate', () => {
    const raw = structuredClone(committed.raw);
    const copy = structuredClone(bankOf(raw)[index]!);
    copy.label = `${String(copy.label ?? `group ${index + 1}`)} copy`;
    bankOf(raw).splice(index + 1, 0, copy);
    return raw;
  });
  button('Remove', () => {
    const raw = structuredClone(committed.raw);
    bankOf(raw).splice(index, 1);
    return raw;
  }, bankOf(committed.raw).length <= 1);
  return bar;
}

function buildControls(): void {
  const holder = document.getElementById('design-controls')!;
  holder.replaceChildren();
  const groups = controlGroups(committed.raw);
  const siblings = (control: NumericControl): number[] => {
    const key = control.path.replace(/^bank\[\d+\]/, '');
    if (key === control.path) return [];
    return bankOf(committed.raw).flatMap((group) => {
      const split = splitWritten(key.split('.').filter(Boolean).reduce<unknown>((node, part) => (node as Record<string, unknown> | undefined)?.[part], group));
      return split ? [split.number] : [];
    });
  };
  for (const group of groups) {
    const set = document.createElement('fieldset');
    set.className = 'control-group';
    set.dataset.section = group.path;
    const bankIndex = /^bank\[(\d+)\]$/.exec(group.path);
    const label = bankIndex ? `${group.path} \u00B7 ${String(bankOf(committed.raw)[Number(bankIndex[1])]!.label ?? `group ${Number(bankIndex[1]) + 1}`)}` : group.path;
    set.innerHTML = `<legend>${escapeHtml(label)}</legend>`;
    if (bankIndex) set.appendChild(groupButtons(Number(bankIndex[1])));
    for (const control of group.controls) set.appendChild(controlElement(control, siblings(control)));
    holder.appendChild(set);
  }
  const add = document.createElement('button');
  add.type = 'button';
  add.id = 'design-add-group';
  add.textContent = 'Add a group';
  add.addEventListener('click', () =>
    schedule(() => {
      const raw = structuredClone(committed.raw);
      const bank = bankOf(raw);
      const copy = structuredClone(bank[bank.length - 1]!);
      copy.label = `group ${bank.length + 1}`;
      bank.push(copy);
      return commit(raw, true);
    }),
  );
  holder.appendChild(add);
}

// ---------- saving ----------

function download(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const link = document.createElement('a');
  link.href = url;
  link.download = name;
  document.body.appendChild(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}

function baseName(): string {
  return data.file.replace(/^.*[\\/]/, '').replace(/\.json$/i, '');
}

async function saveRecord(): Promise<void> {
  try {
    setState('Building the record (with the propagation of the tolerances, as run does)…');
    const html = await designRecord(committed.shot, document.getElementById('railpulse-plotly')!.textContent!);
    download(`${baseName()}-design-record.html`, html, 'text/html');
    setState(`Record of shot ${shotsDrawn} saved.`);
  } catch (error) {
    showError(error);
  }
}

// ---------- start ----------

async function start(): Promise<void> {
  const raw = parseJson(data.source, data.file);
  const first = simulate(raw);
  committed = { raw, shot: first };
  buildControls();
  updateUndo();
  document.getElementById('design-undo')!.addEventListener('click', () => schedule(undo));
  document.getElementById('design-save-scenario')!.addEventListener('click', () => download(`${baseName()}-design.json`, scenarioText(committed.raw), 'application/json'));
  document.getElementById('design-save-record')!.addEventListener('click', () => schedule(saveRecord));
  await show(first, null);
}

start().catch((error: unknown) => {
  showError(error);
  document.body.setAttribute('data-state', 'failed');
});
