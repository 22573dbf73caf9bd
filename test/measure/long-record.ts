/**
 * A long scope export for the long-record test and benchmark: a shot of the model sampled uniformly (a
 * digitiser's record of millions of points) with seeded Gaussian noise, written in chunks so that writing
 * ten million rows never holds the file in memory. Invented data.
 */
import { closeSync, openSync, writeSync } from 'node:fs';
import { interpolationCursor } from '../../src/core/interpolate.js';
import type { Shot } from '../../src/solve/types.js';
import { seededNormalPairs } from './random.js';

export interface LongRecordSpec {
  /** rows of samples */
  rows: number;
  /** time of the last sample (s); the first is at 0 */
  span: number;
  /** noise σ of the current (A) and the breech voltage (V) */
  noise: { I: number; V_breech: number };
  seed: number;
}

const CHUNK_ROWS = 50_000;

/**
 * Write `spec.rows` samples of the shot's current and breech voltage; returns the sample interval (s). The
 * columns are integers, as a digitiser stores them (time in ps, current in A, voltage in mV): fast to write.
 */
export function writeLongRecord(path: string, shot: Shot, spec: LongRecordSpec): number {
  const w = shot.waveforms!;
  const current = interpolationCursor(w.t, w.current);
  const breech = interpolationCursor(w.t, w.breechVoltage);
  const normal = seededNormalPairs(spec.seed);
  const picoseconds = Math.round((spec.span / (spec.rows - 1)) * 1e12);
  const interval = picoseconds * 1e-12;
  const fd = openSync(path, 'wx');
  try {
    writeSync(fd, 'Model,TRW-4 (fictional scope)\nRecord,long record (invented)\nt [ps],I [A],V_breech [mV]\n');
    for (let start = 0; start < spec.rows; start += CHUNK_ROWS) {
      const lines: string[] = [];
      for (let k = start; k < Math.min(spec.rows, start + CHUNK_ROWS); k++) {
        const t = k * interval;
        const amps = current(t) + spec.noise.I * normal();
        const millivolts = 1e3 * (breech(t) + spec.noise.V_breech * normal());
        lines.push(`${k * picoseconds},${Math.round(amps)},${Math.round(millivolts)}`);
      }
      writeSync(fd, lines.join('\n') + '\n');
    }
  } finally {
    closeSync(fd);
  }
  return interval;
}
