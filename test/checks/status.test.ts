/**
 * The status of a shot is the worst of its checks' verdicts and its warnings, and every place that shows it (the
 * terminal summary, --json, the shot record's banner, the archive index) says the same, on every demo scenario.
 */
import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { statusOf, worse } from '../../src/checks/assess.js';
import { checkIdsFor } from '../../src/checks/shotChecks.js';
import { shotSummary } from '../../src/output/summary.js';
import { resultsJson, shoot } from '../../src/pipeline/shoot.js';
import { shotRecordHtml } from '../../src/pipeline/record.js';
import { buildArchiveIndex } from '../../src/report/archive.js';
import { readEmbedded } from '../../src/report/embedded.js';
import { loadScenarioFile } from '../../src/scenario/load.js';

describe('status: the worst of the checks and the warnings', () => {
  it('fail beats warn beats pass; "info" never makes a shot worse; any warning is at least warn', () => {
    expect(worse('pass', 'info')).toBe('pass');
    expect(worse('pass', 'warn')).toBe('warn');
    expect(worse('warn', 'fail')).toBe('fail');
    expect(worse('fail', 'pass')).toBe('fail');
    const checks = [
      { id: 'a', verdict: 'pass' },
      { id: 'b', verdict: 'info' },
    ];
    expect(statusOf(checks, []).verdict).toBe('pass');
    expect(statusOf(checks, ['the armature stalled']).verdict).toBe('warn');
    expect(statusOf([...checks, { id: 'c', verdict: 'fail' }], []).verdict).toBe('fail');
    const status = statusOf([...checks, { id: 'h', verdict: 'warn', hazardClass: 'arc-flash' as const }, { id: 'c', verdict: 'fail' }], ['w']);
    expect(status).toMatchObject({ verdict: 'fail', failing: ['c'], warning: ['h'], hazardClasses: ['arc-flash'], warnings: 1, checks: { pass: 1, info: 1, warn: 1, fail: 1 } });
  });
});

const DEMOS = readdirSync('scenarios').filter((f) => f.endsWith('.json') && f !== 'railpulse.schema.json');

describe.each(DEMOS)('demo %s: the summary, --json, the record and the index agree with the checks', (file) => {
  const assessed = shoot(loadScenarioFile(`scenarios/${file}`));
  const { checks, warnings, status } = assessed.assessment;
  const worst = checks.some((c) => c.verdict === 'fail') ? 'fail' : checks.some((c) => c.verdict === 'warn') || warnings.length > 0 ? 'warn' : 'pass';

  it('the assessment is the worst of its own checks and warnings', () => {
    expect(status.verdict).toBe(worst);
  });

  it('a study of it has a verdict column for exactly the checks a shot has', () => {
    expect(checkIdsFor(assessed.scenario)).toEqual(checks.map((c) => c.id));
  });

  it('the terminal summary states it and lists every check', () => {
    const summary = shotSummary(assessed.scenario, assessed.shot, assessed.assessment);
    expect(summary).toContain(`STATUS: ${worst.toUpperCase()}`);
    expect(summary.split('\n')[0]).toMatch(/^SAFETY: this bank stores .* not a licence to fire/);
    for (const c of checks) expect(summary).toContain(c.title);
    expect(summary).not.toMatch(/\bPASS\b.*hazard class/);
  });

  it('--json carries it', () => {
    expect((resultsJson(assessed).status as { verdict: string }).verdict).toBe(worst);
  });

  it('the record\'s banner and embedded data carry it, and the archive index shows it', () => {
    const html = shotRecordHtml(assessed);
    expect(html).toMatch(new RegExp(`<section id="status" class="status status-${worst}" data-status="${worst}"`));
    const embedded = readEmbedded(html);
    expect(embedded.status?.verdict).toBe(worst);
    const index = buildArchiveIndex([{ fileName: 'r.html', report: embedded }]);
    expect(index).toMatch(new RegExp(`data-column="status" class="num" data-si="${{ pass: 0, warn: 1, fail: 2 }[worst]}"><span class="verdict verdict-${worst}"`));
  });
});
