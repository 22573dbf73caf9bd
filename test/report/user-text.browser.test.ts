/**
 * User text is inert on every page railpulse writes. A scenario whose name, description, group label and filing
 * fields hold markup (an <a href>, <b>, <i>, <br> that the plotting library would draw, an <img> with a handler) is
 * run through the real commands — run, overlay, compare, sweep, index — and each page is opened in Chromium: no
 * element is made from the user's text (no link, no bold or italic run, no image), and the text shows literally,
 * inside the plots too.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, watchPage, type BrowserSession } from './browser.js';

const MARKUP = '<a href="https://evil.example/x">L1</a><b>B1</b><i>I1</i><br>X1<img src=x onerror="document.title=\'pwned\'">';
const CLI = resolve('bin/railpulse.js');
const RENDER_TIMEOUT = 120_000;

let dir: string;
let session: BrowserSession;
const pages: Record<string, string> = {};

function railpulse(args: string[]): void {
  execFileSync(process.execPath, [CLI, ...args], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-user-text-'));
  const raw = JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8')) as Record<string, unknown>;
  delete raw['$schema'];
  raw['name'] = `Bench ${MARKUP}`;
  raw['description'] = `described ${MARKUP}`;
  (raw['bank'] as Array<Record<string, unknown>>)[0]!['label'] = `G ${MARKUP}`;
  raw['record'] = { shotId: `S ${MARKUP}`, operator: `O ${MARKUP}`, reviewer: `R ${MARKUP}`, notes: `N ${MARKUP}` };
  const file = join(dir, 'hostile.json');
  writeFileSync(file, JSON.stringify(raw, null, 2));
  const records = join(dir, 'records');
  mkdirSync(records);
  railpulse(['run', file, '--report', join(records, 'record.html')]);
  railpulse(['overlay', file, 'scenarios/measured/bench-shot-17.csv', '--map', 'CH1=I', '--unit', 'CH1=kA', '--report', join(records, 'overlay.html')]);
  railpulse(['compare', file, 'scenarios/staggered-bank.json', '--report', join(dir, 'compare.html')]);
  railpulse(['sweep', file, '--vary', 'bank[0].voltage=5kV,6kV', '--out', join(dir, 'study'), '--jobs', '1']);
  railpulse(['index', records]);
  Object.assign(pages, {
    'shot record': join(records, 'record.html'),
    'overlay record': join(records, 'overlay.html'),
    comparison: join(dir, 'compare.html'),
    'study page': join(dir, 'study', 'study.html'),
    'archive index': join(records, 'index.html'),
  });
  expect(readdirSync(records).sort()).toEqual(['index.html', 'overlay.html', 'record.html']);
}, 240_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe.each(['shot record', 'overlay record', 'comparison', 'study page', 'archive index'])('user text on the %s', (name) => {
  it('makes no element, runs no handler, and shows literally', async () => {
    session ??= await launchBrowser();
    const page = await session.context.newPage();
    const log = watchPage(page);
    await page.goto(pathToFileURL(pages[name]!).href);
    if (name !== 'archive index') await page.waitForSelector('body[data-plots="rendered"]', { timeout: RENDER_TIMEOUT });
    // runs in the page (a string, so the test's own types need no DOM)
    const made = (await page.evaluate(`(() => {
      const own = (e) => [...e.childNodes].filter((n) => n.nodeType === 3).map((n) => (n.textContent || '').trim());
      const all = [...document.querySelectorAll('*')];
      return {
        links: document.querySelectorAll('a[href*="evil.example"]').length,
        images: document.querySelectorAll('img').length,
        // an element whose own text is exactly what stood inside a user's tag was built from that tag
        built: all.filter((e) => own(e).some((t) => t === 'L1' || t === 'B1' || t === 'I1')).map((e) => e.tagName),
        title: document.title,
        text: document.body.innerText,
        svgText: [...document.querySelectorAll('svg text')].map((t) => t.textContent).join('\\n'),
      };
    })()`)) as { links: number; images: number; built: string[]; title: string; text: string; svgText: string };
    expect(made.links).toBe(0);
    expect(made.images).toBe(0);
    expect(made.built).toEqual([]);
    expect(made.title).not.toBe('pwned');
    expect(made.text).toContain('<b>B1</b><i>I1</i><br>X1');
    if (name === 'shot record' || name === 'overlay record') {
      // the group's label in the plot legends and event marks, as plotly draws them (SVG text)
      expect(made.svgText).toContain('G <a href="https://evil.example/x">L1</a><b>B1</b><i>I1</i><br>X1');
    }
    if (name === 'comparison') expect(made.svgText).toContain('1: Bench <a href="https://evil.example/x">L1</a><b>B1</b>');
    expect(log.pageErrors).toEqual([]);
    await page.close();
  }, RENDER_TIMEOUT + 30_000);
});
