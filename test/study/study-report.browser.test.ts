/**
 * study.html in Chromium: a small real sweep through the built CLI (charge voltage of the bench demo over four
 * values, with a payload acceleration limit the strongest shots exceed), the page opened from file://. The page reads
 * as the records do: the axis in display units (kV, not "V (SI)"), every point's outcome by its own mark, and the
 * points that fail a check ringed, exactly those whose verdict in points.jsonl is "fail".
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FAIL_MARK, OUTCOME_STYLE, STUDY_FIGURES } from '../../src/report/study-plots.js';
import { launchBrowser, watchPage, type BrowserSession, type PageLog } from '../report/browser.js';

const RENDER_TIMEOUT = 120_000;
const POINTS = 4;

let session: BrowserSession;
let dir: string;
let page: Page;
let log: PageLog;
let fileUrl: string;
let rows: Record<string, unknown>[];

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-study-report-'));
  const scenario = JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8')) as Record<string, unknown>;
  delete scenario['$schema'];
  // at 6.3 kV this bench peaks near 3.1e5 m/s²: a 2.5e5 m/s² payload limit fails the strongest shots
  scenario['limits'] = { peakAcceleration: '2.5e5 m/s^2' };
  writeFileSync(join(dir, 'bench-limited.json'), JSON.stringify(scenario));
  const out = join(dir, 's');
  execFileSync(process.execPath, [resolve('bin/railpulse.js'), 'sweep', join(dir, 'bench-limited.json'), '--vary', `bank[0].voltage=4kV:7kV:${POINTS}`, '--out', out, '--jobs', '1'], {
    encoding: 'utf8',
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  rows = readFileSync(join(out, 'points.jsonl'), 'utf8').trim().split('\n').map((line) => JSON.parse(line) as Record<string, unknown>);
  fileUrl = pathToFileURL(join(out, 'study.html')).href;
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

describe('study report in Chromium', () => {
  it('the points file has a verdict per check and the status per point; some points fail, some do not', () => {
    expect(rows).toHaveLength(POINTS);
    for (const row of rows) expect(Object.keys(row['verdicts'] as object)).toContain('peak-acceleration');
    const failing = rows.filter((r) => r['verdict'] === 'fail').length;
    expect(failing).toBeGreaterThan(0);
    expect(failing).toBeLessThan(POINTS);
  });

  it('reads the varied axis in display units and each figure in its own unit', async () => {
    const xTitles = await page.locator('#plots .xtitle').allTextContents();
    expect(xTitles).toEqual(STUDY_FIGURES.map(() => 'bank[0].voltage (kV)'));
    const ticks = await page.locator('#study-muzzleVelocity .xtick text').allTextContents();
    expect(ticks).toEqual(['4', '5', '6', '7']); // the grid's own values, in kV
    expect(await page.locator('#study-peakCurrent .ytitle').textContent()).toBe('Peak current (kA)');
    expect(await page.locator('#study-efficiency .ytitle').textContent()).toBe('Efficiency (kinetic / stored) (%)');
  });

  it('rings exactly the points whose verdict is "fail", on every figure', async () => {
    const failingVoltages = rows.filter((r) => r['verdict'] === 'fail').map((r) => (r['bank[0].voltage'] as number) / 1e3);
    const marks = await page.locator('#plots .js-plotly-plot').evaluateAll((plots, name) =>
      plots.map((p) => {
        const trace = (p as unknown as { data: Array<{ name: string; x: number[] }> }).data.find((t) => t.name === name);
        return { x: trace ? trace.x : [], drawn: trace ? p.querySelectorAll('.scatterlayer .trace').length : 0 };
      }), FAIL_MARK.name);
    for (const mark of marks) expect(mark.x).toEqual(failingVoltages);
    const legend = await page.locator('#study-muzzleVelocity .legendtext').allTextContents();
    expect(legend).toContain(FAIL_MARK.name);
    // and in the table of failing points, with the check that fails
    const listed = await page.locator('#failing tr[data-verdict="fail"]').evaluateAll((trs) => trs.map((tr) => tr.textContent));
    expect(listed).toHaveLength(failingVoltages.length);
    for (const row of listed) expect(row).toContain('peak-acceleration');
  });

  it('shows each outcome by its own mark: the stalled point is not lumped with errors', async () => {
    const stalled = rows.filter((r) => r['outcome'] === 'stalled').length;
    expect(stalled).toBe(1); // at 4 kV friction stops the armature in the bore
    expect(await page.locator('#outcomes [data-outcome="stalled"]').getAttribute('data-count')).toBe(String(stalled));
    expect(await page.locator('#outcomes [data-outcome="error"]').getAttribute('data-count')).toBe('0');
    expect(await page.locator('#study-muzzleVelocity .legendtext').allTextContents()).toEqual(expect.arrayContaining([OUTCOME_STYLE.exited.name, OUTCOME_STYLE.stalled.name]));
  });

  it('the first screen shows the safety banner and the study status; no error, no request (screenshot of that screen)', async () => {
    const box = async (selector: string) => (await page.locator(selector).boundingBox())!;
    expect((await box('#safety-banner')).y).toBeLessThan((await box('#status')).y);
    expect((await box('#status')).y).toBeLessThan(page.viewportSize()!.height);
    expect(await page.locator('#status').getAttribute('data-status')).toBe('fail');
    expect(await page.locator('main > section').last().getAttribute('id')).toBe('safety');
    expect(log.pageErrors).toEqual([]);
    expect(log.consoleErrors).toEqual([]);
    expect(log.requests.filter((url) => url !== fileUrl && !url.startsWith('data:'))).toEqual([]);
    mkdirSync('test-output', { recursive: true });
    await page.screenshot({ path: 'test-output/study-report.png' });
  });
});
