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
import { runShot } from '../solve/shot.js';
import { parseWholeNumber } from '../study/plan.js';
import { targetVelocity } from '../study/size.js';
import { readTarget } from '../study/sizeInput.js';
import { monteCarlo as runMonteCarlo } from '../study/montecarlo.js';
import { recordUncertainty, shotUncertainty, uncertaintyJson, uncertaintyLines, type ShotUncertainty } from '../study/shotUncertainty.js';

interface RunFlags {
  json?: boolean;
  csv?: string;
  report: string | boolean;
  fromReport?: string;
  uncertainty: boolean;
  monteCarlo?: string;
  seed?: string;
  jobs?: string;
  band?: string;
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
    .option('--no-uncertainty', "skip the propagation of the scenario's tolerances and calibration")
    .option('--monte-carlo <shots>', 'also run this many shots with the uncertain inputs drawn at random (on worker threads): percentiles, outcome shares, probability of the target')
    .option('--seed <n>', 'seed of the Monte Carlo draws (default 1)')
    .option('--jobs <n>', 'worker threads of the Monte Carlo (default: all cores)')
    .option('--band <coverage>', "coverage of the intervals and of the record's bands, e.g. 0.95 (default: ±1σ bands, 95 % intervals)")
    .action(async (file: string | undefined, flags: RunFlags) => {
      if (flags.fromReport !== undefined) {
        fromReport(file, flags.fromReport, flags);
        return;
      }
      if (!file) throw new InputError('run', 'expected a scenario file (or --from-report FILE)');
      checkOutputs(flags);
      const loaded = loadScenarioFile(file);
      const assessed = shoot(loaded, { waveforms: wantsWaveforms(flags) });
      present(loaded, flags, assessed, flags.uncertainty ? await uncertaintyOf(assessed, flags) : null);
    });
}

// Waveforms feed the record, the CSV and the summary's ledger check over every sample; JSON alone needs none.
const wantsWaveforms = (flags: RunFlags): boolean => flags.report !== false || Boolean(flags.csv) || !flags.json;

function bandOption(text: string): number {
  const value = Number(text);
  if (!/^\s*0?\.\d+\s*$/.test(text) || !(value > 0 && value < 1)) throw new InputError('--band', `expected a coverage probability between 0 and 1, e.g. 0.95, got "${text}"`);
  return value;
}

/** The propagation of the scenario's tolerances and calibration (and a Monte Carlo when asked), or null. */
async function uncertaintyOf(assessed: AssessedShot, flags: RunFlags): Promise<ShotUncertainty | null> {
  const band = flags.band === undefined ? undefined : bandOption(flags.band);
  const monteCarlo = flags.monteCarlo === undefined ? undefined : {
    shots: parseWholeNumber('--monte-carlo', flags.monteCarlo, 2),
    seed: flags.seed === undefined ? 1 : parseWholeNumber('--seed', flags.seed, 0),
    ...(flags.jobs === undefined ? {} : { jobs: parseWholeNumber('--jobs', flags.jobs, 1) }),
    runMonteCarlo,
  };
  const target = readTarget(assessed.loaded.raw, assessed.loaded.file);
  const uncertainty = await shotUncertainty(assessed, {
    runShot,
    waveforms: flags.report !== false,
    ...(band !== undefined ? { band } : {}),
    ...(monteCarlo ? { monteCarlo } : {}),
    ...(target ? { targetVelocity: targetVelocity(assessed.scenario, target) } : {}),
  });
  if (!uncertainty && (monteCarlo || band !== undefined)) {
    throw new InputError(monteCarlo ? '--monte-carlo' : '--band', 'the scenario has no tolerances and no calibration: nothing is uncertain');
  }
  return uncertainty;
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
    // a re-run compares the nominal results: no propagation
    const done = present(loaded, options, shoot(loaded, { waveforms: wantsWaveforms(options) }), null, false);
    filed = done.reportPath;
    return done.assessed;
  });
  process.stderr.write(`${rerun.line}\n`);
  process.stderr.write(filed ? `record of the re-run: ${filed}\n` : 'no record filed (give --report DIR to file one)\n');
  if (!rerun.matches) process.exitCode = EXIT.negative;
}

/** Write the CSV and the record, print; `announce` prints where the record went. */
function present(loaded: LoadedScenario, flags: RunFlags, assessed: AssessedShot, uncertainty: ShotUncertainty | null, announce = true): { assessed: AssessedShot; reportPath: string | null } {
  const { shot } = assessed;
  if (flags.csv && shot.waveforms) writeExactFile(flags.csv, waveformCsv(loaded.scenario, shot.waveforms), '--csv');
  const place = typeof flags.report === 'string' ? flags.report : undefined;
  const reportPath = flags.report === false ? null : recordShot(assessed, place, undefined, uncertainty ? recordUncertainty(assessed, uncertainty) : undefined);
  if (flags.json) {
    const json = resultsJson(assessed);
    if (uncertainty) json.uncertainty = uncertaintyJson(uncertainty);
    process.stdout.write(JSON.stringify(json, (_, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2) + '\n');
    if (reportPath && announce) process.stderr.write(`report: ${reportPath}\n`);
  } else {
    process.stdout.write(shotSummary(loaded.scenario, shot, assessed.assessment));
    if (uncertainty) process.stdout.write(`${uncertaintyLines(assessed, uncertainty).join('\n')}\n`);
    if (reportPath && announce) process.stdout.write(`report: ${reportPath}\n`);
  }
  return { assessed, reportPath };
}
