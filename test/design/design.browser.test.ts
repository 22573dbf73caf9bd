/**
 * The design page in a real browser (Debian's Chromium via playwright-core): values set through its controls,
 * the scenario it saves run by the command line, and the page's shot compared with `run --json` and with the
 * record `run` files. The page and the CLI run the same code, so the results agree to the last bit; the test
 * allows 1e-12 relative. Over the whole session the page makes no network request and logs no error.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import Ajv2020 from 'ajv/dist/2020.js';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, watchPage, type BrowserSession, type PageLog } from '../report/browser.js';

const CLI = join(process.cwd(), 'dist', 'railpulse.mjs');
const DEMO = 'scenarios/staggered-bank.json';
const TIMEOUT = 120_000;

let session: BrowserSession;
let dir: string;
let page: Page;
let log: PageLog;
let pageUrl: string;
const blocked: string[] = [];

function cli(args: string[], env: Record<string, string> = {}): { status: number | null; stdout: string; stderr: string } {
  const run = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8', env: { ...process.env, ...env } });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

async function shots(): Promise<number> {
  return Number(await page.getAttribute('body', 'data-shots'));
}

/** Type a value into a control and press Enter; wait for the next shot (or for the error state). */
async function enter(path: string, text: string, expectShot = true): Promise<void> {
  const before = await shots();
  const entry = page.locator(`.control[data-path="${path}"] .entry`);
  await entry.fill(text);
  await entry.press('Enter');
  if (expectShot) await page.waitForFunction((n) => Number(document.body.dataset.shots) > n, before);
  else await page.waitForSelector('body[data-state="error"]');
}

async function pageResults(): Promise<Record<string, unknown>> {
  return JSON.parse((await page.textContent('#design-results'))!) as Record<string, unknown>;
}

/** Every number in `actual` equals the one in `expected` to `tolerance` relative; everything else is equal. */
function expectSameResults(actual: unknown, expected: unknown, where = 'results', tolerance = 1e-12, scaleOf: (where: string, value: number) => number = (_, v) => Math.abs(v)): number {
  if (typeof expected === 'number') {
    expect(typeof actual, where).toBe('number');
    const scale = Math.max(scaleOf(where, expected), Number.MIN_VALUE);
    expect(Math.abs((actual as number) - expected) / scale, where).toBeLessThanOrEqual(tolerance);
    return 1;
  }
  if (Array.isArray(expected)) {
    expect(Array.isArray(actual), where).toBe(true);
    expect((actual as unknown[]).length, where).toBe(expected.length);
    return expected.reduce<number>((n, item, i) => n + expectSameResults((actual as unknown[])[i], item, `${where}[${i}]`, tolerance, scaleOf), 0);
  }
  if (typeof expected === 'object' && expected !== null) {
    expect(Object.keys(actual as object).sort(), where).toEqual(Object.keys(expected).sort());
    return Object.entries(expected).reduce<number>((n, [key, value]) => n + expectSameResults((actual as Record<string, unknown>)[key], value, `${where}.${key}`, tolerance, scaleOf), 0);
  }
  expect(actual, where).toEqual(expected);
  return 0;
}

const NUMBER = /([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)/;

/**
 * The first difference between two records, or ''. Text must be identical; numbers may differ in their last bits
 * (`tolerance` relative, or of the largest number on the line for values near zero such as a ledger residual):
 * the page runs on Chromium's JavaScript engine and `run` on Node's, which round a few Math functions differently
 * (the results differ by about 1e-15), and the record's uncertainty section divides such differences by the small
 * steps of its finite-difference Jacobian (they grow to about 1e-12).
 */
function recordDifference(page: string, cli: string, tolerance: number): string {
  const pageLines = page.split('\n');
  const cliLines = cli.split('\n');
  if (pageLines.length !== cliLines.length) return `${pageLines.length} lines against ${cliLines.length}`;
  for (let i = 0; i < pageLines.length; i++) {
    if (pageLines[i] === cliLines[i]) continue;
    const a = pageLines[i]!.split(NUMBER);
    const b = cliLines[i]!.split(NUMBER);
    if (a.length !== b.length) return `line ${i + 1}: different text`;
    const scale = Math.max(...b.filter((_, k) => k % 2 === 1).map((t) => Math.abs(Number(t))).filter(Number.isFinite));
    for (let k = 0; k < a.length; k++) {
      if (a[k] === b[k]) continue;
      if (k % 2 === 0) return `line ${i + 1}: text ${JSON.stringify(a[k]!.slice(0, 120))} against ${JSON.stringify(b[k]!.slice(0, 120))}`;
      const x = Number(a[k]);
      const y = Number(b[k]);
      if (Math.abs(x - y) > tolerance * Math.max(Math.abs(x), Math.abs(y)) && Math.abs(x - y) > tolerance * scale) return `line ${i + 1}: ${a[k]} against ${b[k]}`;
    }
  }
  return '';
}

async function download(button: string, name: string): Promise<string> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.click(button)]);
  const path = join(dir, name);
  await file.saveAs(path);
  return path;
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-design-'));
  const written = cli(['design', DEMO, '-o', join(dir, 'design.html')]);
  expect(written.stderr).toBe('');
  expect(written.status).toBe(0);
  pageUrl = pathToFileURL(join(dir, 'design.html')).href;
  session = await launchBrowser();
  page = await session.context.newPage();
  log = watchPage(page);
  // anything but the page itself (and the page's own downloads, blob: URLs) would be a network request: refuse it
  await page.route('**/*', (route) => {
    const url = route.request().url();
    if (url === pageUrl) return route.continue();
    blocked.push(url);
    return route.abort();
  });
  await page.goto(pageUrl);
  await page.waitForSelector('body[data-shots="1"]', { timeout: TIMEOUT });
}, TIMEOUT);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('design page (Chromium)', () => {
  it('draws the first shot with the safety banner in view', async () => {
    expect(await page.getAttribute('body', 'data-state')).toBe('drawn');
    expect(await page.isVisible('#design-safety .safety-banner')).toBe(true);
    expect(await page.textContent('#design-safety')).toContain('lethal');
    // one canvas per record figure: current, capacitor voltages, rail voltages, motion, ledger, budget
    expect(await page.locator('canvas.plot-canvas').count()).toBe(6);
    // after scrolling to the last plot, the banner is still on screen (it sticks to the top)
    await page.locator('#plot-budget').scrollIntoViewIfNeeded();
    const box = await page.locator('#design-safety').boundingBox();
    expect(box && box.y >= -1 && box.y < 50).toBe(true);
  });

  it('values set through the controls, saved and run by the CLI, give the same results as the page (to 1e-12 relative)', async () => {
    await enter('bank[0].voltage', '9.5 kV');
    await enter('bank[2].trigger', '250 us');
    await enter('armature.mass', '36 g');
    // a unit the simple reader leaves to mathjs (the page bundles it too): 0.25 in = 6.35 mm exactly (NIST SP 811, B.8)
    await enter('armature.position', '0.25 in');
    await page.waitForFunction(() => document.body.dataset.state === 'drawn' && !document.querySelector('.control.bad'));
    await enter('bank[1].count', '5');
    // a slider: moved and released
    const before = await shots();
    await page.locator('.control[data-path="rails.length"] .slider').evaluate((slider: HTMLInputElement) => {
      slider.value = '620';
      slider.dispatchEvent(new Event('input'));
      slider.dispatchEvent(new Event('change'));
    });
    await page.waitForFunction((n) => Number(document.body.dataset.shots) > n, before);
    await page.waitForFunction(() => document.body.dataset.state === 'drawn' && !document.querySelector('.control.bad'));
    const length = await page.inputValue('.control[data-path="rails.length"] .entry');
    expect(length).not.toBe('1.5 m');
    // add a group, duplicate one, remove one
    const groups = async (): Promise<number> => page.locator('fieldset.control-group[data-section^="bank["]:not([data-section*="."])').count();
    expect(await groups()).toBe(4);
    let n = await shots();
    await page.click('#design-add-group');
    await page.waitForFunction((k) => Number(document.body.dataset.shots) > k, n);
    expect(await groups()).toBe(5);
    n = await shots();
    await page.click('fieldset[data-section="bank[1]"] button[data-action="duplicate"]');
    await page.waitForFunction((k) => Number(document.body.dataset.shots) > k, n);
    expect(await groups()).toBe(6);
    n = await shots();
    await page.click('fieldset[data-section="bank[5]"] button[data-action="remove"]');
    await page.waitForFunction((k) => Number(document.body.dataset.shots) > k, n);
    expect(await groups()).toBe(5);
    await enter('bank[4].trigger', '500 us');

    const saved = await download('#design-save-scenario', 'edited.json');
    const scenario = JSON.parse(readFileSync(saved, 'utf8')) as { bank: Record<string, unknown>[]; armature: Record<string, unknown>; rails: Record<string, unknown> };
    expect(scenario.bank).toHaveLength(5);
    expect(scenario.bank[0]!.voltage).toBe('9.5 kV');
    expect(scenario.bank[1]!.count).toBe(5);
    expect(scenario.bank[2]!.label).toBe('G2 copy');
    expect(scenario.armature.mass).toBe('36 g');
    expect(scenario.armature.position).toBe('0.25 in');
    expect(scenario.rails.length).toBe(length);
    // the published schema, checked by a general-purpose validator (Ajv, JSON Schema 2020-12)
    type AjvClass = new (options: { strict: boolean }) => { compile(schema: object): ((data: unknown) => boolean) & { errors?: unknown[] | null } };
    const module = Ajv2020 as unknown as AjvClass & { default?: AjvClass };
    const validate = new (module.default ?? module)({ strict: false }).compile(JSON.parse(readFileSync('scenarios/railpulse.schema.json', 'utf8')) as object);
    expect(validate(scenario), JSON.stringify(validate.errors)).toBe(true);

    const run = cli(['run', saved, '--json', '--no-report', '--no-uncertainty']);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const fromCli = JSON.parse(run.stdout) as Record<string, unknown>;
    const fromPage = await pageResults();
    // the ledger residual is a difference of nearly equal sums: compared relative to the stored energy E0
    const initial = (fromCli.energy as { initial: number }).initial;
    const compared = expectSameResults(fromPage, fromCli, 'results', 1e-12, (where, value) => (where.endsWith('.residual') ? initial : Math.abs(value)));
    expect(compared).toBeGreaterThan(40);
    for (const key of ['muzzleVelocity', 'exitTime', 'peakCurrent', 'efficiency', 'peakAcceleration', 'actionIntegral', 'peakBreechVoltage']) {
      expect(typeof fromCli[key], key).toBe('number');
    }
  }, TIMEOUT);

  it('saves the record `run` files for the saved scenario, identical but for the date, the runtime and the last bits of full-precision numbers', async () => {
    const saved = await download('#design-save-scenario', 'for-record.json');
    const recordPath = await download('#design-save-record', 'page-record.html');
    const fromPage = readFileSync(recordPath, 'utf8');
    const date = /<time datetime="([^"]+)"/.exec(fromPage)![1]!;
    const runtime = /"nodeVersion":"([^"]+)"/.exec(fromPage)![1]!;
    expect(runtime).toMatch(/^browser \(/);
    const cliRecord = join(dir, 'cli-record.html');
    const run = cli(['run', saved, '--report', cliRecord], { SOURCE_DATE_EPOCH: String(Date.parse(date) / 1000) });
    expect(run.status).toBe(0);
    const fromCli = readFileSync(cliRecord, 'utf8');
    expect(fromCli).toContain('Uncertainty'); // the demo has tolerances: both records propagate them
    const pageText = fromPage.split(runtime).join(process.version);
    expect(pageText.length).toBeGreaterThan(1_000_000);
    expect(recordDifference(pageText, fromCli, 1e-9)).toBe('');
  }, TIMEOUT);

  it("a bad entry shows the CLI's message beside its control and leaves the last good shot drawn", async () => {
    const drawn = await shots();
    const results = await pageResults();
    await enter('bank[0].capacitance', '250 uV', false);
    const message = (await page.textContent('.control[data-path="bank[0].capacitance"] .message'))!;
    // the command line's line for the same value in a file
    const bad = JSON.parse(readFileSync(join(dir, 'for-record.json'), 'utf8')) as { bank: Record<string, unknown>[] };
    bad.bank[0]!.capacitance = '250 uV';
    const badFile = join(dir, 'bad.json');
    writeFileSync(badFile, JSON.stringify(bad));
    const run = cli(['run', badFile, '--no-report']);
    expect(run.status).toBe(2);
    const cliLine = run.stderr.trim();
    const prefix = `railpulse: ${badFile}: `;
    expect(cliLine.startsWith(`${prefix}bank[0].capacitance: `), cliLine).toBe(true);
    expect(message).toBe(`${DEMO}: ${cliLine.slice(prefix.length)}`);
    expect(await page.getAttribute('body', 'data-state')).toBe('error');
    expect(await shots()).toBe(drawn);
    expect(await pageResults()).toEqual(results);
    expect(await page.locator('canvas.plot-canvas').count()).toBe(6);
    // a good value clears the message and simulates again
    await enter('bank[0].capacitance', '240 uF');
    expect(await page.textContent('.control[data-path="bank[0].capacitance"] .message')).toBe('');
    expect(await pageResults()).not.toEqual(results);
    // undo goes back to the shot before
    const n = await shots();
    await page.click('#design-undo');
    await page.waitForFunction((k) => Number(document.body.dataset.shots) > k, n);
    expect(await pageResults()).toEqual(results);
    expect(await page.inputValue('.control[data-path="bank[0].capacitance"] .entry')).toBe('250 uF');
  }, TIMEOUT);

  it('made no network request and logged no error over the whole session', () => {
    expect(blocked).toEqual([]);
    expect(log.requests.filter((url) => url !== pageUrl && !url.startsWith('blob:'))).toEqual([]);
    expect(log.consoleErrors).toEqual([]);
    expect(log.pageErrors).toEqual([]);
  });
});

it('the design command refuses a scenario it cannot load, with the loader\'s one line and exit code 2', () => {
  const out = mkdtempSync(join(tmpdir(), 'railpulse-design-bad-'));
  try {
    const bad = join(out, 'bad.json');
    writeFileSync(bad, JSON.stringify({ name: 'x', bank: [] }));
    const run = cli(['design', bad, '-o', out]);
    expect(run.status).toBe(2);
    expect(run.stderr.trim().split('\n')).toHaveLength(1);
    expect(run.stderr).toContain(bad);
    expect(execFileSync('ls', [out], { encoding: 'utf8' }).trim()).toBe('bad.json');
  } finally {
    rmSync(out, { recursive: true, force: true });
  }
});
