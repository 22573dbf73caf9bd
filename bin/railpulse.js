#!/usr/bin/env node
// Entry point: the CLI is bundled into dist/ (by `npm run build`, run on install) so start-up stays lean.
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const bundle = new URL('../dist/railpulse.mjs', import.meta.url);
if (!existsSync(fileURLToPath(bundle))) {
  process.stderr.write('railpulse: the CLI is not built; run `npm run build` (npm ci does it for you)\n');
  process.exit(2);
}
await import(bundle.href);
