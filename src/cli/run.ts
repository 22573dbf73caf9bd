/**
 * `railpulse run <scenario>`: one shot; a terminal summary or JSON; a self-contained HTML record in reports/
 * (or where --report says); optional waveform CSV; or the re-run of an archived record (--from-report).
 */
import type { Command } from 'commander';
import { waveformCsv } from '../output/csv.js';
import { shotSummary } from '../output/summary.js';
import { writeExactFile } from '../output/write.js';
import { recordShot, DEFAULT_REPORT_DIR } from '../pipeline/record.js';
import { rerunRecord } from '../pipeline/rerun.js';
import { resultsJson, shoot, type AssessedShot } from '../pipeline/shoot.js';
import { loadScenarioFile, type LoadedScenario } from '../scenario/load.js';
import { InputError } from '../core/errors.js';

interface RunFlags {
  json?: boolean;
  csv?: string;
  report: string | boolean;
  fromReport?: string;
}

export function registerRun(program: Command): void {
  program
    .command('run')
    .description('simulate one shot of a scenario file; writes its HTML record to reports/')
    .argument('[scenario]', 'scenario file (JSON)')
    .option('--json', 'print the results object (SI) on stdout and nothing else')
    .option('--csv <file>', 'write the waveforms as CSV (never overwrites)')
    .option('--report <path>', `where to write the HTML record: a folder, or a file ending in .html (default: ${DEFAULT_REPORT_DIR}/)`)
    .option('--no-report', 'do not write the HTML record')
    .option('--from-report <file>', 're-run the scenario archived in a report and say whether the results still match')
    .action((file: string | undefined, flags: RunFlags) => {
      if (flags.fromReport) {
        const rerun = rerunRecord(flags.fromReport, (loaded) => simulate(loaded, flags));
        process.stderr.write(`${rerun.line}\n`);
        if (!rerun.matches) process.exitCode = 1;
        return;
      }
      if (!file) throw new InputError('run', 'expected a scenario file (or --from-report FILE)');
      simulate(loadScenarioFile(file), flags);
    });
}

function simulate(loaded: LoadedScenario, flags: RunFlags): AssessedShot {
  // Waveforms feed the record, the CSV and the summary's ledger check over every sample; JSON alone needs none.
  const waveforms = flags.report !== false || Boolean(flags.csv) || !flags.json;
  const assessed = shoot(loaded, { waveforms });
  const { shot } = assessed;
  if (flags.csv && shot.waveforms) writeExactFile(flags.csv, waveformCsv(loaded.scenario, shot.waveforms), '--csv');
  const reportPath = flags.report === false ? null : recordShot(assessed, typeof flags.report === 'string' ? flags.report : undefined);
  if (flags.json) {
    process.stdout.write(JSON.stringify(resultsJson(assessed), null, 2) + '\n');
    if (reportPath) process.stderr.write(`report: ${reportPath}\n`);
  } else {
    process.stdout.write(shotSummary(loaded.scenario, shot, assessed.assessment));
    if (reportPath) process.stdout.write(`report: ${reportPath}\n`);
  }
  return assessed;
}
