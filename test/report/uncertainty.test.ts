/**
 * The record of a shot with tolerances: an uncertainty section with each headline result's σ, and bands on the
 * current and velocity plots whose half-width is the propagated σ times the coverage factor of the interval
 * chosen (±1σ by default; 95 % → ±1.96σ, normal tables).
 */
import { describe, expect, it } from 'vitest';
import { shotRecordHtml } from '../../src/pipeline/record.js';
import { shoot } from '../../src/pipeline/shoot.js';
import { loadScenarioFile } from '../../src/scenario/load.js';
import { runShot } from '../../src/solve/shot.js';
import { recordUncertainty, shotUncertainty } from '../../src/study/shotUncertainty.js';

interface Trace { name: string; y: (number | null)[]; fill?: string }

function plots(html: string): Record<string, Trace[]> {
  const text = /<script type="application\/json" id="railpulse-plots">([\s\S]*?)<\/script>/.exec(html)![1]!;
  const figures = JSON.parse(text) as { id: string; data: Trace[] }[];
  return Object.fromEntries(figures.map((f) => [f.id, f.data]));
}

describe('record with uncertainty', () => {
  it.each([[undefined, 1], [0.95, 1.959963985]])('band %s: section rows carry σ; the bands are nominal ± k·σ on current and velocity', async (band, k) => {
    const assessed = shoot(loadScenarioFile('scenarios/staggered-bank.json'));
    const u = (await shotUncertainty(assessed, { runShot, waveforms: true, ...(band ? { band } : {}) }))!;
    const html = shotRecordHtml(assessed, undefined, recordUncertainty(assessed, u));
    expect(html).toContain('<section id="uncertainty">');
    const sigma = Number(/data-uncertainty="muzzleVelocity" data-si="([^"]+)"/.exec(html)![1]);
    expect(sigma).toBe(u.linear.standardUncertainty.muzzleVelocity);
    const data = plots(html);
    for (const [id, lineName] of [['plot-current', 'total current I'], ['plot-motion', 'Velocity']] as const) {
      const traces = data[id]!;
      const upper = traces.find((t) => t.fill === 'tonexty')!;
      const lower = traces[traces.indexOf(upper) - 1]!;
      const line = traces.find((t) => t.name === lineName)!;
      expect(upper.name).toMatch(band ? /95\.0\s%\sinterval, ±1\.96σ/ : /±1σ/);
      // the last sample: the propagated σ of the value at exit, k σ either side (display units, 6 figures)
      const last = line.y.length - 1;
      const halfWidth = (upper.y[last]! - lower.y[last]!) / 2;
      const sigmaAtEnd = id === 'plot-motion' ? u.linear.waveforms!.velocity.at(-1)! : u.linear.waveforms!.current.at(-1)! / 1e3;
      expect(halfWidth / (k * sigmaAtEnd), id).toBeCloseTo(1, 3);
      expect((upper.y[last]! + lower.y[last]!) / 2).toBeCloseTo(line.y[last]!, 2);
    }
    // at the nominal exit time the band is the σ of the velocity at that instant: close to, not equal to, the σ of
    // the muzzle velocity (a perturbed shot leaves a little earlier or later)
    expect(Math.abs(u.linear.waveforms!.velocity.at(-1)! / sigma - 1)).toBeLessThan(0.05);
  }, 120_000);
});
