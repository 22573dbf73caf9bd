/**
 * The comparison report builder, on real shots of an invented bench scenario ("Larkspur bench") run by the
 * project's solver: which inputs are highlighted as different, which output is marked better, escaping of
 * user text, and the embedded JSON.
 */
import { describe, expect, it } from 'vitest';
import {
  betterIndices,
  buildComparisonReport,
  comparedInputRows,
  comparisonBaseName,
  marginOf,
  COMPARISON_ELEMENT_ID,
  COMPARISON_FORMAT,
  COMPARISON_PLOTS_ID,
  type ComparisonEntry,
} from '../../src/report/compare.js';
import { readJsonScriptElement } from '../../src/report/escape.js';
import { plotlyBundleSource } from '../../src/report/plotly-bundle.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import type { ShotResults } from '../../src/solve/types.js';
import { benchScenarioRaw } from './fixtures/bench-scenario.js';

const PROVENANCE = { toolVersion: '0.1.0', nodeVersion: 'v20.20.2', date: '2026-12-02T10:00:00.000Z' };

function entry(file: string, raw: Record<string, unknown>, waveforms = false): ComparisonEntry {
  const scenario = scenarioFromRaw(structuredClone(raw));
  return { file, scenarioRaw: raw, scenario, shot: runShot(scenario, { waveforms }), sha256: 'ab'.repeat(32) };
}

function setIn(raw: Record<string, unknown>, path: string[], value: unknown): Record<string, unknown> {
  const copy = structuredClone(raw);
  let node = copy as Record<string, unknown>;
  for (const key of path.slice(0, -1)) node = node[key] as Record<string, unknown>;
  node[path[path.length - 1]!] = value;
  return copy;
}

/** The report without the inlined plotly bundle, for searching our own markup. */
const ownMarkup = (html: string): string => html.replace(plotlyBundleSource(), '');

// Base, a heavier armature, and the same feed inductance written in other units (not a difference).
const baseRaw = benchScenarioRaw('Larkspur base');
const heavyRaw = setIn(setIn(benchScenarioRaw('Larkspur heavy'), ['armature', 'mass'], '10 g'), ['feed', 'inductance'], '400 nH');
const base = entry('scenarios/base.json', baseRaw);
const heavy = entry('scenarios/heavy.json', heavyRaw);

function differingPaths(html: string): string[] {
  return [...ownMarkup(html).matchAll(/<tr data-path="([^"]*)" class="differs" data-differs="true">/g)].map((m) => m[1]!);
}

function markedEntries(html: string, key: string): number[] {
  const row = new RegExp(`<tr data-output="${key}"[^>]*>(.*?)</tr>`).exec(ownMarkup(html))?.[1];
  if (!row) throw new Error(`no output row ${key}`);
  const cells = [...row.matchAll(/<td([^>]*)>/g)].slice(2); // figure label and direction first
  return cells.flatMap((cell, i) => (cell[1]!.includes('data-better="true"') ? [i] : []));
}

describe('comparison report: inputs', () => {
  it('highlights exactly the inputs whose values differ; the same value written in other units does not count', () => {
    const html = buildComparisonReport([base, heavy], PROVENANCE);
    // 0.4 µH and 400 nH are one SI value (4e-7 H); name and mass are the only changes made above
    expect(differingPaths(html).sort()).toEqual(['armature.mass', 'name']);
    expect(html).toMatch(/id="differences-summary">2 of \d+ inputs differ/);
    const rows = comparedInputRows([base, heavy]);
    const feed = rows.find((r) => r.path === 'feed.inductance')!;
    expect(feed.cells.map((c) => c.written)).toEqual(['0.4 uH', '400 nH']);
    expect(feed.differs).toBe(false);
  });

  it('marks a path present in only one scenario (an extra module group) as a difference', () => {
    const extraRaw = structuredClone(baseRaw);
    (extraRaw['bank'] as unknown[]).push({ label: 'third', count: 1, capacitance: '100 uF', voltage: '3 kV', inductance: '10 uH', trigger: '200 us' });
    const rows = comparedInputRows([base, { ...base, scenarioRaw: extraRaw, scenario: scenarioFromRaw(structuredClone(extraRaw)) }]);
    const third = rows.filter((r) => r.path.startsWith('bank[2]'));
    expect(third.length).toBeGreaterThan(5);
    expect(third.every((r) => r.differs && !r.cells[0]!.present && r.cells[1]!.present)).toBe(true);
    expect(rows.filter((r) => r.differs && !r.path.startsWith('bank[2]'))).toEqual([]);
  });
});

describe('comparison report: outputs', () => {
  it('marks "better" only where it is defined: higher muzzle velocity and efficiency, never a lower peak figure', () => {
    const html = buildComparisonReport([base, heavy], PROVENANCE);
    const a = base.shot.results;
    const b = heavy.shot.results;
    // Same bank and rails, twice the mass: by the work-energy theorem ½mv² = ∫F dx over the same rails, and the
    // force ½L'I² changes little, so the heavier armature leaves slower and the light one is marked better.
    expect(b.muzzleVelocity).toBeLessThan(a.muzzleVelocity);
    const tie = (x: number, y: number): boolean => Math.abs(x - y) <= 1e-3 * Math.max(Math.abs(x), Math.abs(y));
    const higherOf = (f: (r: ShotResults) => number): number[] => (tie(f(a), f(b)) ? [] : f(a) > f(b) ? [0] : [1]);
    expect(markedEntries(html, 'muzzleVelocity')).toEqual([0]);
    expect(markedEntries(html, 'efficiency')).toEqual(higherOf((r) => r.efficiency));
    // a lower peak current, acceleration, action or arc energy is not better in itself (the weakest shot has them)
    for (const key of ['peakCurrent', 'peakAcceleration', 'actionIntegral', 'arcEnergy', 'exitTime', 'maxReversal']) {
      expect(markedEntries(html, key), key).toEqual([]);
      expect(ownMarkup(html)).toMatch(new RegExp(`data-output="${key}" data-direction="none"><td>[^<]*</td><td class="note">for reference`));
    }
    expect(ownMarkup(html)).toMatch(/data-output="muzzleVelocity" data-direction="higher"><td>Muzzle velocity<\/td><td class="note">higher is better/);
  });

  it('states the efficiency difference in percentage points and other differences as relative changes', () => {
    const html = ownMarkup(buildComparisonReport([base, heavy], PROVENANCE));
    const a = base.shot.results;
    const b = heavy.shot.results;
    const row = (key: string): string => new RegExp(`<tr data-output="${key}"[^>]*>(.*?)</tr>`).exec(html)![1]!;
    const points = (b.efficiency - a.efficiency) * 100;
    const shownPoints = Number(/data-difference>([+-][\d.]+)\u00A0percentage points/.exec(row('efficiency'))![1]);
    expect(shownPoints).toBeCloseTo(points, 3);
    const relative = ((b.muzzleVelocity - a.muzzleVelocity) / a.muzzleVelocity) * 100;
    const shownRelative = Number(/data-difference>([+-][\d.]+)\u00A0%/.exec(row('muzzleVelocity'))![1]);
    expect(shownRelative / relative).toBeCloseTo(1, 3);
  });

  it('margins to the limits: (limit − value)/limit for a maximum, (value − limit)/limit for a minimum; more is better', () => {
    expect(marginOf({ value: 80, limit: 100, direction: 'at-most' })).toBeCloseTo(0.2, 12);
    expect(marginOf({ value: 120, limit: 100, direction: 'at-most' })).toBeCloseTo(-0.2, 12);
    expect(marginOf({ value: 150, limit: 100, direction: 'at-least' })).toBeCloseTo(0.5, 12);
    expect(marginOf({ value: 1, limit: null, direction: 'at-most' })).toBeNull();
    expect(marginOf({ value: 1, limit: 10, direction: null })).toBeNull();
    const checked = (e: ComparisonEntry, limit: number): ComparisonEntry => ({
      ...e,
      checks: [{ id: 'peak-acceleration', title: 'Peak acceleration', verdict: 'pass', value: e.shot.results.peakAcceleration, limit, direction: 'at-most', unit: 'm/s\u00B2', source: 'test' }],
    });
    const limit = 1.01 * Math.max(base.shot.results.peakAcceleration, heavy.shot.results.peakAcceleration);
    const html = buildComparisonReport([checked(base, limit), checked(heavy, limit)], PROVENANCE);
    const lower = base.shot.results.peakAcceleration < heavy.shot.results.peakAcceleration ? 0 : 1;
    const row = new RegExp('<tr data-margin="peak-acceleration">(.*?)</tr>').exec(ownMarkup(html))![1]!;
    const cells = [...row.matchAll(/<td([^>]*)>/g)].slice(2);
    expect(cells.flatMap((c, i) => (c[1]!.includes('data-better="true"') ? [i] : []))).toEqual([lower]);
  });

  it('betterIndices: highest or lowest, ties (within 0.1 %) all marked, nothing when all tie, nulls never marked', () => {
    expect(betterIndices([3, 5, 4], 'higher')).toEqual([1]);
    expect(betterIndices([3, 5, 4], 'lower')).toEqual([0]);
    expect(betterIndices([5, 3, 5], 'higher')).toEqual([0, 2]);
    expect(betterIndices([2, 2], 'lower')).toEqual([]);
    expect(betterIndices([null, 1, 2], 'lower')).toEqual([1]);
    expect(betterIndices([null, 7], 'higher')).toEqual([1]);
    expect(betterIndices([1, 2], 'none')).toEqual([]);
    expect(betterIndices([0, 0.2], 'lower')).toEqual([0]); // no reversal beats 20 % reversal
    expect(betterIndices([1000, 1000.5, 1200], 'lower')).toEqual([0, 1]); // 0.05 % apart: a tie
    expect(betterIndices([1000, 1000.5], 'higher')).toEqual([]);
  });

  it('does not mark a stalled shot as having the better muzzle velocity', () => {
    // 5 kg on this bench cannot leave 1 m of rails: the shot ends in the bore
    const stalled = entry('stalled.json', setIn(benchScenarioRaw('Larkspur anvil'), ['armature', 'mass'], '5 kg'));
    expect(stalled.shot.results.outcome).not.toBe('exited');
    const html = buildComparisonReport([stalled, base], PROVENANCE);
    expect(markedEntries(html, 'muzzleVelocity')).toEqual([1]);
    expect(ownMarkup(html)).toContain('(no exit)');
  });
});

describe('comparison report: escaping, embedded data, plots, name', () => {
  const hostileRaw = setIn(benchScenarioRaw('<script>alert(1)</script> & "q"'), ['description'], '</script><img src=x onerror=alert(2)>');
  const hostile = { ...entry('odd <dir>/b&c.json', hostileRaw, true), warnings: ['lead says <b>bold</b>'] };
  const html = buildComparisonReport([{ ...base, shot: runShot(base.scenario) }, hostile], PROVENANCE);

  it('shows user text as text, never as markup', () => {
    const own = ownMarkup(html);
    expect(own).not.toContain('<script>alert(1)');
    expect(own).not.toContain('<img src=x');
    expect(own).not.toContain('<b>bold</b>');
    expect(own).toContain('&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;q&quot;');
    expect(own).toContain('odd &lt;dir&gt;/b&amp;c.json');
    expect(own).toContain('lead says &lt;b&gt;bold&lt;/b&gt;');
    // only our own script elements: embedded data, plot data, plotly, page script
    expect(own.match(/<script/g)!.length).toBe(4);
  });

  it('embeds the scenarios as written and the results, readable back exactly', () => {
    const block = readJsonScriptElement(html, COMPARISON_ELEMENT_ID) as {
      format: string;
      scenarios: Array<{ file: string; name: string; scenarioRaw: unknown; results: ShotResults }>;
    };
    expect(block.format).toBe(COMPARISON_FORMAT);
    expect(block.scenarios.map((s) => s.file)).toEqual(['scenarios/base.json', 'odd <dir>/b&c.json']);
    expect(block.scenarios[1]!.scenarioRaw).toEqual(hostileRaw);
    expect(block.scenarios[1]!.results).toEqual(JSON.parse(JSON.stringify(hostile.shot.results)));
  });

  it('has the overlaid waveforms, one trace a scenario (a group per scenario for capacitor voltages), and grouped budget bars', () => {
    const plots = readJsonScriptElement(html, COMPARISON_PLOTS_ID) as Array<{ id: string; data: Array<{ name: string; x: unknown[] }>; layout: Record<string, unknown> }>;
    expect(plots.map((p) => p.id)).toEqual(['plot-current', 'plot-velocity', 'plot-capacitor', 'plot-breech', 'plot-budget']);
    const byId = new Map(plots.map((p) => [p.id, p]));
    expect(byId.get('plot-current')!.data.map((t) => t.name)).toEqual(['1: Larkspur base', '2: &lt;script&gt;alert(1)&lt;/script&gt; &amp; "q"']);
    expect(byId.get('plot-capacitor')!.data).toHaveLength(4); // two groups in each bench scenario
    expect(byId.get('plot-budget')!.layout['barmode']).toBe('group');
    expect(byId.get('plot-budget')!.data).toHaveLength(2);
    // decimated to the default target: a few thousand points a trace, not the 20,000 samples of a 10 ms shot at 0.5 µs
    for (const trace of byId.get('plot-current')!.data) expect(trace.x.length).toBeLessThanOrEqual(4000);
  });

  it('names the file DATE_compare_SLUG_HASH', () => {
    expect(comparisonBaseName('2026-12-02T23:59:00Z', ['Bay 2', 'Bay 2 (heavy)'], 'EAC5130A99')).toBe('2026-12-02_compare_bay-2-vs-bay-2-heavy_eac5130a');
  });
});
