/**
 * The layering of src/ (DEVELOPERS.md): rooms import only from rooms below them, pure rooms do no I/O, no
 * module cycles. Checked with dependency-cruiser, a dependency-graph linter, on the real tree and on a small
 * planted tree that breaks each rule (so the check is known to be able to fail).
 */
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');
const CRUISER = join(ROOT, 'node_modules', '.bin', 'depcruise');

interface CruiseReport {
  summary: { violations: { rule: { name: string }; from: string; to: string }[]; totalCruised: number };
}

function cruise(cwd: string): CruiseReport {
  const out = execFileSync(CRUISER, ['src', '--config', join(ROOT, '.dependency-cruiser.cjs'), '--output-type', 'json'], { cwd, encoding: 'utf8' });
  return JSON.parse(out) as CruiseReport;
}

describe('layering of src/', () => {
  it('has no import from a room above, no I/O in pure rooms and no cycles', () => {
    const report = cruise(ROOT);
    expect(report.summary.totalCruised).toBeGreaterThan(50);
    expect(report.summary.violations.map((v) => `${v.rule.name}: ${v.from} → ${v.to}`)).toEqual([]);
  });

  it('refuses a planted tree that breaks each rule', () => {
    const report = cruise(join(import.meta.dirname, 'fixture'));
    const found = report.summary.violations.map((v) => `${v.rule.name}: ${v.from} → ${v.to}`).sort();
    expect(found).toEqual([
      'no-circular: src/output/text.ts → src/report/page.ts',
      'no-io-in-pure-rooms: src/model/plant.ts → fs',
      'no-upward-import-from-model: src/model/plant.ts → src/cli/main.ts',
      'no-upward-import-from-output: src/output/text.ts → src/report/page.ts',
    ]);
  });
});
