/**
 * The comparison report in Chromium, written by the real CLI (`railpulse compare`, built into dist/ by the
 * global setup) from two demo scenarios and a variant with a hostile name. Every plot renders, the page logs
 * no error and requests nothing, the legend shows user text literally, and the "only differences" filter works.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, watchPage, type BrowserSession, type PageLog } from './browser.js';

const CLI = resolve('bin/railpulse.js');
const HOSTILE_NAME = 'Bay 2 <i>heavy</i> & "long"';
const RENDER_TIMEOUT = 120_000;

let session: BrowserSession;
let dir: string;
let page: Page;
let log: PageLog;
let fileUrl: string;
let stdout: string;

function railpulse(args: string[], cwd = process.cwd()): string {
  return execFileSync(process.execPath, [CLI, ...args], { cwd, encoding: 'utf8', env: { ...process.env, SOURCE_DATE_EPOCH: '1796198400' } });
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-compare-'));
  const heavy = JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8')) as Record<string, Record<string, unknown>>;
  heavy['name'] = HOSTILE_NAME as unknown as Record<string, unknown>;
  heavy['armature']!['mass'] = '5 g';
  delete heavy['$schema'];
  writeFileSync(join(dir, 'heavy.json'), JSON.stringify(heavy, null, 2));
  const report = join(dir, 'comparison.html');
  stdout = railpulse(['compare', resolve('scenarios/bench-shot.json'), join(dir, 'heavy.json'), resolve('scenarios/staggered-bank.json'), '--report', report]);
  fileUrl = pathToFileURL(report).href;
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

describe('comparison report in Chromium', () => {
  it('prints the terminal table and the report path', () => {
    expect(stdout).toMatch(/muzzle velocity +[\d.]+ m\/s/);
    expect(stdout).toMatch(/efficiency .*percentage points\)/);
    expect(stdout).toContain(`report: ${join(dir, 'comparison.html')}`);
  });

  it('renders every plot', async () => {
    const plots = await page.locator('[data-plot]').count();
    expect(plots).toBe(5);
    expect(await page.locator('[data-plot].js-plotly-plot').count()).toBe(plots);
    expect(await page.locator('[data-plot] .main-svg').count()).toBeGreaterThanOrEqual(plots);
    // three scenarios: three lines in the current plot, three bar series in the budget
    expect(await page.locator('#plot-current .scatterlayer .trace').count()).toBe(3);
    expect(await page.locator('#plot-budget .barlayer .trace').count()).toBe(3);
  });

  it('logs no error and requests nothing but the file itself (and data: URLs)', () => {
    expect(log.pageErrors).toEqual([]);
    expect(log.consoleErrors).toEqual([]);
    expect(log.requests.filter((url) => url !== fileUrl && !url.startsWith('data:'))).toEqual([]);
  });

  it('shows a scenario name with markup literally, in the title, the tables and the plot legend', async () => {
    expect(await page.locator('#comparison-title').textContent()).toContain(HOSTILE_NAME);
    expect(await page.locator('#outputs thead th[data-entry="1"]').textContent()).toContain(`2: ${HOSTILE_NAME}`);
    expect(await page.locator('#plot-current .legendtext').allTextContents()).toContain(`2: ${HOSTILE_NAME}`);
    expect(await page.locator('i').count()).toBe(0);
  });

  it('filters the inputs to the highlighted differences', async () => {
    const all = await page.locator('#inputs-table tbody tr').count();
    const differing = await page.locator('#inputs-table tbody tr.differs').count();
    expect(differing).toBeGreaterThan(0);
    expect(differing).toBeLessThan(all);
    await page.locator('#only-differences').check();
    expect(await page.locator('#inputs-table tbody tr:visible').count()).toBe(differing);
    await page.locator('#only-differences').uncheck();
    expect(await page.locator('#inputs-table tbody tr:visible').count()).toBe(all);
  });

  it('the first screen shows the safety banner, then each shot\'s status, then the outputs (screenshot of that screen)', async () => {
    await page.evaluate('window.scrollTo(0, 0)');
    expect((await page.locator('#safety-banner').boundingBox())!.y).toBeGreaterThanOrEqual(0);
    const box = async (selector: string) => (await page.locator(selector).boundingBox())!;
    expect((await box('#safety-banner')).y).toBeLessThan((await box('#status')).y);
    expect((await box('#status')).y).toBeLessThan((await box('#outputs')).y);
    expect((await box('#outputs')).y).toBeLessThan(page.viewportSize()!.height);
    // the staggered bank is the largest: 200 kJ at 10 kV, in the arc-flash class
    const banner = (await page.locator('#safety-banner').textContent())!.replace(/\s+/g, ' ');
    expect(banner).toMatch(/up to 200.0 kJ at charge voltages up to 10.00 kV: DOE-HDBK-1092 shock hazard and arc-flash hazard classes/);
    const embedded = JSON.parse((await page.locator('#railpulse-comparison').textContent())!) as { scenarios: Array<{ status: { verdict: string } }> };
    const statuses = await page.locator('#status li[data-entry]').evaluateAll((items) => items.map((i) => i.getAttribute('data-status')));
    expect(statuses).toEqual(embedded.scenarios.map((s) => s.status.verdict));
    // only muzzle velocity and efficiency can be marked better; the margins table marks the larger margin
    const marked = await page.locator('#outputs td[data-better="true"]').evaluateAll((cells) => cells.map((c) => c.closest('tr')!.getAttribute('data-output')));
    expect(new Set(marked)).toEqual(new Set(['muzzleVelocity', 'efficiency']));
    expect(await page.locator('#margins tr[data-margin="contact-force"]').count()).toBe(1);
    mkdirSync('test-output', { recursive: true });
    await page.screenshot({ path: 'test-output/compare-report.png' });
  });

  it('ends with the full safety procedures', async () => {
    expect(await page.locator('main > section').last().getAttribute('id')).toBe('safety');
  });
});

describe('compare command outputs', () => {
  it('writes DATE_compare_SLUG_HASH.html into reports/ by default, a second one beside it, and nothing with --no-report', () => {
    const cwd = join(dir, 'work');
    mkdirSync(cwd);
    const args = ['compare', resolve('scenarios/bench-shot.json'), resolve('scenarios/staggered-bank.json')];
    railpulse(args, cwd);
    railpulse(args, cwd);
    railpulse([...args, '--no-report'], cwd);
    const written = readdirSync(join(cwd, 'reports')).sort();
    // SOURCE_DATE_EPOCH 1796198400 is 2026-12-02; a second run never overwrites the first
    expect(written).toEqual([
      expect.stringMatching(/^2026-12-02_compare_bay-2-bench-shot-vs-bay-4-staggered-bank-40-g-armature_[0-9a-f]{8}-2\.html$/),
      expect.stringMatching(/^2026-12-02_compare_bay-2-bench-shot-vs-bay-4-staggered-bank-40-g-armature_[0-9a-f]{8}\.html$/),
    ]);
  });
});
