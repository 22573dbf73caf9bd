/**
 * Shared set-up for the browser tests: Debian's Chromium driven by playwright-core (no browser download),
 * a fresh profile per launch, and a record of every request and console message a page makes.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

import { CHROMIUM_ARGS, CHROMIUM_PATH } from '../setup/browser.js';

export { CHROMIUM_PATH };

export interface BrowserSession {
  context: BrowserContext;
  close(): Promise<void>;
}

export async function launchBrowser(): Promise<BrowserSession> {
  const profile = mkdtempSync(join(tmpdir(), 'railpulse-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    viewport: { width: 1200, height: 900 },
    args: CHROMIUM_ARGS,
  });
  return {
    context,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

export interface PageLog {
  requests: string[];
  consoleErrors: string[];
  pageErrors: string[];
}

/** Attach listeners before navigation so nothing the page does goes unseen. */
export function watchPage(page: Page): PageLog {
  const log: PageLog = { requests: [], consoleErrors: [], pageErrors: [] };
  page.on('request', (request) => log.requests.push(request.url()));
  page.on('console', (message) => {
    if (message.type() === 'error' || message.type() === 'warning') log.consoleErrors.push(`${message.type()}: ${message.text()}`);
  });
  page.on('pageerror', (error) => log.pageErrors.push(error.message));
  return log;
}
