/**
 * The browser for the browser tests: Debian's Chromium driven by playwright-core (no browser download). On a
 * fresh machine the set-up installs it with apt-get; then it starts it once, so a browser that cannot start
 * fails the whole run with one line instead of four test files failing at launch.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { ensureDebianPackages, SetupError } from './debian.js';

/** Where the browser is (RAILPULSE_CHROMIUM may point at another build of Chromium). */
export const CHROMIUM_PATH = process.env.RAILPULSE_CHROMIUM || '/usr/bin/chromium';

export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
];

export async function ensureBrowser(): Promise<void> {
  if (!process.env.RAILPULSE_CHROMIUM) ensureDebianPackages({ program: CHROMIUM_PATH, packages: ['chromium'], purpose: 'the browser tests' });
  const profile = mkdtempSync(join(tmpdir(), 'railpulse-chromium-check-'));
  try {
    const browser = await chromium.launchPersistentContext(profile, { executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_ARGS, timeout: 120_000 });
    await browser.close();
  } catch (error) {
    const first = (error instanceof Error ? error.message : String(error)).split('\n').find((line) => line.trim()) ?? 'unknown error';
    throw new SetupError(`the browser tests need a Chromium that starts; ${CHROMIUM_PATH} does not: ${first.trim()}`);
  } finally {
    rmSync(profile, { recursive: true, force: true });
  }
}
