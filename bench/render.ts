/**
 * Render benchmark of the shot record (issue 13): the time from opening a record in headless Chromium (Debian's
 * /usr/bin/chromium via playwright-core, as the browser tests) until every plot is drawn (body[data-plots=
 * "rendered"]), for each demo scenario. Target: under 2 s. A figure to read, not a test: nothing asserts on time.
 *
 * Each record is opened RUNS times in a fresh page after one warm-up load; the median and the fastest are printed
 * with the record's size and the machine's load average (a busy machine inflates the times).
 */
import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { shotRecordHtml } from '../src/pipeline/record.js';
import { plotlyBundleSource } from '../src/report/plotly-bundle.js';
import { shoot } from '../src/pipeline/shoot.js';
import { loadScenarioFile } from '../src/scenario/load.js';

const DEMOS = ['bench-shot', 'staggered-bank', 'geometry-shot', 'reversal-bank'];
const RUNS = 5;
const TARGET_SECONDS = 2;

const median = (values: number[]): number => {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
};

const dir = mkdtempSync(join(tmpdir(), 'railpulse-render-bench-'));
const browser = await chromium.launch({
  executablePath: '/usr/bin/chromium',
  headless: true,
  args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
});
try {
  console.log(`shot record render in headless Chromium (median of ${RUNS} loads after a warm-up; target < ${TARGET_SECONDS} s; load average ${loadavg().map((l) => l.toFixed(2)).join(' ')})`);
  // the floor: a page holding only the inlined plotly bundle (what every record pays before drawing anything)
  const floor = join(dir, 'plotly-alone.html');
  writeFileSync(floor, `<!DOCTYPE html><html><body><script>${plotlyBundleSource()}</script><script>document.body.setAttribute('data-plots', 'rendered')</script></body></html>`);
  const pages: Array<[string, string]> = [['plotly bundle alone', floor]];
  for (const demo of DEMOS) {
    const file = join(dir, `${demo}.html`);
    writeFileSync(file, shotRecordHtml(shoot(loadScenarioFile(`scenarios/${demo}.json`))));
    pages.push([demo, file]);
  }
  for (const [demo, file] of pages) {
    const url = pathToFileURL(file).href;
    const times: number[] = [];
    const paints: number[] = [];
    const work: number[] = [];
    for (let run = 0; run <= RUNS; run++) {
      const page = await browser.newPage({ viewport: { width: 1200, height: 900 } });
      // the renderer's main-thread busy time (CDP Performance.TaskDuration): less inflated by other processes than wall time
      const cdp = await page.context().newCDPSession(page);
      await cdp.send('Performance.enable');
      const start = performance.now();
      await page.goto(url);
      await page.waitForSelector('body[data-plots="rendered"]', { state: 'attached', timeout: 60_000 });
      const seconds = (performance.now() - start) / 1000;
      // first contentful paint: when the reader first sees the page (the safety banner and status come first)
      const paint = (await page.evaluate("(performance.getEntriesByName('first-contentful-paint')[0] || { startTime: NaN }).startTime")) as number;
      const metrics = (await cdp.send('Performance.getMetrics')).metrics;
      const busy = metrics.find((m) => m.name === 'TaskDuration')?.value ?? Number.NaN;
      await page.close();
      if (run > 0) (times.push(seconds), paints.push(paint / 1000), work.push(busy));
    }
    const size = statSync(file).size / 1e6;
    const verdict = median(times) < TARGET_SECONDS ? 'within target' : 'OVER TARGET';
    const paint = Number.isFinite(median(paints)) ? `, first paint ${median(paints).toFixed(2)} s` : '';
    console.log(`  ${demo.padEnd(20)} ${median(times).toFixed(2)} s median, ${Math.min(...times).toFixed(2)} s fastest to every plot drawn (main thread busy ${median(work).toFixed(2)} s${paint}), ${size.toFixed(2)} MB — ${verdict}`);
  }
} finally {
  await browser.close();
  rmSync(dir, { recursive: true, force: true });
}
