/**
 * The archive index in Chromium: built from three reports (two real shots of small scenarios, one
 * synthetic), opened from file://, sorted by clicking headers and filtered by typing.
 */
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildArchiveIndex, scanReports } from '../../src/report/archive.js';
import { assessShot } from '../../src/checks/assess.js';
import { buildShotReport, readEmbedded } from '../../src/report/html.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { reportBaseName, writeNewFile } from '../../src/output/write.js';
import { launchBrowser, watchPage, type BrowserSession, type PageLog } from './browser.js';
import { benchScenarioRaw } from './fixtures/bench-scenario.js';
import { fixedProvenance, syntheticReportInput } from './report-input.js';

let session: BrowserSession;
let dir: string;
let page: Page;
let log: PageLog;
let fileUrl: string;
let scanWarnings: string[];

function writeRealReport(raw: Record<string, unknown>, date: string): void {
  const scenario = scenarioFromRaw(structuredClone(raw));
  const shot = runShot(scenario);
  const assessment = assessShot(scenario, shot);
  const html = buildShotReport({ scenarioRaw: raw, scenario, shot, provenance: fixedProvenance(date), warnings: assessment.warnings.map((w) => w.message), checks: assessment.checks });
  writeNewFile(dir, reportBaseName(date, scenario.name, '1a2b3c4d'), 'html', html);
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-archive-browser-'));
  writeRealReport(benchScenarioRaw('Larkspur light armature'), '2026-12-01T09:00:00.000Z');
  const heavy = benchScenarioRaw('Larkspur heavy armature');
  (heavy['armature'] as Record<string, unknown>)['mass'] = '20 g';
  heavy['record'] = { shotId: 'LK-0042', operator: 'night shift (invented)', notes: 'heavier armature trial' };
  writeRealReport(heavy, '2026-12-02T09:00:00.000Z');
  const synthetic = syntheticReportInput({ name: 'Synthetic <check> & co', samples: 3000 });
  synthetic.provenance = fixedProvenance('2026-11-30T09:00:00.000Z');
  writeNewFile(dir, 'synthetic', 'html', buildShotReport(synthetic));
  const scan = scanReports(dir);
  scanWarnings = scan.warnings;
  fileUrl = pathToFileURL(writeNewFile(dir, 'index', 'html', buildArchiveIndex(scan.entries))).href;
  session = await launchBrowser();
  page = await session.context.newPage();
  log = watchPage(page);
  await page.goto(fileUrl);
  await page.waitForSelector('#reports tbody tr', { timeout: 60_000 });
}, 180_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

async function columnSi(column: string): Promise<number[]> {
  return page.locator(`#reports tbody tr td[data-column="${column}"]`).evaluateAll((cells) => cells.map((c) => Number(c.getAttribute('data-si'))));
}

describe('archive index in Chromium', () => {
  it('lists every report, with no error and no request beyond the file', () => {
    expect(scanWarnings).toEqual([]);
    expect(log.pageErrors).toEqual([]);
    expect(log.consoleErrors).toEqual([]);
    expect(log.requests.filter((url) => url !== fileUrl && !url.startsWith('data:'))).toEqual([]);
  });

  it('starts newest first and shows names as text', async () => {
    const names = await page.locator('#reports tbody td[data-column="name"]').allTextContents();
    expect(names).toEqual(['Larkspur heavy armature', 'Larkspur light armature', 'Synthetic <check> & co']);
  });

  it('sorts numerically by a clicked header, and reverses on a second click', async () => {
    const header = page.locator('#reports th[data-column="muzzleVelocity"]');
    await header.click();
    const ascending = await columnSi('muzzleVelocity');
    expect(ascending).toEqual([...ascending].sort((a, b) => a - b));
    expect(await header.getAttribute('aria-sort')).toBe('ascending');
    await header.click();
    const descending = await columnSi('muzzleVelocity');
    expect(descending).toEqual([...ascending].reverse());
    // a numeric sort, not a text sort: check the values really differ in digit count or order
    expect(new Set(ascending).size).toBe(3);
  });

  it('sorts text columns alphabetically', async () => {
    await page.locator('#reports th[data-column="outcome"]').click();
    const outcomes = await page.locator('#reports tbody td[data-column="outcome"]').allTextContents();
    expect(outcomes).toEqual([...outcomes].sort());
  });

  it('filters rows by typed text', async () => {
    await page.locator('#filter').fill('heavy');
    expect(await page.locator('#reports tbody tr:visible').count()).toBe(1);
    expect(await page.locator('#shown').textContent()).toBe('1');
    await page.locator('#filter').fill('');
    expect(await page.locator('#reports tbody tr:visible').count()).toBe(3);
  });

  it('links each row to its report file', async () => {
    const hrefs = await page.locator('#reports tbody td[data-column="file"] a').evaluateAll((links) => links.map((a) => (a as unknown as { href: string }).href));
    expect(hrefs).toHaveLength(3);
    for (const href of hrefs) expect(href.startsWith(fileUrl.replace(/index\.html$/, ''))).toBe(true);
  });

  it('the first screen shows the safety banner, the status counts and the table with each record\'s status (screenshot of that screen)', async () => {
    await page.locator('#filter').fill('');
    await page.evaluate('window.scrollTo(0, 0)');
    expect((await page.locator('#safety-banner').boundingBox())!.y).toBeGreaterThanOrEqual(0);
    const box = async (selector: string) => (await page.locator(selector).boundingBox())!;
    expect((await box('#safety-banner')).y).toBeLessThan((await box('#archive-status')).y);
    expect((await box('#reports tbody tr:first-child')).y).toBeLessThan(page.viewportSize()!.height);
    expect((await page.locator('#safety-banner').textContent())!).toMatch(/lethal stored energy[\s\S]*not a licence to fire/);
    // each row's status is the one its record carries: the worst of its checks and warnings
    const shown = await page.locator('#reports tbody tr').evaluateAll((rows) =>
      rows.map((r) => ({ file: r.querySelector('[data-column="file"]')!.textContent, status: r.querySelector('[data-column="status"] .verdict')!.textContent })),
    );
    for (const row of shown) {
      const report = readEmbedded(readFileSync(join(dir, row.file!), 'utf8'));
      const worst = report.checks.some((c) => c.verdict === 'fail') ? 'fail' : report.checks.some((c) => c.verdict === 'warn') || report.warnings.length ? 'warn' : 'pass';
      expect(row.status, row.file!).toBe(worst);
    }
    const counts = await page.locator('#archive-status').evaluate((p) => ['fail', 'warn', 'pass'].map((v) => Number(p.getAttribute(`data-${v}`))));
    expect(counts.reduce((a, b) => a + b, 0)).toBe(readdirSync(dir).filter((f) => f.endsWith('.html') && f !== 'index.html').length);
    // the filing fields are columns, and searchable
    expect(await page.locator('#reports tbody td[data-column="shotId"]').allTextContents()).toContain('LK-0042');
    await page.locator('#filter').fill('night shift');
    expect(await page.locator('#reports tbody tr:visible').count()).toBe(1);
    await page.locator('#filter').fill('');
    await page.evaluate('window.scrollTo(0, 0)');
    // the date in words beside the ISO time, in the reader's time zone
    expect(await page.locator('#reports tbody td[data-column="date"] .local-date').first().textContent()).toMatch(/2026/);
    mkdirSync('test-output', { recursive: true });
    await page.screenshot({ path: 'test-output/archive-index.png' });
  });
});
