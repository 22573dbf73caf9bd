import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { dimensionOfPath, loadScenarioFile } from '../../src/scenario/load.js';
import { readJsonScriptElement } from '../../src/report/escape.js';
import { makeSweepPlan } from '../../src/study/plan.js';
import { buildStudyReport, plotMode } from '../../src/report/study.js';
import { readStudyPlotData, writeStudyReport } from '../../src/study/studyPage.js';
import { runSweep } from '../../src/study/sweep.js';
import { TWO_GROUP_FILE } from './fixtures.js';

describe('study.html', () => {
  it('is self-contained under a strict CSP, embeds every point, and marks failed ones', async () => {
    const loaded = loadScenarioFile(TWO_GROUP_FILE);
    const plan = makeSweepPlan({
      scenario: loaded.scenario,
      source: { file: TWO_GROUP_FILE, sha256: loaded.sha256 },
      vary: ['armature.mass=10g,20g', 'rails.length=0.5m,1m,40m'],
      dimensionOf: dimensionOfPath,
      out: join(mkdtempSync(join(tmpdir(), 'railpulse-report-')), 'study'),
    });
    // a 40 m barrel: the armature coasts to the end time before the muzzle (outcome timeout) — a failing point
    await runSweep(plan, { jobs: 1 });
    expect(plotMode(plan.manifest)).toBe('heatmap');
    const path = writeStudyReport(plan.outDir, plan.manifest);
    const html = readFileSync(path, 'utf8');
    expect(html).toContain("Content-Security-Policy");
    // nothing loaded from elsewhere: no script src, no stylesheet links (the inlined script bodies are left out here)
    const markup = html.replace(/(<script[^>]*>)[\s\S]*?<\/script>/g, '$1</script>');
    expect(markup).not.toMatch(/<script[^>]+src=|<link[^>]+href=|<img[^>]+src="http/i);
    expect(html).toContain('Plotly');
    const data = readJsonScriptElement(html, 'study-data') as { total: number; outcome: string[] };
    expect(data.total).toBe(6);
    expect(data.outcome.filter((o) => o === 'timeout').length).toBe(2);
    const one = readStudyPlotData(plan.outDir, { ...plan.manifest, vary: plan.manifest.vary.slice(0, 1) });
    expect(buildStudyReport({ ...plan.manifest, vary: plan.manifest.vary.slice(0, 1) }, one)).toContain('data-mode="line"');
  });
});
