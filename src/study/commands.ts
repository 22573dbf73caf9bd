/**
 * CLI wiring of the study commands: sweep, merge, size. Argument parsing and printing only; the work is in
 * plan/sweep/merge/size. Problems a user can fix are thrown as InputError (the CLI prints one line, exit 2).
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { basename, dirname, extname, join } from 'node:path';
import type { Command } from 'commander';
import { InputError } from '../scenario/errors.js';
import { dimensionOfPath, loadScenarioFile, loadScenarioText, validateScenario } from '../scenario/load.js';
import { setRawPath } from '../measure/calibrated.js';
import { DEFAULT_REPORT_DIR, recordShot } from '../cli/run.js';
import type { Scenario } from '../scenario/types.js';
import { runShot } from '../solve/shot.js';
import { compareScenarios, compareTable } from './compare.js';
import { mkdirSync, statSync } from 'node:fs';
import { inFile } from '../cli/errors.js';
import { recordTag, reportDate, sha256 } from '../output/provenance.js';
import { buildComparisonReport, comparisonBaseName, type ComparisonEntry } from '../report/compare.js';
import { writeExactFile, writeNewFile } from '../report/write.js';
import { shotWarnings } from '../solve/warnings.js';
import { TOOL_VERSION } from '../version.js';
import { DESIGN_KINDS, type DesignKind } from './design.js';
import { merge } from './merge.js';
import { writeNewFileAtomic } from './output.js';
import { checkAxes, makeSweepPlan, parseShard, parseWholeNumber } from './plan.js';
import { formatDuration, makeProgress, type ProgressSink } from './progress.js';
import { sizeBank, type SizingResult } from './size.js';
import { readSizingInput } from './sizeInput.js';
import { writeStudyReport } from './studyReport.js';
import { runSweep, type SweepSummary } from './sweep.js';

interface SweepFlags {
  vary: string[];
  design: string;
  samples?: string;
  seed?: string;
  jobs?: string;
  out?: string;
  shard?: string;
  resume?: boolean;
  json?: boolean;
  report: boolean;
}

const collect = (value: string, previous: string[]): string[] => [...previous, value];

function say(line: string): void {
  process.stderr.write(`${line}\n`);
}

export async function sweepCommand(file: string, flags: SweepFlags): Promise<SweepSummary> {
  if (!DESIGN_KINDS.includes(flags.design as DesignKind)) throw new InputError('--design', `expected one of ${DESIGN_KINDS.join(', ')}, got "${flags.design}"`);
  const loaded = loadScenarioFile(file);
  const plan = makeSweepPlan({
    scenario: loaded.scenario,
    source: { file, sha256: loaded.sha256 },
    vary: flags.vary,
    design: flags.design as DesignKind,
    samples: flags.samples === undefined ? undefined : parseWholeNumber('--samples', flags.samples, 1),
    seed: flags.seed === undefined ? undefined : parseWholeNumber('--seed', flags.seed, 0),
    shard: flags.shard === undefined ? null : parseShard(flags.shard),
    out: flags.out,
    resume: flags.resume,
    dimensionOf: dimensionOfPath,
  });
  checkAxes(plan, (scenario) => validateScenario(scenario));
  const jobs = flags.jobs === undefined ? availableParallelism() : parseWholeNumber('--jobs', flags.jobs, 1);

  // First Ctrl-C (or a kill): finish the batches in flight and write them; a second Ctrl-C leaves at once.
  const controller = new AbortController();
  const stop = (): void => {
    if (controller.signal.aborted) process.exit(130);
    say('\nstopping: finishing the points in flight (Ctrl-C again to leave now)');
    controller.abort();
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  let summary: SweepSummary;
  let progress: ProgressSink | undefined;
  try {
    summary = await runSweep(plan, {
      jobs,
      validate: (scenario) => validateScenario(scenario),
      progress: (total) => (progress = makeProgress(process.stderr, total)),
      signal: controller.signal,
    });
  } finally {
    process.off('SIGINT', stop);
    process.off('SIGTERM', stop);
  }
  const done = summary.resumedFrom + summary.ran;
  const rate = summary.seconds > 0 ? summary.ran / summary.seconds : 0;
  let report: string | null = null;
  if (summary.complete && !plan.manifest.shard && flags.report && !existsSync(join(summary.outDir, 'study.html'))) {
    report = writeStudyReport(summary.outDir, plan.manifest);
  }
  // The last line replaces the progress bar on a terminal.
  const finish = (line: string): void => (progress ? progress.finish(line) : say(line));
  if (summary.interrupted) {
    finish(`interrupted: ${done} of ${summary.points} points saved in ${summary.outDir}; continue with --resume --out ${summary.outDir}`);
    process.exitCode = 130;
  } else {
    finish(`${summary.complete ? 'done' : 'stopped'}: ${done} of ${summary.points} points (${summary.ran} run now, ${summary.failed} failed) in ${formatDuration(summary.seconds)}, ${rate.toFixed(0)} shots/s → ${summary.outDir}`);
  }
  if (flags.json) process.stdout.write(`${JSON.stringify({ ...summary, shotsPerSecond: rate, jobs, report }, null, 2)}\n`);
  return summary;
}

function describeSizing(result: SizingResult): string[] {
  const lines = result.candidates.map((candidate) => {
    const volts = Math.max(...candidate.chargeVoltages);
    const state = candidate.violations.length === 0 ? 'feasible' : `exceeds ${candidate.violations.map((v) => v.limit).join(', ')}`;
    const current = candidate.results ? `${(candidate.results.peakCurrent / 1e3).toFixed(1)} kA` : '?';
    return `  ${candidate.modulesPerGroup} module(s)/group: ${(volts / 1e3).toFixed(3)} kV, ${(candidate.storedEnergy / 1e3).toFixed(2)} kJ stored, peak ${current} — ${state}`;
  });
  if (result.best) {
    const best = result.best;
    lines.unshift(`sized: ${best.modulesPerGroup} module(s) per group at ${best.chargeVoltages.map((v) => `${(v / 1e3).toFixed(4)} kV`).join(', ')}, triggers ${best.triggers.map((t) => `${(t * 1e6).toFixed(1)} µs`).join(', ')}; ${(best.storedEnergy / 1e3).toFixed(3)} kJ stored for ${result.targetVelocity.toFixed(2)} m/s (nearest limit: ${result.binding.join(', ') || 'none set'})`);
  } else {
    lines.unshift(`no design reaches ${result.targetVelocity.toFixed(2)} m/s within the limits; binding: ${result.binding.join(', ')}`);
  }
  lines.push(`${result.shots} shots. Simulated sizing only: a charged bank can kill — follow your institution's safety rules, local codes and licensed practice.`);
  return lines;
}

/**
 * The sized scenario as a scenario file: the user's file as written, with each group's count, charge voltage
 * and trigger replaced by the sized values (SI numbers), so geometry, materials and limits carry over.
 */
export function sizedScenarioJson(raw: Record<string, unknown>, from: { file: string; name: string; sha256: string }, result: SizingResult): string {
  const copy = structuredClone(raw);
  const sized = result.scenario!;
  sized.bank.forEach((group, g) => {
    setRawPath(copy, `bank[${g}].count`, group.count);
    setRawPath(copy, `bank[${g}].voltage`, group.voltage);
    setRawPath(copy, `bank[${g}].trigger`, group.trigger);
  });
  copy.name = `${from.name} (sized)`;
  copy.description = `Sized by railpulse size from ${from.file} (sha256 ${from.sha256.slice(0, 16)}…) for ${result.targetVelocity.toPrecision(6)} m/s at exit: ${result.best?.modulesPerGroup} module(s) per group, least stored energy within the limits; counts, voltages (V) and triggers (s) in SI.`;
  return `${JSON.stringify(copy, null, 2)}\n`;
}

export async function sizeCommand(file: string, flags: { out?: string; json?: boolean; report?: string | boolean }): Promise<SizingResult> {
  const input = readSizingInput(file);
  say('sizing…');
  const result = sizeBank(input.scenario, input.target, input.limits, runShot);
  for (const line of describeSizing(result)) say(line);
  let written: string | null = null;
  if (result.scenario) {
    written = flags.out ?? join(dirname(file), `${basename(file, extname(file))}.sized-${input.sha256.slice(0, 8)}.json`);
    const json = sizedScenarioJson(input.raw, { file, name: input.scenario.name, sha256: input.sha256 }, result);
    const sized = loadScenarioText(json, written); // the file must load like any scenario before it is written
    writeNewFileAtomic(written, json);
    say(`wrote ${written}`);
    if (flags.report !== false) say(`report: ${recordShot(sized, runShot(sized.scenario), typeof flags.report === 'string' ? flags.report : undefined)}`);
  }
  if (flags.json) process.stdout.write(`${JSON.stringify({ ...result, written }, null, 2)}\n`);
  if (!result.feasible) process.exitCode = 1;
  return result;
}

export function registerStudyCommands(program: Command): void {
  program
    .command('sweep <scenario>')
    .description('run a study: vary scenario values over a grid or a sampled design, on all cores')
    .option('--vary <PATH=SPEC>', 'value to vary: list 20g,40g | range 4kV:10kV:13 | log range log:1mohm:100mohm:9 (repeatable)', collect, [])
    .option('--design <kind>', `grid (every combination), lhs (Latin hypercube) or random`, 'grid')
    .option('--samples <n>', 'points of an lhs or random design')
    .option('--seed <n>', 'seed of an lhs or random design (default 1)')
    .option('--jobs <n>', 'worker threads (default: all cores)')
    .option('--out <dir>', 'study directory (default studies/<date>_<name>_<hash>)')
    .option('--shard <i/n>', 'run only the points with index % n == i − 1 (for cluster job arrays; join with merge)')
    .option('--resume', 'continue an interrupted study in --out (or the default directory)')
    .option('--no-report', 'do not write study.html')
    .option('--json', 'print a summary as JSON on stdout')
    .action(async (scenario: string, flags: SweepFlags) => {
      await sweepCommand(scenario, flags);
    });
  program
    .command('merge <dirs...>')
    .description('join the shard directories of one study into one study directory')
    .requiredOption('--out <dir>', 'the merged study directory (must not exist or be empty)')
    .option('--no-report', 'do not write study.html')
    .action((dirs: string[], flags: { out: string; report: boolean }) => {
      const summary = merge(dirs, flags.out);
      if (flags.report) writeStudyReport(flags.out, summary.manifest);
      say(`merged ${summary.shards} shards, ${summary.points} points → ${flags.out}`);
    });
  program
    .command('compare <scenarios...>')
    .description('run several scenarios, compare their figures with the first, and write one HTML comparison report')
    .option('--json', 'print the comparison as JSON on stdout')
    .option('--report <path>', `where to write the HTML comparison: a folder, or a new file ending in .html (default: ${DEFAULT_REPORT_DIR}/)`)
    .option('--no-report', 'do not write the HTML comparison')
    .action((files: string[], flags: { json?: boolean; report: string | boolean }) => {
      const loaded = files.map((file) => loadScenarioFile(file));
      // One shot per scenario, with waveforms only when a report is wanted; the table reads the same shots.
      const shotsByScenario = new Map(loaded.map((l) => [l.scenario, inFile(l.file, () => runShot(l.scenario, { waveforms: flags.report !== false }))]));
      const shots = compareScenarios(loaded, (scenario) => shotsByScenario.get(scenario) ?? runShot(scenario, { waveforms: false }));
      let reportPath: string | null = null;
      if (flags.report !== false) {
        const entries: ComparisonEntry[] = loaded.map((l) => {
          const shot = shotsByScenario.get(l.scenario)!;
          return { file: l.file, scenarioRaw: l.raw, scenario: l.scenario, shot, sha256: l.sha256, warnings: shotWarnings(l.scenario, shot).map((w) => w.message) };
        });
        const date = reportDate();
        const html = buildComparisonReport(entries, { toolVersion: TOOL_VERSION, nodeVersion: process.version, date });
        const target = typeof flags.report === 'string' ? flags.report : DEFAULT_REPORT_DIR;
        if (target.toLowerCase().endsWith('.html')) {
          writeExactFile(target, html, '--report');
          reportPath = target;
        } else {
          if (existsSync(target) && !statSync(target).isDirectory()) throw new InputError('--report', `${target} is a file; give a folder or a new file name ending in .html`);
          mkdirSync(target, { recursive: true });
          const tag = recordTag(sha256(loaded.map((l) => l.sha256).join('\n')));
          reportPath = writeNewFile(target, comparisonBaseName(date, loaded.map((l) => l.scenario.name), tag), '.html', html);
        }
      }
      process.stdout.write(flags.json ? `${JSON.stringify(shots, null, 2)}\n` : `${compareTable(shots)}\n`);
      if (reportPath) (flags.json ? say : (line: string) => process.stdout.write(`${line}\n`))(`report: ${reportPath}`);
    });
  program
    .command('size <scenario>')
    .description("size the bank for the scenario's target (least stored energy within its limits)")
    .option('--out <file>', 'the sized scenario (default: <scenario>.sized-<hash>.json beside it)')
    .option('--json', 'print the sizing result as JSON on stdout')
    .option('--report <path>', 'where to write the shot record of the sized design (default reports/)')
    .option('--no-report', 'do not write the shot record')
    .action(async (scenario: string, flags: { out?: string; json?: boolean; report?: string | boolean }) => {
      await sizeCommand(scenario, flags);
    });
}
