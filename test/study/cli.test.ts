// The study commands as a user runs them: a separate process, one line and exit 2 for bad input, and a sweep
// killed mid-way then resumed without losing or doubling a point.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadScenarioFile } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { csvLine, studyLayout } from '../../src/study/rows.js';
import { TWO_GROUP_FILE } from './fixtures.js';

// Until src/cli/main.ts registers the study commands, the tests run them through a small entry of their own.
const ENTRY = ['bin/railpulse.js'];
const root = mkdtempSync(join(tmpdir(), 'railpulse-cli-'));

function run(args: string[]) {
  return spawnSync(process.execPath, [...ENTRY, ...args], { encoding: 'utf8', timeout: 60_000 });
}

describe('study commands', () => {
  it.each([
    ['armature.mas=20g', /did you mean armature\.mass/],
    ['bank[3].voltage=1kV', /bank has 2 entries/],
    ['armature.mass=3 kV', /expected a mass/],
    ['bank[0].voltage=log:0V:4kV:3', /> 0/],
    ['armature.mass=-5g,10g', /armature\.mass = -0\.005 \(SI\) is not allowed/],
  ])('bad --vary %s: one line on stderr, exit code 2', (spec, pattern) => {
    const result = run(['sweep', TWO_GROUP_FILE, '--vary', spec, '--out', join(root, 'never')]);
    expect(result.status).toBe(2);
    expect(result.stdout).toBe('');
    const lines = result.stderr.trimEnd().split('\n');
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/--vary/);
    expect(lines[0]).toMatch(pattern);
    expect(existsSync(join(root, 'never'))).toBe(false);
  });

  it('a sweep killed mid-way and resumed ends with every point exactly once, rows in index order', async () => {
    const out = join(root, 'killed');
    const args = ['sweep', TWO_GROUP_FILE, '--vary', 'bank[0].voltage=2kV:4kV:40', '--vary', 'armature.mass=10g:20g:10', '--jobs', '1', '--out', out];
    const child = spawn(process.execPath, [...ENTRY, ...args], { stdio: 'ignore' });
    const jsonl = join(out, 'points.jsonl');
    const countLines = (): number => (existsSync(jsonl) ? readFileSync(jsonl, 'utf8').split('\n').length - 1 : 0);
    let atKill = 0;
    await new Promise<void>((resolve, reject) => {
      const poll = setInterval(() => {
        atKill = countLines();
        if (atKill > 0) {
          child.kill('SIGKILL');
          clearInterval(poll);
        }
      }, 5);
      child.on('exit', () => {
        clearInterval(poll);
        resolve();
      });
      child.on('error', reject);
    });
    const afterKill = countLines();
    expect(afterKill).toBeGreaterThan(0);
    expect(afterKill).toBeLessThan(400);

    const resumed = run([...args.slice(0, -4), '--jobs', '2', '--out', out, '--resume', '--json']);
    expect(resumed.status).toBe(0);
    const summary = JSON.parse(resumed.stdout) as { resumedFrom: number; ran: number; complete: boolean };
    expect(summary.complete).toBe(true);
    expect(summary.resumedFrom + summary.ran).toBe(400);
    const rows = readFileSync(jsonl, 'utf8').trimEnd().split('\n').map((line) => JSON.parse(line) as Record<string, unknown>);
    expect(rows.map((row) => row.index)).toEqual(Array.from({ length: 400 }, (_, i) => i));
    const layout = studyLayout(loadScenarioFile(TWO_GROUP_FILE).scenario, ['bank[0].voltage', 'armature.mass']);
    const csv = readFileSync(join(out, 'points.csv'), 'utf8').split('\n');
    expect(csv.slice(1).join('\n')).toBe(rows.map((row) => csvLine(layout, row)).join(''));
    expect(existsSync(join(out, 'study.html'))).toBe(true);
  }, 240_000);

  it('size writes a loadable sized scenario that reaches the target, and names the binding limit when it cannot', () => {
    const raw = JSON.parse(readFileSync(TWO_GROUP_FILE, 'utf8')) as Record<string, unknown>;
    const feasible = join(root, 'size-ok.json');
    writeFileSync(feasible, JSON.stringify({ ...raw, target: { muzzleVelocity: '80 m/s' }, limits: { modulesPerGroup: 1, chargeVoltage: '20 kV' } }));
    const out = join(root, 'sized.json');
    const ok = run(['size', feasible, '--out', out, '--report', root]);
    expect(ok.status).toBe(0);
    expect(ok.stderr).toMatch(/^sized: 1 module\(s\) per group/m);
    // and the shot record of the sized design
    const record = /^report: (.*\.html)$/m.exec(ok.stderr)?.[1];
    expect(record && existsSync(record)).toBe(true);
    const sized = loadScenarioFile(out);
    expect(sized.scenario.description).toMatch(/Sized by railpulse size from/);
    const velocity = runShot(sized.scenario, { waveforms: false }).results.muzzleVelocity;
    expect(Math.abs(velocity / 80 - 1)).toBeLessThan(1e-3);

    const infeasible = join(root, 'size-bad.json');
    writeFileSync(infeasible, JSON.stringify({ ...raw, target: { muzzleVelocity: '80 m/s' }, limits: { modulesPerGroup: 1, chargeVoltage: '3 kV' } }));
    const bad = run(['size', infeasible, '--out', join(root, 'never.json')]);
    expect(bad.status).toBe(3); // no feasible design: its own exit code (README, exit codes)
    expect(bad.stderr).toMatch(/no design reaches 80\.00 m\/s within the limits; binding: chargeVoltage/);
    expect(existsSync(join(root, 'never.json'))).toBe(false);

    const typo = join(root, 'size-typo.json');
    writeFileSync(typo, JSON.stringify({ ...raw, target: { muzzleVelocity: '80 m/s' }, limits: { peakCurent: '100 kA' } }));
    const typoRun = run(['size', typo]);
    expect(typoRun.status).toBe(2);
    expect(typoRun.stderr.trim()).toMatch(/limits\.peakCurent: unknown key \(did you mean peakCurrent\?\)/);
  }, 240_000);
});
