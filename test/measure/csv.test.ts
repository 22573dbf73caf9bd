import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readMeasurement, readMeasurementFile, readPositionPoints } from '../../src/measure/csv.js';
import { MAX_LINE_CHARACTERS } from '../../src/measure/lines.js';
import { InputError } from '../../src/core/errors.js';

const close = (a: ArrayLike<number> | undefined, b: number[]): void => {
  expect(a).toBeDefined();
  expect(a!.length).toBe(b.length);
  Array.from(a!).forEach((x, i) => expect(x).toBeCloseTo(b[i]!, 12));
};

/** The one line the CLI would print for this file, or '' when it reads. */
function errorLine(text: string, options: Record<string, unknown> = {}, source = 'shot12.csv'): string {
  try {
    readMeasurement(text, { source, ...options });
    return '';
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return (error as InputError).line();
  }
}

describe('readMeasurement: layouts instruments write (unit conversions: SI prefixes, BIPM SI Brochure)', () => {
  it('comma-separated with units in the headers converts µs, kA, kV and V to SI', () => {
    const m = readMeasurement('t [us],I [kA],V_breech [kV],V_muzzle [V]\n0,0,0,0\n1.5,2.5,3.5,40\n3,5,7,80\n', { source: 'a.csv' });
    close(m.t, [0, 1.5e-6, 3e-6]);
    close(m.signals.I, [0, 2500, 5000]);
    close(m.signals.V_breech, [0, 3500, 7000]);
    close(m.signals.V_muzzle, [0, 40, 80]);
    expect(m.source).toBe('a.csv');
  });

  it('skips the metadata lines a scope writes before the header', () => {
    const text = ['Model,DSO-X 9000 (example)', 'Record Length,4', 'Sample Interval,1e-6', 'Trigger Point,0', '', 't [s],I [A]', '0,0', '1e-6,10', '2e-6,20', '3e-6,15', ''].join('\r\n');
    const m = readMeasurement(text, { source: 'a.csv' });
    close(m.t, [0, 1e-6, 2e-6, 3e-6]);
    close(m.signals.I, [0, 10, 20, 15]);
  });

  it('semicolons with decimal commas (European spreadsheet export), first data row integers only', () => {
    const text = 'Gerät;Beispiel\nt [ms];I [kA]\n0;0\n0,5;1,25\n1,0;-2,5E-1\n';
    const m = readMeasurement(text, { source: 'a.csv' });
    close(m.t, [0, 5e-4, 1e-3]);
    close(m.signals.I, [0, 1250, -250]);
  });

  it('semicolons with decimal points, quoted headers, tab separators and a trailing separator', () => {
    close(readMeasurement('"t [us]";"I [A]"\n0.5;1.5\n1.5;2.5\n', { source: 'a' }).signals.I, [1.5, 2.5]);
    close(readMeasurement('t [us]\tV_breech [kV]\n0,5\t1,5\n1,5\t2,5\n', { source: 'a' }).signals.V_breech, [1500, 2500]);
    close(readMeasurement('t [us],I [A],\n0,1,\n1,2,\n', { source: 'a' }).t, [0, 1e-6]);
  });

  it('map gives meaning to channel names; units, scale and offset follow the documented order', () => {
    // Rogowski integrator read in volts at 2 kA/V, trigger 2 µs before the recorded zero.
    const text = 'TIME [us],CH1 [V],CH4 [V]\n0,0.5,9\n1,1.0,9\n';
    const m = readMeasurement(text, { source: 'a.csv', map: { TIME: 't', CH1: 'I', CH4: 'ignore' }, units: { CH1: 'kA' }, scale: { CH1: 2 }, offset: { t: 2 } });
    close(m.t, [2e-6, 3e-6]); // (raw × 1 + 2) µs
    close(m.signals.I, [1000, 2000]); // (raw × 2 + 0) kA
    expect(m.signals.V_breech).toBeUndefined();
    expect(m.columns.map((c) => c.role)).toEqual(['t', 'I']);
  });

  it('options keyed by signal name and units for a header without one', () => {
    const m = readMeasurement('t [us],Rogowski A\n0,1\n1,2\n', { source: 'a', map: { 'Rogowski A': 'I' }, units: { I: 'A' }, scale: { I: 1000 } });
    close(m.signals.I, [1000, 2000]);
  });

  it('micro sign spellings µ (U+00B5) and μ (U+03BC) both mean micro (model contract §6)', () => {
    close(readMeasurement('t [µs],I [A]\n1,0\n2,0\n', { source: 'a' }).t, [1e-6, 2e-6]);
    close(readMeasurement('t [μs],I [A]\n1,0\n2,0\n', { source: 'a' }).t, [1e-6, 2e-6]);
  });
});

describe('readMeasurement: a bad file gets one line naming file, line and problem', () => {
  const cases: [string, string, Record<string, unknown>, RegExp][] = [
    ['time going backwards', 't [us],I [A]\n41,1\n43,2\n42,3\n', {}, /^shot12\.csv:4: time is not increasing \(4\.2e-5 s after 4\.3e-5 s\)$/],
    ['a repeated time', 't [s],I [A]\n0,1\n0,2\n', {}, /^shot12\.csv:3: time is not increasing/],
    ['a short row', 't [us],I [A]\n0,1\n1\n', {}, /^shot12\.csv:3: expected 2 cells separated by "," like the header on line 1, found 1$/],
    ['an empty cell', 't [us],I [A],V_breech [kV]\n0,1,2\n1,,2\n', {}, /^shot12\.csv:3: empty cell in column "I \[A\]"$/],
    ['NaN', 't [us],I [A]\n0,1\n1,NaN\n', {}, /^shot12\.csv:3: expected a number with a decimal point in column "I \[A\]", found "NaN"$/],
    ['a decimal point among decimal commas', 't [us];I [A]\n0;1,5\n1;2.5\n', {}, /^shot12\.csv:3: expected a number with a decimal comma/],
    ['an unknown unit', 't [us],I [kAmp]\n0,1\n1,2\n', {}, /^shot12\.csv:1: unknown unit "kAmp" in column "I \[kAmp\]"; expected a current/],
    ['a unit of the wrong kind', 't [kA],I [A]\n0,1\n1,2\n', {}, /^shot12\.csv:1: unit "kA" of column "t \[kA\]" is not a time/],
    ['a channel name with no map', 't [us],CH1 [V]\n0,1\n1,2\n', {}, /^shot12\.csv:1: column "CH1 \[V\]" is not a known signal .*map it/],
    ['no unit anywhere', 't [us],I\n0,1\n1,2\n', {}, /^shot12\.csv:1: column "I" has no unit/],
    ['no time column', 'I [A],V_breech [V]\n0,1\n1,2\n', {}, /^shot12\.csv:1: no time column/],
    ['no numeric rows', 'Model,X\nt [us],I [A]\n', {}, /^shot12\.csv:1: no header row followed by numeric rows/],
    ['a footer line after the data', 't [us],I [A]\n0,1\n1,2\nEnd of data,x\n', {}, /^shot12\.csv:4: expected a number/],
    ['a map to nothing known', 't [us],CH1 [A]\n0,1\n1,2\n', { map: { CH1: 'current' } }, /^shot12\.csv:1: map sends "CH1 \[A\]" to "current"/],
    ['a scale for a column that is not there', 't [us],I [A]\n0,1\n1,2\n', { scale: { CH2: 10 } }, /^shot12\.csv: scale is given for "CH2", which is not a column/],
    ['two current columns', 't [us],I [A],CH1 [A]\n0,1,1\n1,2,2\n', { map: { CH1: 'I' } }, /^shot12\.csv:1: two columns are I/],
    ['an overflowing number', 't [us],I [A]\n0,1\n1,1e999\n', {}, /^shot12\.csv:3: number "1e999" in column "I \[A\]" is out of range$/],
  ];
  for (const [label, text, options, expected] of cases) {
    it(label, () => {
      const line = errorLine(text, options);
      expect(line).toMatch(expected);
      expect(line).not.toContain('\n');
    });
  }
});

describe('readPositionPoints: probe arrival times', () => {
  it('reads x and t in either order, sorts by position and converts to SI', () => {
    const p = readPositionPoints('t [us],x [mm]\n300,500\n100,100\n200,300\n', { source: 'probes.csv' });
    expect(p.x).toEqual([0.1, 0.3, 0.5]);
    p.t.forEach((t, i) => expect(t).toBeCloseTo([1e-4, 2e-4, 3e-4][i]!, 15));
  });

  it('rejects a probe reached before the one behind it (the armature never moves backwards, model contract §2)', () => {
    expect(() => readPositionPoints('x [m],t [us]\n0.1,100\n0.3,90\n', { source: 'probes.csv' })).toThrow(
      /probes\.csv:3: arrival time 9e-5 s at x = 0\.3 m is not after 1e-4 s at x = 0\.1 m \(line 2\)/,
    );
  });

  it('rejects a file without both columns', () => {
    expect(() => readPositionPoints('x [m],v [m/s]\n0.1,100\n', { source: 'probes.csv' })).toThrow(/probes\.csv:1: expected columns "x \[m\]" and "t \[us\]"/);
  });
});

describe('readMeasurementFile: the same reading, streamed a chunk at a time', () => {
  const dir = mkdtempSync(join(tmpdir(), 'railpulse-csv-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('a CRLF file of 80,000 rows (several 1 MiB chunks, line ends split between chunks) reads as the same text does', () => {
    const rows = Array.from({ length: 80_000 }, (_, k) => `${(k * 0.5).toFixed(1).replace('.', ',')};${(Math.sin(k / 900) * 12.5).toFixed(6).replace('.', ',')}`);
    const text = ['\uFEFFGerät;Beispiel', 't [µs];I [kA]', ...rows].join('\r\n') + '\r\n';
    const path = join(dir, 'long.csv');
    writeFileSync(path, text);
    const streamed = readMeasurementFile(path, { source: 'long.csv' });
    const whole = readMeasurement(text, { source: 'long.csv' });
    expect(streamed.t).toBeInstanceOf(Float64Array);
    expect(streamed.t.length).toBe(80_000);
    expect(Array.from(streamed.t)).toEqual(Array.from(whole.t));
    expect(Array.from(streamed.signals.I!)).toEqual(Array.from(whole.signals.I!));
    expect(streamed.t[79_999]).toBeCloseTo(39_999.5e-6, 15);
  });

  it('a row error deep in a streamed file names its line', () => {
    const path = join(dir, 'bad.csv');
    writeFileSync(path, ['t [us],I [kA]', ...Array.from({ length: 70_000 }, (_, k) => `${k},${k % 7}`), '70000,1.5.2'].join('\n') + '\n');
    expect(() => readMeasurementFile(path, { source: 'bad.csv' })).toThrow(/^bad\.csv:70002: expected a number with a decimal point in column "I \[kA\]", found "1\.5\.2"$/);
  });

  it('a file without line ends (binary or one endless line) is refused at its first line, not read whole', () => {
    const path = join(dir, 'endless.csv');
    writeFileSync(path, 't [us],I [kA]\n' + '1,'.repeat(MAX_LINE_CHARACTERS));
    expect(() => readMeasurementFile(path, { source: 'endless.csv' })).toThrow(/^endless\.csv:2: line longer than/);
  });

  it('a missing file is one line naming it', () => {
    expect(() => readMeasurementFile(join(dir, 'nope.csv'), { source: 'nope.csv' })).toThrow(/^nope\.csv: no such file$/);
  });
});
