// Before the suite: build the bundled CLI (so the CLI tests never test stale code) and bring the browser the
// browser tests use (installed from Debian when missing, then started once).
import { execFileSync } from 'node:child_process';
import { ensureBrowser } from './browser.js';

export default async function setup(): Promise<void> {
  execFileSync(process.execPath, ['scripts/build.mjs'], { stdio: 'inherit' });
  await ensureBrowser();
}
