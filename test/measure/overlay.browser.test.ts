/**
 * An overlay report (a real shot of the measure fixture with its noisy record and probes) in Chromium via
 * playwright-core: the overlay plots render, the page requests nothing, and the goodness-of-fit rows show
 * the figures embedded for machines.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readMeasurement, readPositionPoints } from '../../src/measure/csv.js';
import { goodnessOfFit } from '../../src/measure/goodness.js';
import { buildShotReport } from '../../src/report/html.js';
import { writeNewFile } from '../../src/output/write.js';
import { scenarioFromRaw } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { launchBrowser, watchPage, type BrowserSession, type PageLog } from '../report/browser.js';
import { fixedProvenance } from '../report/report-input.js';
import { makeFixture, TRIGGER_OFFSET_US, TRUTH_RAW } from './cli-fixture.js';

const RENDER_TIMEOUT = 120_000;
let session: BrowserSession;
let dir: string;
let reportDir: string;
let page: Page;
let log: PageLog;
let fileUrl: string;

beforeAll(async () => {
  const fixture = makeFixture(3);
  const scenario = scenarioFromRaw(TRUTH_RAW);
  const shot = runShot(scenario);
  const measurement = readMeasurement(readFileSync(fixture.csv, 'utf8'), {
    source: fixture.csv, map: { CH1: 'I' }, units: { CH1: 'kA' }, scale: { CH1: 10 }, offset: { t: TRIGGER_OFFSET_US },
  });
  const positions = readPositionPoints(readFileSync(fixture.positions, 'utf8'), { source: fixture.positions });
  const goodness = goodnessOfFit(shot, measurement, { positions, muzzleVelocity: fixture.muzzleVelocity });
  const html = buildShotReport({ scenarioRaw: TRUTH_RAW, scenario, shot, provenance: fixedProvenance(), warnings: [], overlay: { measurement, positions, measured: { muzzleVelocity: fixture.muzzleVelocity }, goodness } });
  dir = fixture.dir;
  reportDir = mkdtempSync(join(tmpdir(), 'railpulse-overlay-'));
  fileUrl = pathToFileURL(writeNewFile(reportDir, 'overlay', 'html', html)).href;
  session = await launchBrowser();
  page = await session.context.newPage();
  log = watchPage(page);
  await page.goto(fileUrl);
  await page.waitForSelector('body[data-plots="rendered"]', { timeout: RENDER_TIMEOUT });
}, RENDER_TIMEOUT + 60_000);

afterAll(async () => {
  await session?.close();
  for (const d of [dir, reportDir]) if (d) rmSync(d, { recursive: true, force: true });
});

describe('overlay report in Chromium', () => {
  it('renders the three overlay plots (I, V_breech, probes) before the shot plots', async () => {
    const ids = await page.locator('#overlay [data-plot]').evaluateAll((elements) => elements.map((e) => e.id));
    expect(ids).toEqual(['plot-overlay-I', 'plot-overlay-V_breech', 'plot-overlay-position']);
    expect(await page.locator('#overlay [data-plot].js-plotly-plot').count()).toBe(3);
    // each signal plot has its residual panel: two y axes
    expect(await page.locator('#plot-overlay-I .ytitle, #plot-overlay-I .y2title').allTextContents()).toEqual(['rail current I (kA)', expect.stringMatching(/^residual \((m|)A\)$/)]);
  });

  it('logs no error and requests nothing but the file itself', () => {
    expect(log.pageErrors).toEqual([]);
    expect(log.consoleErrors).toEqual([]);
    expect(log.requests.filter((url) => url !== fileUrl && !url.startsWith('data:'))).toEqual([]);
  });

  it('goodness-of-fit rows carry the embedded errors', async () => {
    const embedded = JSON.parse((await page.locator('#railpulse-overlay').textContent()) ?? 'null') as { goodness: { peakCurrent: { error: number } } };
    const shown = Number(await page.locator('[data-goodness="peakCurrent"]').getAttribute('data-error'));
    expect(shown).toBe(embedded.goodness.peakCurrent.error);
    expect(await page.locator('[data-goodness]').count()).toBeGreaterThanOrEqual(6);
  });
});
