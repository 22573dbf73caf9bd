import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildArchiveIndex, scanReports } from '../../src/report/archive.js';
import { buildShotReport } from '../../src/report/html.js';
import { writeNewFile } from '../../src/output/write.js';
import { fixedProvenance, syntheticReportInput } from './report-input.js';

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'railpulse-archive-'));
  const a = syntheticReportInput({ name: 'Alpha <b>shot</b>', groups: 1, samples: 2000 });
  const b = syntheticReportInput({ name: 'Bravo', groups: 2, samples: 2000 });
  b.provenance = fixedProvenance('2026-12-03T08:00:00.000Z');
  writeNewFile(dir, '2026-12-02_alpha', 'html', buildShotReport(a));
  writeNewFile(dir, '2026-12-03_bravo', 'html', buildShotReport(b));
  writeFileSync(join(dir, 'notes.html'), '<html><body>lab notes</body></html>');
  writeFileSync(join(dir, 'index.html'), 'an older index');
  writeFileSync(join(dir, 'data.csv'), 't,I\n');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('archive index', () => {
  it('scans the reports of a folder from their embedded data, skipping other HTML with a warning', () => {
    const scan = scanReports(dir);
    expect(scan.entries.map((e) => e.fileName)).toEqual(['2026-12-02_alpha.html', '2026-12-03_bravo.html']);
    expect(scan.warnings).toHaveLength(1);
    expect(scan.warnings[0]).toMatch(/^notes\.html: skipped/);
    expect(scan.entries[1]!.report.provenance.date).toBe('2026-12-03T08:00:00.000Z');
  });

  it('one row a report, newest first, with exact SI values for numeric sorting and escaped names', () => {
    const { entries } = scanReports(dir);
    const html = buildArchiveIndex(entries);
    const rows = html.match(/<tr data-index="\d+">/g) ?? [];
    expect(rows).toHaveLength(2);
    expect(html.indexOf('Bravo')).toBeLessThan(html.indexOf('Alpha'));
    expect(html).toContain('Alpha &lt;b&gt;shot&lt;/b&gt;');
    expect(html).not.toContain('<b>shot</b>');
    const bravo = entries[1]!.report.results;
    expect(html).toContain(`data-column="muzzleVelocity" class="num" data-si="${bravo.muzzleVelocity}"`);
    expect(html).toContain(`data-column="initialEnergy" class="num" data-si="${bravo.energy.initial}"`);
    expect(html).toContain('<a href="2026-12-03_bravo.html">');
  });

  it('is self-contained with the same CSP as the reports and no plotly', () => {
    const html = buildArchiveIndex(scanReports(dir).entries);
    expect(html).toContain(`default-src 'none'`);
    expect(html).not.toMatch(/https?:\/\//);
    expect(html).not.toContain('Plotly');
  });

  it('an empty archive is still a valid page', () => {
    expect(buildArchiveIndex([])).toContain('<span id="shown">0</span> of 0 records');
  });
});
