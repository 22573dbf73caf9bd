/**
 * The archive index in Chromium: built from three reports (two real shots of small scenarios, one
 * synthetic), opened from file://, sorted by clicking headers and filtered by typing.
 */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildArchiveIndex, scanReports } from '../../src/report/archive.js';
import { buildShotReport } from '../../src/report/html.js';
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
  const html = buildShotReport({ scenarioRaw: raw, scenario, shot: runShot(scenario), provenance: fixedProvenance(date), warnings: [] });
  writeNewFile(dir, reportBaseName(date, scenario.name, '1a2b3c4d'), 'html', html);
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-archive-browser-'));
  writeRealReport(benchScenarioRaw('Larkspur light armature'), '2026-12-01T09:00:00.000Z');
  const heavy = benchScenarioRaw('Larkspur heavy armature');
  (heavy['armature'] as Record<string, unknown>)['mass'] = '20 g';
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

  it('saves a screenshot for a person to look at', async () => {
    mkdirSync('test-output', { recursive: true });
    await page.locator('#reports th[data-column="date"]').click();
    await page.screenshot({ path: 'test-output/archive-index.png', fullPage: true });
  });
});
