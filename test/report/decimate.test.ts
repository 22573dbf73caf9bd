import { describe, expect, it } from 'vitest';
import { decimateIndices, pick } from '../../src/report/decimate.js';
import { EVENT_TIME, syntheticScenario, syntheticShot } from './fixtures/synthetic-shot.js';

const maxOf = (values: readonly number[]): number => values.reduce((a, b) => Math.max(a, b), -Infinity);
const minOf = (values: readonly number[]): number => values.reduce((a, b) => Math.min(a, b), Infinity);

function uniformTime(n: number): number[] {
  return Array.from({ length: n }, (_, i) => i * 1e-6);
}

describe('waveform decimation for display', () => {
  it('returns every index when the waveform is already short', () => {
    const t = uniformTime(500);
    expect(decimateIndices(t, [t.map(Math.sin)])).toEqual(t.map((_, i) => i));
  });

  it('keeps the true peak of a spike narrower than a bucket, and the global minimum', () => {
    const n = 200_001;
    const t = uniformTime(n);
    // a 3-sample spike far narrower than any bucket, on a slow ramp, and one negative dip
    const values = t.map((_, i) => i / n + (i === 123_457 ? 50 : i === 123_456 || i === 123_458 ? 20 : 0) - (i === 77 ? 3 : 0));
    const kept = decimateIndices(t, [values]);
    const decimated = pick(values, kept);
    expect(maxOf(decimated)).toBe(maxOf(values));
    expect(minOf(decimated)).toBe(minOf(values));
    expect(kept.length).toBeGreaterThanOrEqual(2000);
    expect(kept.length).toBeLessThanOrEqual(4000);
  });

  it('keeps both samples of an event duplicate (the two one-sided values at one instant)', () => {
    const n = 50_000;
    const t = uniformTime(n);
    t.splice(31_000, 0, t[31_000]!); // the same instant recorded twice
    const acceleration = t.map((time, i) => (i <= 31_000 ? 1 : 0.5) * Math.sin(time * 1e4));
    const kept = decimateIndices(t, [acceleration]);
    expect(kept).toContain(31_000);
    expect(kept).toContain(31_001);
    expect(t[31_000]).toBe(t[31_001]);
  });

  it('keeps the first and last samples and returns sorted, distinct indices shared by all series', () => {
    const t = uniformTime(100_000);
    const series = [t.map((x) => Math.sin(x * 3e3)), t.map((x) => Math.cos(x * 7e3)), t.map((x) => x)];
    const kept = decimateIndices(t, series, { target: 2500, max: 3500 });
    expect(kept[0]).toBe(0);
    expect(kept[kept.length - 1]).toBe(t.length - 1);
    for (let i = 1; i < kept.length; i++) expect(kept[i]!).toBeGreaterThan(kept[i - 1]!);
    expect(kept.length).toBeLessThanOrEqual(3500);
  });

  it('keeps the min/max envelope of each bucket (an oscillation far faster than the buckets keeps its full swing)', () => {
    const t = uniformTime(400_000);
    const fast = t.map((_, i) => (i % 2 === 0 ? 1 : -1) * (1 + i / 4e5));
    const kept = decimateIndices(t, [fast]);
    const decimated = pick(fast, kept);
    // every stretch of the decimated series still reaches both signs: nothing was averaged away
    expect(decimated.filter((v) => v > 0).length).toBeGreaterThan(kept.length / 3);
    expect(decimated.filter((v) => v < 0).length).toBeGreaterThan(kept.length / 3);
  });

  it('on a multi-group synthetic shot keeps every group\'s peak and the event duplicate', () => {
    const scenario = syntheticScenario({ groups: 4 });
    const shot = syntheticShot(scenario, 20_000);
    const w = shot.waveforms!;
    const kept = decimateIndices(w.t, [w.current, ...w.groupCurrent, w.acceleration]);
    expect(maxOf(pick(w.current, kept))).toBe(shot.results.peakCurrent);
    w.groupCurrent.forEach((values) => expect(maxOf(pick(values, kept))).toBe(maxOf(values)));
    const eventIndices = kept.filter((i) => w.t[i] === EVENT_TIME);
    expect(eventIndices).toHaveLength(2);
  });

  it('rejects series whose length differs from the time base', () => {
    expect(() => decimateIndices([0, 1, 2], [[1, 2]])).toThrow(RangeError);
  });
});
