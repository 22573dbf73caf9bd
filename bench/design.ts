/**
 * Benchmark of the design page for the staggered demo, in headless Chromium (Debian's /usr/bin/chromium via
 * playwright-core, as the browser tests). Targets: re-simulation plus redraw after a change under 100 ms; page load
 * to the first shot drawn under 2 s; the file under 4 MB. A figure to read, not a test: nothing asserts on time.
 *
 * Load: from navigation to body[data-shots="1"] (the first shot simulated and drawn), median of RUNS fresh pages
 * after a warm-up. Change: a typed value set in a control and its change event dispatched inside the page, until
 * the page has drawn the new shot and the browser has painted the next frame, median over CHANGES changes of
 * different controls; the page's own split (simulation / drawing) is printed beside it. The machine's load average is
 * printed too: a busy machine inflates every figure.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';

const DEMO = 'scenarios/staggered-bank.json';
const RUNS = 5;
const CHANGES: Array<[string, string[]]> = [
  ['bank[0].voltage', ['9.5 kV', '10.5 kV', '10 kV']],
  ['bank[2].trigger', ['250 us', '300 us', '280 us']],
  ['armature.mass', ['35 g', '45 g', '40 g']],
  ['rails.length', ['1.2 m', '1.8 m', '1.5 m']],
  ['bank[1].count', ['5', '3', '4']],
];

const median = (values: number[]): number => {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
};

const dir = mkdtempSync(join(tmpdir(), 'railpulse-design-bench-'));
const file = join(dir, 'design.html');
execFileSync(process.execPath, ['dist/railpulse.mjs', 'design', DEMO, '-o', file]);
const url = pathToFileURL(file).href;
const browser = await chromium.launch({
  executablePath: '/usr/bin/chromium',
  headless: true,
  args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
});
try {
  console.log(`design page, ${DEMO} (headless Chromium; load average ${loadavg().map((l) => l.toFixed(2)).join(' ')})`);
  const bytes = statSync(file).size;
  console.log(`  file size                          ${(bytes / 1048576).toFixed(2)} MB (${bytes} bytes; target < 4 MB)`);
  const loads: number[] = [];
  for (let run = 0; run <= RUNS; run++) {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const start = performance.now();
    // from the navigation's start, not its load event: the shot may be drawn before the page has finished loading
    await page.goto(url, { waitUntil: 'commit' });
    await page.waitForSelector('body[data-shots="1"]', { state: 'attached', timeout: 60_000 });
    if (run > 0) loads.push(performance.now() - start);
    await page.close();
  }
  console.log(`  load to first shot drawn           median ${median(loads).toFixed(0)} ms, fastest ${Math.min(...loads).toFixed(0)} ms (${RUNS} loads; target < 2000 ms)`);

  const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
  // the renderer's main-thread busy time (CDP Performance.TaskDuration): less inflated by other processes than wall time
  const cdp = await page.context().newCDPSession(page);
  await cdp.send('Performance.enable');
  const busy = async (): Promise<number> => {
    const { metrics } = (await cdp.send('Performance.getMetrics')) as { metrics: { name: string; value: number }[] };
    return 1000 * (metrics.find((m) => m.name === 'TaskDuration')?.value ?? NaN);
  };
  await page.goto(url);
  await page.waitForSelector('body[data-shots="1"]', { state: 'attached', timeout: 60_000 });
  const totals: number[] = [];
  const busyTimes: number[] = [];
  const splits: number[][] = [];
  const simulations: number[] = [];
  const drawings: number[] = [];
  for (const [path, values] of CHANGES) {
    for (const value of values) {
      const busyBefore = await busy();
      const measured = await page.evaluate(
        async ({ path, value }) => {
          const entry = document.querySelector<HTMLInputElement>(`.control[data-path="${path}"] .entry`)!;
          const before = Number(document.body.dataset.shots);
          const start = performance.now();
          entry.value = value;
          entry.dispatchEvent(new Event('change'));
          while (Number(document.body.dataset.shots) === before) await new Promise((resolve) => setTimeout(resolve, 0));
          await new Promise((resolve) => requestAnimationFrame(() => resolve(null)));
          return {
            total: performance.now() - start,
            simulate: Number(document.body.dataset.simulateMs),
            draw: Number(document.body.dataset.drawMs),
            split: (document.body.dataset.drawSplit ?? '').split(' ').map(Number),
          };
        },
        { path, value },
      );
      busyTimes.push((await busy()) - busyBefore);
      totals.push(measured.total);
      simulations.push(measured.simulate);
      drawings.push(measured.draw);
      splits.push(measured.split);
    }
  }
  console.log(
    `  change → simulated and drawn       median ${median(totals).toFixed(1)} ms, slowest ${Math.max(...totals).toFixed(1)} ms over ${totals.length} changes (target < 100 ms)`,
  );
  console.log(`    main-thread busy time per change   median ${median(busyTimes).toFixed(1)} ms (includes the two CDP calls around it)`);
  console.log(`    of which: simulation (load, shot, checks) median ${median(simulations).toFixed(1)} ms; drawing median ${median(drawings).toFixed(1)} ms`);
  const part = (k: number): string => median(splits.map((s) => s[k] ?? NaN)).toFixed(1);
  console.log(`    drawing: text and tables ${part(0)} ms, figures from the shot ${part(1)} ms, canvases ${part(2)} ms (medians)`);
} finally {
  await browser.close();
  rmSync(dir, { recursive: true, force: true });
}
