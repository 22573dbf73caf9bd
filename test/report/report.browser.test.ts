/**
 * The shot report in a real browser (Debian's Chromium via playwright-core), generated from a real shot
 * of a small scenario run by the project's solver. Checks that every plot renders, that the page makes
 * no request of any kind, and that the figures a reader sees equal the embedded results.
 */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { assessShot } from '../../src/checks/assess.js';
import { buildShotReport } from '../../src/report/html.js';
import type { ShotResults } from '../../src/solve/types.js';
import { writeNewFile } from '../../src/output/write.js';
import { launchBrowser, watchPage, type BrowserSession, type PageLog } from './browser.js';
import { parseShownFigure } from './figure-text.js';
import { benchShot } from './fixtures/bench-scenario.js';
import { fixedProvenance } from './report-input.js';

const RENDER_TIMEOUT = 120_000;
const BASE_UNIT: Record<string, string> = {
  muzzleVelocity: 'm/s',
  exitTime: 's',
  efficiency: '%',
  peakCurrent: 'A',
  peakCurrentTime: 's',
  peakAcceleration: 'm/s\u00B2',
  peakBreechVoltage: 'V',
  actionIntegral: 'A\u00B2\u00B7s',
  'energy.initial': 'J',
  'energy.kinetic': 'J',
  'energy.magneticRails': 'J',
  'energy.afterExit': 'J',
  moduleInductorEnergy: 'J',
  storedEnergy: 'J',
  maxChargeVoltage: 'V',
};

function expectedSi(results: ShotResults, key: string): number | undefined {
  switch (key) {
    case 'moduleInductorEnergy':
      return results.energy.magnetic - results.energy.magneticRails;
    case 'storedEnergy':
      return results.energy.initial;
    case 'maxChargeVoltage':
      return undefined; // a scenario figure, checked in the unit tests
    default:
      return key.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown>)[k], results) as number;
  }
}

let session: BrowserSession;
let dir: string;
let page: Page;
let log: PageLog;
let fileUrl: string;

beforeAll(async () => {
  const { scenarioRaw, scenario, shot } = benchShot();
  const assessment = assessShot(scenario, shot);
  const warnings = assessment.warnings.map((w) => w.message);
  const html = buildShotReport({ scenarioRaw, scenario, shot, provenance: fixedProvenance(), warnings, checks: assessment.checks });
  dir = mkdtempSync(join(tmpdir(), 'railpulse-report-'));
  fileUrl = pathToFileURL(writeNewFile(dir, 'bench-shot', 'html', html)).href;
  session = await launchBrowser();
  page = await session.context.newPage();
  log = watchPage(page);
  await page.goto(fileUrl);
  await page.waitForSelector('body[data-plots="rendered"]', { timeout: RENDER_TIMEOUT });
}, RENDER_TIMEOUT + 60_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('shot report in Chromium', () => {
  it('renders every plot', async () => {
    const plotDivs = await page.locator('[data-plot]').count();
    expect(plotDivs).toBe(6);
    expect(await page.locator('[data-plot].js-plotly-plot').count()).toBe(plotDivs);
    expect(await page.locator('[data-plot] .main-svg').count()).toBeGreaterThanOrEqual(plotDivs);
    const axisTitles = await page.locator('[data-plot] .xtitle').allTextContents();
    expect(axisTitles.filter((t) => /^Time \((m|µ)s\)$/.test(t)).length).toBe(5);
  });

  it('logs no error and requests nothing but the file itself (and data: URLs)', () => {
    expect(log.pageErrors).toEqual([]);
    expect(log.consoleErrors).toEqual([]);
    expect(log.requests.filter((url) => url !== fileUrl && !url.startsWith('data:'))).toEqual([]);
  });

  it('shows key figures equal to the embedded results JSON', async () => {
    // read the embedded JSON as the page holds it, not from the HTML we generated
    const embedded = JSON.parse((await page.locator('#railpulse-results').textContent()) ?? 'null') as { results: ShotResults };
    const results = embedded.results;
    const figures = await page.locator('[data-figure][data-si]').evaluateAll((elements) =>
      elements.map((e) => ({ key: e.getAttribute('data-figure')!, si: Number(e.getAttribute('data-si')), text: e.textContent! })),
    );
    expect(figures.length).toBeGreaterThanOrEqual(12);
    for (const figure of figures) {
      const expected = expectedSi(results, figure.key);
      if (expected !== undefined) expect(figure.si, figure.key).toBeCloseTo(expected, 9);
      const unit = BASE_UNIT[figure.key];
      expect(unit, `unit of ${figure.key}`).toBeDefined();
      const shown = parseShownFigure(figure.text, unit!);
      // 4 significant figures are shown
      expect(Math.abs(shown - figure.si), `${figure.key}: "${figure.text}"`).toBeLessThanOrEqual(Math.abs(figure.si) * 5.01e-4);
    }
    expect(await page.locator('[data-figure="outcome"]').getAttribute('data-value')).toBe(results.outcome);
  });

  it('the first screen shows, in this order, the safety banner, the status and the key figures (screenshot of that screen)', async () => {
    const box = async (selector: string) => (await page.locator(selector).boundingBox())!;
    const [safety, status, figures] = [await box('#safety-banner'), await box('#status'), await box('#key-figures')];
    expect(safety.y).toBeLessThan(status.y);
    expect(status.y).toBeLessThan(figures.y);
    expect(figures.y).toBeLessThan(page.viewportSize()!.height);
    const banner = (await page.locator('#safety-banner').textContent())!.replace(/\s+/g, ' ');
    // stored energy Σ ½·n·C·V0² = 4 × ½ × 400 µF × (4 kV)² + 2 × ½ × 200 µF × (3.5 kV)² = 12.80 kJ + 2.450 kJ
    expect(banner).toContain('15.25 kJ');
    expect(banner).toContain('4.000 kV');
    expect(banner).toMatch(/DOE-HDBK-1092 shock hazard and arc-flash hazard classes.*not a licence to fire/);
    mkdirSync('test-output', { recursive: true });
    await page.screenshot({ path: 'test-output/report-bench-shot.png' });
  });

  it('the status banner agrees with the checks table and the warnings: the worst of them', async () => {
    const verdicts = await page.locator('#checks tr[data-check]').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-verdict')));
    expect(verdicts.length).toBeGreaterThanOrEqual(4);
    const warnings = await page.locator('#warnings li').allTextContents();
    // the booster group has no crowbar and reverses: a warning a reader cannot miss
    expect(warnings).toEqual([expect.stringMatching(/booster: capacitor voltage reverses to/)]);
    const worst = verdicts.includes('fail') ? 'fail' : verdicts.includes('warn') || warnings.length ? 'warn' : 'pass';
    expect(await page.locator('#status').getAttribute('data-status')).toBe(worst);
    expect(await page.locator('#status .badge').textContent()).toBe(worst.toUpperCase());
    // every check that fails or warns is named in the banner
    const named = await page.locator('#status-checks li').evaluateAll((items) => items.map((i) => i.getAttribute('data-check')));
    const table = await page.locator('#checks tr[data-check]').evaluateAll((rows) => rows.filter((r) => ['fail', 'warn'].includes(r.getAttribute('data-verdict')!)).map((r) => r.getAttribute('data-check')));
    expect(named.sort()).toEqual(table.sort());
    // a hazard class reads as a class, never PASS
    expect(await page.locator('#checks tr[data-check="capacitor-arc-flash-hazard"] .verdict').textContent()).toBe('arc-flash class');
  });

  it('marks the triggers, crowbar onsets and muzzle exit on every time plot', async () => {
    const marks = await page.locator('[data-plot]').evaluateAll((plots) =>
      plots.map((p) => ({ id: p.id, texts: [...p.querySelectorAll('.annotation-text')].map((t) => t.textContent), lines: p.querySelectorAll('.shapelayer path').length })),
    );
    const timePlots = marks.filter((m) => m.id !== 'plot-budget');
    expect(timePlots).toHaveLength(5);
    for (const plot of timePlots) {
      expect(plot.texts, plot.id).toEqual(expect.arrayContaining(['trigger main (crowbarred)', 'trigger booster', 'crowbar main (crowbarred)', 'muzzle exit']));
      expect(plot.lines, plot.id).toBeGreaterThanOrEqual(4);
    }
  });

  it('ends with the full safety procedures, citing the edition of the electrical code and deferring to local rules', async () => {
    const last = await page.locator('main > section').last().getAttribute('id');
    expect(last).toBe('safety');
    const text = (await page.locator('#safety').textContent())!.replace(/\s+/g, ' ');
    expect(text).toMatch(/grounding stick/);
    expect(text).toMatch(/NFPA 70 .*2023 edition.*from memory.*600 V/);
    expect(text).toMatch(/local electrical codes, your institution's high-voltage safety rules and licensed practice/);
  });
});
