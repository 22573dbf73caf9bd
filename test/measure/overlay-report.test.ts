/**
 * The overlay part of the shot report, pure: figures, residuals, the goodness-of-fit table and the embedded
 * data, on the synthetic report shot (test/report/fixtures). A measurement built as model + a known offset
 * has a known residual, so the plotted residual is checked against arithmetic, not against itself.
 */
import { describe, expect, it } from 'vitest';
import type { Measurement } from '../../src/measure/csv.js';
import { goodnessOfFit } from '../../src/measure/goodness.js';
import { interpolateSorted } from '../../src/core/interpolate.js';
import { readJsonScriptElement } from '../../src/report/escape.js';
import { buildShotReport } from '../../src/report/html.js';
import { overlayFigures, type OverlayFit, type OverlayInput } from '../../src/report/overlay.js';
import { syntheticReportInput } from '../report/report-input.js';

const input0 = syntheticReportInput({ samples: 4000 });
const input = input0;
const w = input.shot.waveforms!;
const OFFSET = 250; // A: the "probe" reads 250 A low everywhere
const times = Array.from({ length: 1500 }, (_, k) => k * 1e-6);
const measurement: Measurement = {
  t: times,
  signals: { I: interpolateSorted(w.t, w.current, times).map((i) => i - OFFSET) },
  source: 'scope <export>.csv',
  columns: [{ role: 't', header: 't [us]', unit: 'us', scale: 1, offset: 0 }, { role: 'I', header: 'I [kA]', unit: 'kA', scale: 1, offset: 0 }],
};
const overlay: OverlayInput = { measurement, measured: {}, goodness: goodnessOfFit(input.shot, measurement) };

type Trace = { name: string; x: number[]; y: number[] };

describe('overlay figures', () => {
  it('the time axis spans the record (200–700 µs) and the model is drawn over that span only, unless asked for the whole shot', () => {
    const part = Array.from({ length: 501 }, (_, k) => (200 + k) * 1e-6);
    const short: Measurement = { ...measurement, t: part, signals: { I: interpolateSorted(w.t, w.current, part) } };
    const input: OverlayInput = { measurement: short, measured: {}, goodness: goodnessOfFit(input0.shot, short) };
    const [figure] = overlayFigures(w, input);
    const xaxis = figure!.layout['xaxis'] as { range: number[] };
    expect(xaxis.range).toEqual([200, 700]); // µs on the axis
    const model = figure!.data.find((d) => d.name === 'model I') as unknown as Trace;
    expect(Math.min(...model.x)).toBeGreaterThanOrEqual(200);
    expect(Math.max(...model.x)).toBeLessThanOrEqual(700);
    const [whole] = overlayFigures(w, { ...input, wholeShot: true });
    expect((whole!.layout['xaxis'] as { range: number[] }).range[0]).toBe(0);
    // the whole 3 ms shot: the axis unit becomes ms
    expect((whole!.layout['xaxis'] as { range: number[] }).range[1]).toBeCloseTo(w.t.at(-1)! * 1e3, 3);
  });

  it('marks the samples left out at switching instants (the triggers at 80 and 160 µs lie on the 1 µs grid)', () => {
    const [figure] = overlayFigures(w, overlay);
    const marked = figure!.data.find((d) => d.name.startsWith('left out')) as unknown as Trace;
    expect(overlay.goodness.samples!.interval).toBeCloseTo(1e-6, 12);
    // a sample exactly on an instant is left out; its neighbours one interval away are kept (axis in ms)
    for (const trigger of [80, 160]) {
      expect(marked.x).toContain(trigger / 1000);
      expect(marked.x).not.toContain((trigger + 1) / 1000);
      expect(marked.x).not.toContain((trigger - 1) / 1000);
    }
    expect(overlay.goodness.signals.I!.points).toBe(times.length - overlay.goodness.samples!.excluded.length);
  });

  it("marks the fit's down-weighted samples and lists them on the page", () => {
    const fit: OverlayFit = {
      parameters: {}, correlations: {}, residual: { rms: 1, chiSquaredReduced: 1 }, shots: 1, iterations: 1, warnings: [],
      outerIterations: 1, huberThreshold: 3, blockSize: 1, excluded: [],
      downWeighted: [{ group: 'I', t: 500e-6, measured: measurement.signals.I![500]!, residual: 7.5, weight: 0.4 }],
    };
    const [figure] = overlayFigures(w, { ...overlay, fit });
    const marked = figure!.data.find((d) => d.name.startsWith('down-weighted')) as unknown as Trace;
    expect(marked.x).toEqual([0.5]); // ms
    const html = buildShotReport({ ...input0, overlay: { ...overlay, fit } });
    expect(html).toContain('data-down-weighted="1"');
    expect(html).toContain('data-down-weighted-t="0.0005"');
    expect(html).toContain('<h2>Measured against model</h2>');
  });

  it('the residual of a record read 250 A low is +250 A at every sample (model − measured)', () => {
    const [figure] = overlayFigures(w, overlay);
    expect(figure!.id).toBe('plot-overlay-I');
    const residual = figure!.data.find((d) => d.name.startsWith('residual I'))! as unknown as { y: number[] };
    // plotted in the axis' engineering unit (A here, as 250 A reads 250)
    for (const y of residual.y) expect(y).toBeCloseTo(OFFSET, 6);
    expect(overlay.goodness.signals.I!.rms).toBeCloseTo(OFFSET, 9);
  });

  it('draws nothing without waveforms, and only the signals measured', () => {
    expect(overlayFigures(null, overlay)).toEqual([]);
    expect(overlayFigures(w, overlay).map((f) => f.id)).toEqual(['plot-overlay-I']);
  });

  it('the report embeds the overlay and escapes a source name with markup', () => {
    const html = buildShotReport({ ...input, overlay });
    expect(html).toContain('id="overlay"');
    expect(html).not.toContain('scope <export>.csv');
    const embedded = readJsonScriptElement(html, 'railpulse-overlay') as { source: string; goodness: { signals: { I: { rms: number } } } };
    expect(embedded.source).toBe('scope <export>.csv');
    expect(embedded.goodness.signals.I.rms).toBeCloseTo(OFFSET, 9);
    const plots = readJsonScriptElement(html, 'railpulse-plots') as { id: string }[];
    expect(plots[0]!.id).toBe('plot-overlay-I');
    // without an overlay the report is unchanged: no overlay section, no overlay element
    const plain = buildShotReport(input);
    expect(plain).not.toContain('railpulse-overlay');
    expect(plain).not.toContain('id="overlay"');
  });
});
