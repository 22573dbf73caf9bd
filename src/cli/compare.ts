/**
 * `railpulse compare A.json B.json …`: the shots of several scenarios side by side, in the terminal and in one
 * HTML comparison. Wiring only: the table is src/study/compare.ts, the page src/report/compare.ts.
 */
import type { Command } from 'commander';
import { recordTag, reportDate, sha256 } from '../output/provenance.js';
import { DEFAULT_REPORT_DIR, checkFilingPlace, fileRecord } from '../pipeline/record.js';
import { shoot } from '../pipeline/shoot.js';
import { buildComparisonReport, comparisonBaseName, type ComparisonEntry } from '../report/compare.js';
import { loadScenarioFile } from '../scenario/load.js';
import { compareScenarios, compareTable } from '../study/compare.js';
import { TOOL_VERSION } from '../version.js';
import { say } from './common.js';

export function registerCompareCommand(program: Command): void {
  program
    .command('compare <scenarios...>')
    .description('run several scenarios, compare their figures with the first, and write one HTML comparison report')
    .option('--json', 'print the comparison as JSON on stdout')
    .option('--report <path>', `where to write the HTML comparison: a folder, or a new file ending in .html (default: ${DEFAULT_REPORT_DIR}/)`)
    .option('--no-report', 'do not write the HTML comparison')
    .action((files: string[], flags: { json?: boolean; report: string | boolean }) => {
      if (flags.report !== false) checkFilingPlace(typeof flags.report === 'string' ? flags.report : undefined);
      const loaded = files.map((file) => loadScenarioFile(file));
      // One shot per scenario, with waveforms only when a report is wanted; the table reads the same shots.
      const assessed = loaded.map((l) => shoot(l, { waveforms: flags.report !== false }));
      const byScenario = new Map(assessed.map((a) => [a.scenario, a.shot]));
      const shots = compareScenarios(loaded, (scenario) => byScenario.get(scenario)!);
      let reportPath: string | null = null;
      if (flags.report !== false) {
        const entries: ComparisonEntry[] = assessed.map(({ loaded: l, shot, assessment }) => ({
          file: l.file,
          scenarioRaw: l.raw,
          scenario: l.scenario,
          shot,
          sha256: l.sha256,
          warnings: assessment.warnings.map((w) => w.message),
          checks: assessment.checks,
        }));
        const date = reportDate();
        const html = buildComparisonReport(entries, { toolVersion: TOOL_VERSION, nodeVersion: process.version, date });
        const tag = recordTag(sha256(loaded.map((l) => l.sha256).join('\n')));
        const baseName = comparisonBaseName(date, loaded.map((l) => l.scenario.name), tag);
        reportPath = fileRecord(html, { target: typeof flags.report === 'string' ? flags.report : undefined, baseName });
      }
      process.stdout.write(flags.json ? `${JSON.stringify(shots, null, 2)}\n` : `${compareTable(shots)}\n`);
      if (reportPath) (flags.json ? say : (line: string) => process.stdout.write(`${line}\n`))(`report: ${reportPath}`);
    });
}
