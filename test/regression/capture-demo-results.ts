/**
 * Capture the regression fixture of the demo results (test/regression/fixtures/demo-results.json).
 * Run only when a change of the results is intended and understood:
 *   node --import tsx test/regression/capture-demo-results.ts
 */
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { FIXTURE, demoFiles, demoResults } from './demo-results.js';

const all: Record<string, unknown> = {};
for (const file of demoFiles()) all[file] = await demoResults(file);
mkdirSync(dirname(FIXTURE), { recursive: true });
writeFileSync(`${FIXTURE}.tmp`, JSON.stringify(all, null, 1) + '\n');
renameSync(`${FIXTURE}.tmp`, FIXTURE);
console.log(`wrote ${FIXTURE}: ${Object.keys(all).join(', ')}`);
