/**
 * Shot records through the real command: run writes a self-contained report and never overwrites one,
 * --from-report re-runs an archived record and says whether it still matches, index lists the records,
 * and with SOURCE_DATE_EPOCH (reproducible-builds.org convention) the same input gives the same bytes.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readEmbedded } from '../../src/report/embedded.js';

const cli = (args: string[], env: Record<string, string> = {}) =>
  spawnSync(process.execPath, ['bin/railpulse.js', ...args], { encoding: 'utf8', env: { ...process.env, ...env } });

describe('railpulse run writes shot records', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railpulse-records-'));
  const epoch = { SOURCE_DATE_EPOCH: '1796169600' };

  it('writes a report named by date, slug and hash, and a second run picks a new name', () => {
    const first = cli(['run', 'scenarios/bench-shot.json', '--report', dir], epoch);
    const second = cli(['run', 'scenarios/bench-shot.json', '--report', dir], epoch);
    expect(first.status).toBe(0);
    expect(second.status).toBe(0);
    const files = readdirSync(dir).filter((f) => f.endsWith('.html')).sort();
    expect(files).toHaveLength(2);
    expect(files[0]).toMatch(/^2026-12-02_bay-2-bench-shot_[0-9a-f]{8}-2\.html$|^2026-12-02_bay-2-bench-shot_[0-9a-f]{8}\.html$/);
    const [a, b] = files.map((f) => readFileSync(join(dir, f), 'utf8'));
    // same input, same tool, fixed date: byte-identical records
    expect(a).toBe(b);
    const embedded = readEmbedded(a!);
    const json = cli(['run', 'scenarios/bench-shot.json', '--json', '--no-report']);
    const { checks, status, warnings, ...results } = JSON.parse(json.stdout);
    expect(embedded.results).toEqual(results);
    expect(embedded.checks).toEqual(checks);
    expect(embedded.status).toEqual(status);
    expect(embedded.warnings).toEqual(warnings.map((w: { message: string }) => w.message));
    expect(a).toContain("default-src 'none'");
  });

  it('--from-report re-runs the archived scenario and says the results still match', () => {
    const file = readdirSync(dir).find((f) => f.endsWith('.html'))!;
    const result = cli(['run', '--from-report', join(dir, file), '--no-report', '--json']);
    expect(result.status).toBe(0);
    expect(result.stderr).toMatch(/results identical to the archived record/);
  });

  it('--report FILE.html refuses to overwrite an existing file', () => {
    const file = join(dir, readdirSync(dir).find((f) => f.endsWith('.html'))!);
    const before = readFileSync(file, 'utf8');
    const result = cli(['run', 'scenarios/bench-shot.json', '--report', file]);
    expect(result.status).toBe(2);
    expect(result.stderr.trim()).toMatch(/--report: .* exists; railpulse never overwrites a file/);
    expect(readFileSync(file, 'utf8')).toBe(before);
  });

  it('index lists every record in the folder', () => {
    const result = cli(['index', dir]);
    expect(result.status).toBe(0);
    expect(result.stdout).toMatch(/index\.html: 2 records/);
    const index = readFileSync(join(dir, 'index.html'), 'utf8');
    for (const f of readdirSync(dir).filter((n) => n !== 'index.html' && n.endsWith('.html'))) expect(index).toContain(f);
  });
});
