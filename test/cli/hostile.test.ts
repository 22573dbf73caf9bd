/**
 * The cases of a hostile first use, through the real command: each is one line on stderr and exit code 2 (or a
 * quiet end), never an internal error; outputs are checked before the work; an index.html railpulse did not write
 * is left alone.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir, userInfo } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'railpulse-hostile-'));
const base = JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8')) as Record<string, any>;
const cli = (args: string[], options: { input?: string } = {}) => spawnSync(process.execPath, ['bin/railpulse.js', ...args], { encoding: 'utf8', ...options });
function scenario(name: string, edit: (s: Record<string, any>) => void = () => {}, text?: string): string {
  const copy = structuredClone(base);
  edit(copy);
  const file = join(dir, `${name}.json`);
  writeFileSync(file, text ?? JSON.stringify(copy));
  return file;
}
function oneLine(result: ReturnType<typeof cli>, pattern: RegExp): void {
  expect(result.status).toBe(2);
  const lines = result.stderr.trimEnd().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(result.stderr).not.toMatch(/internal error|\n\s+at /);
}

describe('hostile input through the real command', () => {
  it.each([
    ['1e308 V', (s: any) => (s.bank[0].voltage = 1e308), /bank\[0\]\.voltage: expected a charge voltage > 0 and ≤ 1 MV, got 1 × 10³⁰⁸ V/],
    ['"1e200 V"', (s: any) => (s.bank[0].voltage = '1e200 V'), /bank\[0\]\.voltage: expected a charge voltage > 0 and ≤ 1 MV/],
    ['1e308 F', (s: any) => (s.bank[0].capacitance = 1e308), /bank\[0\]\.capacitance: expected a capacitance from 1 pF to 10 F/],
    ['a material named constructor that is not defined', (s: any) => (s.rails.material = 'constructor'), /rails\.material: unknown material "constructor"/],
    ['a key named constructor', (s: any) => (s.feed.constructor = 1), /feed\.constructor: unknown key/],
    ['a 20,000-character name', (s: any) => (s.name = 'x'.repeat(20_000)), /name: expected a text of at most 200 characters, got 20000/],
    ['a bank of 1,001 groups', (s: any) => (s.bank = Array.from({ length: 1001 }, () => s.bank[0])), /bank: expected at most 1000 entries, got 1001/],
  ])('%s: one line naming the path, exit 2', (_name, edit, pattern) => {
    oneLine(cli(['run', scenario(`case-${_name.length}`, edit), '--no-report']), pattern);
  });

  it('a stored energy above 10 GJ is refused; a charge voltage of exactly 1 MV (the bound) is accepted by the loader', () => {
    oneLine(cli(['run', scenario('energy', (s) => { s.bank[0].voltage = '1 MV'; s.bank[0].capacitance = '1 F'; s.bank[0].count = 100; }), '--no-report']), /bank: stores .*J .*at most 10 GJ/);
    const atBound = cli(['run', scenario('bound', (s) => { s.bank[0].voltage = '1 MV'; s.bank[0].capacitance = '1 uF'; s.solver = { maxSteps: 50 }; }), '--no-report', '--json']);
    expect(atBound.stderr).not.toMatch(/voltage/);
  });

  it('deeply nested JSON (a million brackets) is one line with its position', () => {
    oneLine(cli(['run', scenario('nested', undefined, '['.repeat(1_000_000))]), /line 1, column 65: malformed JSON \(nesting deeper than 64 levels/);
  });

  it('a file of more than 4 MB is refused before it is parsed', () => {
    oneLine(cli(['run', scenario('huge', (s) => (s.description = 'x'.repeat(5_000_000)))]), /the file is 4\.8 MB; a scenario file is at most 4 MB/);
  });

  it('a UTF-8 byte-order mark is accepted; UTF-16 and invalid UTF-8 are one line', () => {
    const withMark = cli(['run', scenario('bom', undefined, `\uFEFF${JSON.stringify(base)}`), '--no-report', '--json']);
    expect(withMark.status).toBe(0);
    const plain = cli(['run', 'scenarios/bench-shot.json', '--no-report', '--json']);
    expect(JSON.parse(withMark.stdout).muzzleVelocity).toBe(JSON.parse(plain.stdout).muzzleVelocity);
    const utf16 = join(dir, 'utf16.json');
    writeFileSync(utf16, Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(JSON.stringify(base), 'utf16le')]));
    oneLine(cli(['run', utf16]), /the file is UTF-16 text; save it as UTF-8/);
    const latin1 = join(dir, 'latin1.json');
    writeFileSync(latin1, Buffer.from('{"name": "Caf\xe9"}', 'latin1'));
    oneLine(cli(['run', latin1]), /byte 15: not UTF-8 text/);
  });

  it('endTime "10 s" runs (the default sample interval follows the end time); a sample interval the user set names both', () => {
    const long = cli(['run', scenario('end10', (s) => (s.solver = { endTime: '10 s', maxSteps: 20 })), '--no-report', '--json']);
    expect(long.stderr).not.toMatch(/sampleInterval/);
    oneLine(cli(['run', scenario('both', (s) => (s.solver = { endTime: '10 s', sampleInterval: '1 us' })), '--no-report']), /solver\.sampleInterval: 1 µs up to solver\.endTime \(10 s\) gives 10,000,000 samples; at most 2,000,000/);
  });

  it('an unknown option is one line with a hint, not the whole help', () => {
    oneLine(cli(['run', 'scenarios/bench-shot.json', '--jsn']), /^railpulse: unknown option '--jsn' \(did you mean --json\?\); see "railpulse run --help"$/);
    oneLine(cli(['frobnicate']), /unknown command 'frobnicate'; see "railpulse --help"/);
  });

  it('a closed stdout (run … | head -1) ends quietly with exit 0', () => {
    const result = spawnSync('bash', ['-c', `set -o pipefail; "${process.execPath}" bin/railpulse.js run scenarios/bench-shot.json --no-report --json | head -c 1 >/dev/null`], { encoding: 'utf8' });
    expect(result.stderr).toBe('');
    expect(result.status).toBe(0);
  });

  it('a read-only output folder: one line naming the path the user gave, never a hidden temporary file; nothing is shot', () => {
    const readOnly = join(dir, 'read-only');
    mkdirSync(readOnly);
    // As root, permissions do not stop a write: mount a read-only file system over the folder in a private mount
    // namespace instead (other processes never see it).
    const command = [process.execPath, 'bin/railpulse.js', 'run', 'scenarios/bench-shot.json', '--report', readOnly].map((a) => `'${a}'`).join(' ');
    const result = userInfo().uid === 0
      ? spawnSync('unshare', ['-m', 'sh', '-c', `mount -t tmpfs -o ro railpulse-ro '${readOnly}' && ${command}`], { encoding: 'utf8' })
      : (spawnSync('chmod', ['555', readOnly]), cli(['run', 'scenarios/bench-shot.json', '--report', readOnly]));
    oneLine(result, new RegExp(`--report: ${readOnly}: cannot write in this folder: (the file system is read-only \\(EROFS\\)|permission denied \\(EACCES\\))$`));
    expect(result.stderr).not.toMatch(/\.tmp/);
    expect(result.stdout).toBe('');
  });

  it('--csv naming an existing file fails before the shot; --from-report refuses a scenario beside it and says whether it files a record', () => {
    const csv = join(dir, 'taken.csv');
    writeFileSync(csv, 'mine');
    const taken = cli(['run', 'scenarios/bench-shot.json', '--csv', csv, '--no-report']);
    oneLine(taken, /--csv: .*taken\.csv exists; railpulse never overwrites a file/);
    expect(taken.stdout).toBe('');
    const records = join(dir, 'records');
    mkdirSync(records);
    expect(cli(['run', 'scenarios/bench-shot.json', '--report', records]).status).toBe(0);
    const record = join(records, readdirSync(records)[0]!);
    oneLine(cli(['run', 'scenarios/bench-shot.json', '--from-report', record]), /--from-report: re-runs the scenario archived in .*; a scenario file \(scenarios\/bench-shot\.json\) cannot be given beside it/);
    const check = cli(['run', '--from-report', record]);
    expect(check.status).toBe(0);
    expect(check.stderr).toMatch(/results identical to the archived record.*\nno record filed \(give --report DIR to file one\)\n$/);
    expect(readdirSync(records)).toHaveLength(1);
    const filed = cli(['run', '--from-report', record, '--report', records]);
    expect(filed.stderr).toMatch(/record of the re-run: /);
    // the re-run's record carries the archived scenario's hash, so its name has the same tag
    const names = readdirSync(records).sort();
    expect(names).toHaveLength(2);
    expect(names[0]!.replace(/-2\.html$/, '.html')).toBe(names[1]); // "-2" sorts before ".html"
  });

  it('index replaces only an index.html it wrote itself', () => {
    const folder = join(dir, 'indexed');
    mkdirSync(folder);
    writeFileSync(join(folder, 'index.html'), '<!doctype html><title>our lab page</title>');
    oneLine(cli(['index', folder]), /index: .*index\.html exists and was not written by railpulse; it is left as it is/);
    expect(readFileSync(join(folder, 'index.html'), 'utf8')).toContain('our lab page');
    const own = join(dir, 'own-index');
    mkdirSync(own);
    expect(cli(['index', own]).status).toBe(0);
    expect(readFileSync(join(own, 'index.html'), 'utf8')).toContain('<meta name="generator" content="railpulse index">');
    expect(cli(['index', own]).status).toBe(0);
  });
});

describe('size: outputs checked first, its own exit code for no feasible design', () => {
  const sizing = JSON.parse(readFileSync('test/study/fixtures/two-group.json', 'utf8')) as Record<string, any>;
  it('an --out that exists fails before any shot; the default name taken gets the next free name', () => {
    const file = join(dir, 'size.json');
    writeFileSync(file, JSON.stringify({ ...sizing, target: { muzzleVelocity: '80 m/s' }, limits: { modulesPerGroup: 1, chargeVoltage: '20 kV' } }));
    const out = join(dir, 'sized-taken.json');
    writeFileSync(out, 'mine');
    const refused = cli(['size', file, '--out', out, '--no-report']);
    oneLine(refused, /--out: .*sized-taken\.json exists/);
    expect(refused.stderr).not.toMatch(/sizing…/);
    const first = cli(['size', file, '--no-report']);
    const second = cli(['size', file, '--no-report']);
    expect([first.status, second.status]).toEqual([0, 0]);
    const written = readdirSync(dir).filter((f) => f.startsWith('size.sized-')).sort();
    expect(written).toHaveLength(2);
    expect(written[0]!.replace(/-2\.json$/, '.json')).toBe(written[1]); // "-2" sorts before ".json"
  }, 240_000);

  it('a design exactly at the charge-voltage limit that falls short is described as at the limit, not exceeding it', () => {
    const file = join(dir, 'size-short.json');
    writeFileSync(file, JSON.stringify({ ...sizing, target: { muzzleVelocity: '80 m/s' }, limits: { modulesPerGroup: 1, chargeVoltage: '3 kV' } }));
    const result = cli(['size', file, '--no-report']);
    expect(result.status).toBe(3);
    expect(result.stderr).toMatch(/3\.000 kV, .* — reaches only [\d.]+ m\/s at the chargeVoltage limit/);
    expect(result.stderr).not.toMatch(/exceeds chargeVoltage/);
  }, 240_000);
});
