/**
 * study.html in Chromium: a small real sweep through the built CLI (charge voltage of the bench demo over four
 * values, one job), the page opened from file://. Every figure is drawn with its points (the one that does not leave
 * the muzzle marked as failed), nothing is logged as an error, and the page requests nothing but itself.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { STUDY_FIGURES } from '../../src/report/study.js';
import { launchBrowser, watchPage, type BrowserSession, type PageLog } from '../report/browser.js';

const RENDER_TIMEOUT = 120_000;
const POINTS = 4;

let session: BrowserSession;
let dir: string;
let page: Page;
let log: PageLog;
let fileUrl: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-study-report-'));
  const out = join(dir, 's');
  execFileSync(process.execPath, [resolve('bin/railpulse.js'), 'sweep', 'scenarios/bench-shot.json', '--vary', `bank[0].voltage=4kV:7kV:${POINTS}`, '--out', out, '--jobs', '1'], {
    encoding: 'utf8',
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  fileUrl = pathToFileURL(join(out, 'study.html')).href;
  session = await launchBrowser();
  page = await session.context.newPage();
  log = watchPage(page);
  await page.goto(fileUrl);
  // The page has no "rendered" flag: wait until every figure has its SVG.
  await page.waitForFunction(`document.querySelectorAll('#plots .js-plotly-plot .main-svg').length >= ${STUDY_FIGURES.length}`, undefined, { timeout: RENDER_TIMEOUT });
}, RENDER_TIMEOUT + 60_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('study report in Chromium', () => {
  it('draws one line plot per figure, with the exiting points on the line and the others marked as failed', async () => {
    const rows = readFileSync(join(dir, 's', 'points.jsonl'), 'utf8').trim().split('\n').map((line) => JSON.parse(line) as Record<string, unknown>);
    expect(rows).toHaveLength(POINTS);
    const exited = rows.filter((r) => r['outcome'] === 'exited').length;
    // At 4 kV this bench's armature stalls in the bore (friction takes its kinetic energy before the muzzle); at 5–7 kV it leaves.
    expect(exited).toBe(POINTS - 1);
    expect(await page.locator('#plots .js-plotly-plot').count()).toBe(STUDY_FIGURES.length);
    const points = await page.locator('#plots .js-plotly-plot').evaluateAll((plots) =>
      plots.map((p) => [...p.querySelectorAll('.scatterlayer .trace')].map((trace) => trace.querySelectorAll('.points path').length)),
    );
    expect(points).toEqual(STUDY_FIGURES.map(() => [exited, POINTS - exited]));
    const legends = await page.locator('#plots .js-plotly-plot').first().locator('.legendtext').allTextContents();
    expect(legends).toEqual([STUDY_FIGURES[0]!.label, 'failed']);
    // every plot carries its title with the unit, and axis titles
    expect(await page.locator('#plots .gtitle').allTextContents()).toEqual(STUDY_FIGURES.map((f) => `${f.label} (${f.unit})`));
    expect(await page.locator('#plots .xtitle').count()).toBe(STUDY_FIGURES.length);
  });

  it('plots the muzzle velocities of points.jsonl, rising with charge voltage', async () => {
    const rows = readFileSync(join(dir, 's', 'points.jsonl'), 'utf8').trim().split('\n').map((line) => JSON.parse(line) as Record<string, unknown>);
    const velocities = rows.filter((r) => r['outcome'] === 'exited').map((r) => r['muzzleVelocity'] as number);
    // F = ½L'I² with I ∝ V0 in a linear circuit: more charge voltage, more speed
    for (let i = 1; i < velocities.length; i++) expect(velocities[i]!).toBeGreaterThan(velocities[i - 1]!);
    // the figure's own trace data, as plotly holds it on the element
    const plotted = await page.locator('#plots .js-plotly-plot').first().evaluate((plot) => (plot as unknown as { data: Array<{ y: number[] }> }).data[0]!.y);
    expect(plotted).toEqual(velocities);
  });

  it('logs no error and requests nothing but the file itself (and data: URLs)', () => {
    expect(log.pageErrors).toEqual([]);
    expect(log.consoleErrors).toEqual([]);
    expect(log.requests.filter((url) => url !== fileUrl && !url.startsWith('data:'))).toEqual([]);
  });

  it('saves a screenshot for a person to look at', async () => {
    mkdirSync('test-output', { recursive: true });
    await page.screenshot({ path: 'test-output/study-report.png', fullPage: true });
  });
});
