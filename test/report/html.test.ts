import { describe, expect, it } from 'vitest';
import { jsonForScript } from '../../src/report/escape.js';
import { shotWarnings } from '../../src/checks/warnings.js';
import { buildShotReport, readEmbedded, STANDARD_GRAVITY } from '../../src/report/html.js';
import { PLOTLY_PACKAGE, plotlyBundleSource } from '../../src/report/plotly-bundle.js';
import { formatPercent } from '../../src/units/format.js';
import { parseShownFigure } from './figure-text.js';
import { fixedProvenance, syntheticReportInput } from './report-input.js';

/** The report without the inlined plotly bundle, for searching our own markup. */
function ownMarkup(html: string): string {
  return html.replace(plotlyBundleSource(), '');
}

function figureSi(html: string, key: string): number {
  const match = new RegExp(`data-figure="${key.replace('.', '\\.')}" data-si="([^"]*)"`).exec(html);
  if (!match) throw new Error(`no figure ${key}`);
  return Number(match[1]);
}

describe('shot report: escaping and embedded data', () => {
  it('shows a hostile scenario name as text, never as markup', () => {
    const input = syntheticReportInput({ name: '<script>alert(1)</script>', description: 'a & b <img src=x onerror=alert(2)>' });
    input.warnings = ['lead says <b>bold</b>'];
    const html = ownMarkup(buildShotReport(input));
    expect(html).not.toContain('<script>alert(1)');
    expect(html).not.toContain('<img src=x');
    expect(html).not.toContain('<b>bold</b>');
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(html).toContain('a &amp; b &lt;img src=x onerror=alert(2)&gt;');
    expect(html).toContain('lead says &lt;b&gt;bold&lt;/b&gt;');
  });

  it('JSON for a script element has no <, > or & and parses back to the same value', () => {
    const value = { s: '</script><!-- & \u2028 -->', n: [1.5, -2e-300] };
    const text = jsonForScript(value);
    expect(text).not.toMatch(/[<>&]/);
    expect(JSON.parse(text)).toEqual(value);
  });

  it('round-trips the scenario and results through the embedded JSON, even with </script> in user strings', () => {
    const input = syntheticReportInput({ name: 'shot </script><script>alert(1)</script>', description: '</SCRIPT> & <!--' });
    (input.scenarioRaw as Record<string, unknown>)['note'] = '</script>';
    const html = buildShotReport(input);
    const back = readEmbedded(html);
    expect(back.scenarioRaw).toEqual(input.scenarioRaw);
    expect(back.results).toEqual(input.shot.results);
    expect(back.provenance).toEqual(input.provenance);
    expect(back.scenarioName).toBe(input.scenario.name);
    // exactly the elements we wrote: no user string ends a script element early
    expect(ownMarkup(html).match(/<\/script>/g)).toHaveLength(5);
  });

  it('readEmbedded refuses a page that is not a report', () => {
    expect(() => readEmbedded('<html><body>hello</body></html>')).toThrow(/no embedded/);
  });
});

describe('shot report: content', () => {
  const input = syntheticReportInput({ groups: 3 });
  const html = buildShotReport(input);
  const results = input.shot.results;

  it('key figures carry the exact SI values of the results', () => {
    expect(figureSi(html, 'muzzleVelocity')).toBe(results.muzzleVelocity);
    expect(figureSi(html, 'efficiency')).toBe(results.efficiency);
    expect(figureSi(html, 'peakCurrent')).toBe(results.peakCurrent);
    expect(figureSi(html, 'peakCurrentTime')).toBe(results.peakCurrentTime);
    expect(figureSi(html, 'peakAcceleration')).toBe(results.peakAcceleration);
    expect(figureSi(html, 'actionIntegral')).toBe(results.actionIntegral);
    expect(figureSi(html, 'energy.magneticRails')).toBe(results.energy.magneticRails);
    expect(figureSi(html, 'moduleInductorEnergy')).toBe(results.energy.magnetic - results.energy.magneticRails);
  });

  it('states the acceleration in multiples of the standard gravity gₙ = 9.80665 m/s² (SI Brochure)', () => {
    expect(STANDARD_GRAVITY).toBe(9.80665);
    const aside = /data-figure="peakAcceleration"[^>]*>[^<]*<\/span><span class="aside">([^(<]*)\(/.exec(html)?.[1] ?? '';
    const shown = parseShownFigure(aside.trim(), 'g\u2099');
    expect(shown / (results.peakAcceleration / STANDARD_GRAVITY)).toBeCloseTo(1, 3);
  });

  it('the safety block gives the stored energy Σ ½·n·C·V0² and the highest charge voltage', () => {
    const stored = input.scenario.bank.reduce((sum, g) => sum + 0.5 * g.count * g.capacitance * g.voltage * g.voltage, 0);
    expect(figureSi(html, 'storedEnergy')).toBeCloseTo(stored, 6);
    expect(figureSi(html, 'maxChargeVoltage')).toBe(Math.max(...input.scenario.bank.map((g) => g.voltage)));
    expect(html).toContain('id="safety"');
    expect(html).toMatch(/grounding stick/);
    expect(html).toMatch(/institution's high-voltage safety rules/);
  });

  it('one plot div per figure, each with axis titles in units', () => {
    const plots = html.match(/<div class="plot" id="[^"]+" data-plot><\/div>/g) ?? [];
    expect(plots).toHaveLength(6);
    expect(html).toContain('Time (ms)');
    expect(html).toContain('Current (kA)');
    expect(html).toContain('Energy (kJ)');
  });

  it('the input table shows each value as written and in SI, grouped by section', () => {
    expect(html).toMatch(/<tr class="section-head" data-section="bank\[0\]"><th colspan="3">Bank group 1 \(group 1\)<\/th><\/tr>/);
    expect(html).toMatch(/<tr data-path="bank\[0\]\.voltage"><td class="key">voltage<\/td><td class="path">6 kV<\/td><td class="num">6000\u00A0V<\/td><\/tr>/);
    expect(html).toMatch(/<tr data-path="bank\[0\]\.capacitance"><td class="key">capacitance<\/td><td class="path">300 uF<\/td><td class="num">3\u00A0\u00D7\u00A010\u207B\u2074\u00A0F<\/td><\/tr>/);
    expect(html).toMatch(/<tr data-path="bank\[0\]\.esr"><td class="key">esr<\/td><td class="default">default<\/td>/);
    expect(html).not.toContain('data-path="$schema"');
  });

  it('is self-contained: CSP forbids every fetch, and no element loads anything', () => {
    expect(html).toContain(`content="default-src 'none'; script-src 'unsafe-inline'; style-src 'unsafe-inline'; img-src data:"`);
    const own = ownMarkup(html);
    expect(own).not.toMatch(/<(script|img|link|iframe)\b[^>]*\s(src|href)=/i);
    expect(own).not.toMatch(/https?:\/\//);
    expect(html).toContain(`${PLOTLY_PACKAGE}`);
  });

  it('lists the checks when given, escaped', () => {
    const withChecks = buildShotReport({
      ...input,
      checks: [{ id: 'rail.heating', title: 'Rail <heating>', verdict: 'warn', value: 410, limit: 450, unit: 'K', source: 'adiabatic action', note: 'n' }],
    });
    expect(withChecks).toContain('data-check="rail.heating"');
    expect(withChecks).toContain('Rail &lt;heating&gt;');
  });
});

describe('shot report: warnings', () => {
  const withWarnings = (input: ReturnType<typeof syntheticReportInput>) =>
    buildShotReport({ ...input, warnings: shotWarnings(input.scenario, input.shot).map((w) => w.message) });

  it('a stalled armature, a timeout and an open ledger each raise a warning', () => {
    const input = syntheticReportInput({ groups: 1 }); // one crowbarred group: no reversal warning
    input.shot.results.outcome = 'stalled';
    const residual = input.shot.waveforms!.energy.residual;
    residual[residual.length - 1] = 2e-6 * input.shot.results.energy.initial;
    const html = withWarnings(input);
    expect(html).toMatch(/data-warnings="2"/);
    expect(html).toMatch(/stalled in the bore/);
    expect(html).toMatch(/energy ledger residual .* exceeds/);
    input.shot.results.outcome = 'timeout';
    residual[residual.length - 1] = 0.5e-6 * input.shot.results.energy.initial;
    expect(withWarnings(input)).toMatch(/data-warnings="1"[\s\S]*reached the end time/);
  });

  it('a capacitor voltage reversal is stated in per cent of the charge voltage', () => {
    const input = syntheticReportInput({ groups: 2 }); // group 2 has no crowbar
    const reversal = input.shot.results.modules[1]!.reversal;
    expect(reversal).toBeGreaterThan(0);
    expect(withWarnings(input)).toContain(`reverses to ${formatPercent(reversal)} of its`);
  });

  it('the caller\'s warnings are shown, and a repeated one only once', () => {
    const input = syntheticReportInput({ groups: 1 });
    input.warnings = ['Rail heating near the limit.', 'Rail heating near the limit.'];
    expect(buildShotReport(input).match(/Rail heating near the limit\./g)).toHaveLength(2); // page list + embedded JSON
  });
});

describe('shot report: determinism and size', () => {
  it('the same input gives the same bytes; a different date changes only the date', () => {
    const a = buildShotReport(syntheticReportInput());
    const b = buildShotReport(syntheticReportInput());
    expect(a).toBe(b);
    const input = syntheticReportInput();
    input.provenance = fixedProvenance('2027-01-01T00:00:00.000Z');
    const c = buildShotReport(input);
    expect(c).not.toBe(a);
    expect(c.replaceAll('2027-01-01T00:00:00.000Z', '2026-12-02T10:00:00.000Z').replaceAll('Fri 1 Jan 2027, 00:00 UTC', 'Wed 2 Dec 2026, 10:00 UTC')).toBe(a);
  });

  it('a multi-group shot (10k samples, 8 groups: 30+ series) stays under 6 MB', () => {
    const input = syntheticReportInput({ groups: 8, samples: 10_000 });
    const bytes = Buffer.byteLength(buildShotReport(input), 'utf8');
    expect(bytes).toBeLessThan(6 * 1024 * 1024);
  });

  it('without waveforms (a study run) the report still has the energy budget', () => {
    const input = syntheticReportInput();
    input.shot.waveforms = null;
    const html = buildShotReport(input);
    expect(html.match(/data-plot><\/div>/g)).toHaveLength(1);
    expect(html).toContain('Waveforms were not sampled');
  });
});
