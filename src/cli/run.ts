/**
 * `railpulse run <scenario>`: one shot; a terminal summary or JSON; a self-contained HTML record in reports/
 * (or where --report says); optional waveform CSV; or the re-run of an archived record (--from-report).
 */
import { existsSync, mkdirSync, readFileSync, statSync } from 'node:fs';
import type { Command } from 'commander';
import { loadScenarioFile, loadScenarioText, type LoadedScenario } from '../scenario/load.js';
import { InputError } from '../scenario/errors.js';
import { runShot } from '../solve/shot.js';
import { shotWarnings } from '../solve/warnings.js';
import type { Shot } from '../solve/types.js';
import { shotSummary } from '../output/summary.js';
import { waveformCsv } from '../output/csv.js';
import { provenanceOf, recordTag, reportDate } from '../output/provenance.js';
import { compareResults } from '../output/rerun.js';
import { buildShotReport } from '../report/html.js';
import { readEmbedded, NotAReportError } from '../report/embedded.js';
import { reportBaseName, writeExactFile, writeNewFile } from '../report/write.js';
import { inFile } from './errors.js';
import { railsDerivedJson, shotChecks } from '../checks/shotChecks.js';

interface RunFlags {
  json?: boolean;
  csv?: string;
  report: string | boolean;
  fromReport?: string;
}

export const DEFAULT_REPORT_DIR = 'reports';

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
      if (flags.fromReport) return rerun(flags.fromReport, flags);
      if (!file) throw new InputError('run', 'expected a scenario file (or --from-report FILE)');
      const loaded = loadScenarioFile(file);
      simulate(loaded, flags);
    });
}

function simulate(loaded: LoadedScenario, flags: RunFlags): Shot {
  // Waveforms feed the record, the CSV and the summary's ledger check over every sample; JSON alone needs none.
  const waveforms = flags.report !== false || Boolean(flags.csv) || !flags.json;
  const shot = inFile(loaded.file, () => runShot(loaded.scenario, { waveforms }));
  const warnings = shotWarnings(loaded.scenario, shot);
  const checks = shotChecks(loaded.scenario, shot.results);
  if (flags.csv && shot.waveforms) writeExactFile(flags.csv, waveformCsv(loaded.scenario, shot.waveforms), '--csv');
  const reportPath =
    flags.report === false ? null : recordShot(loaded, shot, typeof flags.report === 'string' ? flags.report : DEFAULT_REPORT_DIR);
  if (flags.json) {
    const railsDerived = railsDerivedJson(loaded.scenario);
    const output = { ...shot.results, checks, ...(railsDerived ? { railsDerived } : {}) };
    process.stdout.write(JSON.stringify(output, null, 2) + '\n');
    if (reportPath) process.stderr.write(`report: ${reportPath}\n`);
  } else {
    process.stdout.write(shotSummary(loaded.scenario, shot, warnings, checks));
    if (reportPath) process.stdout.write(`report: ${reportPath}\n`);
  }
  return shot;
}

/** Write the HTML record of a shot to `target` (a folder, or a new file ending in .html); returns its path. */
export function recordShot(loaded: LoadedScenario, shot: Shot, target: string = DEFAULT_REPORT_DIR): string {
  const html = buildShotReport({
    scenarioRaw: loaded.raw,
    scenario: loaded.scenario,
    shot,
    provenance: provenanceOf(shot, loaded.sha256),
    warnings: shotWarnings(loaded.scenario, shot).map((w) => w.message),
    checks: shotChecks(loaded.scenario, shot.results),
  });
  return writeReport(html, target, loaded);
}

function writeReport(html: string, target: string, loaded: LoadedScenario): string {
  if (target.toLowerCase().endsWith('.html')) {
    writeExactFile(target, html, '--report');
    return target;
  }
  if (existsSync(target) && !statSync(target).isDirectory()) {
    throw new InputError('--report', `${target} is a file; give a folder or a new file name ending in .html`);
  }
  mkdirSync(target, { recursive: true });
  const date = reportDate();
  return writeNewFile(target, reportBaseName(date, loaded.scenario.name, recordTag(loaded.sha256)), '.html', html);
}

function rerun(reportFile: string, flags: RunFlags): void {
  let html: string;
  try {
    html = readFileSync(reportFile, 'utf8');
  } catch {
    throw new InputError('--from-report', `cannot read ${reportFile}`);
  }
  let archived;
  try {
    archived = readEmbedded(html);
  } catch (error) {
    if (error instanceof NotAReportError) throw new InputError('--from-report', `${reportFile} is not a railpulse shot report (${error.message})`);
    throw error;
  }
  const source = JSON.stringify(archived.scenarioRaw, null, 2);
  const loaded = loadScenarioText(source, `${reportFile} (archived scenario)`);
  const shot = simulate(loaded, flags);
  const verdict = compareResults(archived.results, shot.results);
  const line = verdict.identical
    ? `re-run of ${reportFile}: results identical to the archived record (${verdict.compared} figures; archived by railpulse ${archived.provenance.toolVersion})`
    : verdict.matches
      ? `re-run of ${reportFile}: results match the archived record to ${verdict.largestRelativeDifference.toExponential(1)} (relative)`
      : `re-run of ${reportFile}: results DIFFER from the archived record (railpulse ${archived.provenance.toolVersion}): ` +
        verdict.differences.slice(0, 6).map((d) => `${d.path} ${String(d.archived)} → ${String(d.now)}`).join('; ');
  process.stderr.write(line + '\n');
  if (!verdict.matches) process.exitCode = 1;
}
