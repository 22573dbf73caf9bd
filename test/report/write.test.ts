import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { reportBaseName, reportFileName, slug, writeNewFile } from '../../src/output/write.js';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-write-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

describe('writing generated files', () => {
  it('never overwrites: a second and third file of the same name get -2 and -3', () => {
    const first = writeNewFile(dir, 'shot', 'html', 'first');
    const second = writeNewFile(dir, 'shot', '.html', 'second');
    const third = writeNewFile(dir, 'shot', 'html', 'third');
    expect([first, second, third].map((p) => basename(p))).toEqual(['shot.html', 'shot-2.html', 'shot-3.html']);
    expect(readFileSync(first, 'utf8')).toBe('first');
    expect(readFileSync(second, 'utf8')).toBe('second');
    expect(readFileSync(third, 'utf8')).toBe('third');
  });

  it('leaves no temporary file behind', () => {
    writeNewFile(dir, 'a', 'json', '{}');
    writeNewFile(dir, 'a', 'json', '{}');
    expect(readdirSync(dir).sort()).toEqual(['a-2.json', 'a.json']);
  });

  it('fails cleanly (and leaves no temporary file) when the directory does not exist', () => {
    expect(() => writeNewFile(join(dir, 'missing'), 'a', 'html', 'x')).toThrow(/ENOENT/);
    expect(readdirSync(dir)).toEqual([]);
  });
});

describe('report file names', () => {
  it('date, slug of the scenario name and a short hash', () => {
    expect(reportFileName('2026-12-02T23:59:59.000Z', 'Bench shot', '1a2b3c4d5e6f')).toBe('2026-12-02_bench-shot_1a2b3c4d.html');
    expect(reportBaseName(new Date('2026-01-05T00:00:00Z'), 'X', 'ABCDEF0123')).toBe('2026-01-05_x_abcdef01');
  });

  it('slugs are lowercase ASCII with dashes, whatever the name holds', () => {
    expect(slug('Größe <script>alert(1)</script> Ø12 mm — µs')).toBe('grosse-script-alert-1-script-o12-mm-s');
    expect(slug('../../etc/passwd')).toBe('etc-passwd');
    expect(slug('***')).toBe('shot');
    expect(slug('a'.repeat(100)).length).toBe(60);
  });

  it('rejects a date that is not one', () => {
    expect(() => reportFileName('yesterday', 'x', 'ab')).toThrow(RangeError);
  });
});
