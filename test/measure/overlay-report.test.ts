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
import { overlayFigures, type OverlayInput } from '../../src/report/overlay.js';
import { syntheticReportInput } from '../report/report-input.js';

const input = syntheticReportInput({ samples: 4000 });
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

describe('overlay figures', () => {
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
