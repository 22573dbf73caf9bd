/**
 * `railpulse run <scenario>`: one shot; a terminal summary or JSON; a self-contained HTML record in reports/
 * (or where --report says); optional waveform CSV; or the re-run of an archived record (--from-report).
 */
import type { Command } from 'commander';
import { waveformCsv } from '../output/csv.js';
import { shotSummary } from '../output/summary.js';
import { checkNewFile, writeExactFile } from '../output/write.js';
import { checkFilingPlace, recordShot, DEFAULT_REPORT_DIR } from '../pipeline/record.js';
import { rerunRecord } from '../pipeline/rerun.js';
import { resultsJson, shoot, type AssessedShot } from '../pipeline/shoot.js';
import { loadScenarioFile, type LoadedScenario } from '../scenario/load.js';
import { EXIT, InputError } from '../core/errors.js';

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
    .option('--from-report <file>', 're-run the scenario archived in a report and say whether the results still match (files a record only with --report)')
    .action((file: string | undefined, flags: RunFlags) => {
      if (flags.fromReport !== undefined) {
        fromReport(file, flags.fromReport, flags);
        return;
      }
      if (!file) throw new InputError('run', 'expected a scenario file (or --from-report FILE)');
      checkOutputs(flags);
      simulate(loadScenarioFile(file), flags);
    });
}

/** Every output name is checked before the shot, so a long shot never ends in "exists already". */
function checkOutputs(flags: RunFlags): void {
  if (flags.csv) checkNewFile(flags.csv, '--csv');
  if (flags.report !== false) checkFilingPlace(typeof flags.report === 'string' ? flags.report : undefined);
}

/**
 * `--from-report R`: re-run the scenario archived in R and compare. A re-run is a check, so it files a record
 * only when --report names where (and says which it did); a scenario file beside it would be ignored, so it is
 * refused.
 */
function fromReport(file: string | undefined, record: string, flags: RunFlags): void {
  if (file !== undefined) {
    throw new InputError('--from-report', `re-runs the scenario archived in ${record}; a scenario file (${file}) cannot be given beside it`);
  }
  const fileRecord = typeof flags.report === 'string';
  const options: RunFlags = { ...flags, report: fileRecord ? flags.report : false };
  checkOutputs(options);
  let filed: string | null = null;
  const rerun = rerunRecord(record, (loaded) => {
    const done = simulate(loaded, options, false);
    filed = done.reportPath;
    return done.assessed;
  });
  process.stderr.write(`${rerun.line}\n`);
  process.stderr.write(filed ? `record of the re-run: ${filed}\n` : 'no record filed (give --report DIR to file one)\n');
  if (!rerun.matches) process.exitCode = EXIT.negative;
}

/** Shoot, write the CSV and the record, print; `announce` prints where the record went. */
function simulate(loaded: LoadedScenario, flags: RunFlags, announce = true): { assessed: AssessedShot; reportPath: string | null } {
  // Waveforms feed the record, the CSV and the summary's ledger check over every sample; JSON alone needs none.
  const waveforms = flags.report !== false || Boolean(flags.csv) || !flags.json;
  const assessed = shoot(loaded, { waveforms });
  const { shot } = assessed;
  if (flags.csv && shot.waveforms) writeExactFile(flags.csv, waveformCsv(loaded.scenario, shot.waveforms), '--csv');
  const reportPath = flags.report === false ? null : recordShot(assessed, typeof flags.report === 'string' ? flags.report : undefined);
  if (flags.json) {
    process.stdout.write(JSON.stringify(resultsJson(assessed), null, 2) + '\n');
    if (reportPath && announce) process.stderr.write(`report: ${reportPath}\n`);
  } else {
    process.stdout.write(shotSummary(loaded.scenario, shot, assessed.assessment));
    if (reportPath && announce) process.stdout.write(`report: ${reportPath}\n`);
  }
  return { assessed, reportPath };
}
