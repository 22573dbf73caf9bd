/**
 * `railpulse sweep` and `railpulse merge`: design studies on every core, and the joining of cluster shards.
 * Wiring only: plans, runners and outputs are in src/study.
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import type { Command } from 'commander';
import { dimensionOfPath, loadScenarioFile, validateScenario } from '../scenario/load.js';
import { DESIGN_KINDS, type DesignKind } from '../study/design.js';
import { merge } from '../study/merge.js';
import { checkAxes, makeSweepPlan, parseShard, parseWholeNumber } from '../study/plan.js';
import { formatDuration, makeProgress, type ProgressSink } from '../study/progress.js';
import { writeStudyReport } from '../study/studyPage.js';
import { runSweep, type SweepSummary } from '../study/sweep.js';
import { InputError } from '../core/errors.js';
import { collect, say } from './common.js';

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
  uncertainty?: boolean;
}

export async function sweepCommand(file: string, flags: SweepFlags): Promise<SweepSummary> {
  if (!DESIGN_KINDS.includes(flags.design as DesignKind)) throw new InputError('--design', `expected one of ${DESIGN_KINDS.join(', ')}, got "${flags.design}"`);
  const loaded = loadScenarioFile(file);
  if (flags.uncertainty && !loaded.scenario.tolerances && !loaded.scenario.calibration) {
    throw new InputError('--uncertainty', 'the scenario has no tolerances and no calibration: nothing is uncertain');
  }
  const plan = makeSweepPlan({
    uncertainty: flags.uncertainty ?? false,
    scenario: loaded.scenario,
    raw: loaded.raw,
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

  // First Ctrl-C, or SIGTERM (kill, scancel, a scheduler's time limit): finish the batches in flight and write them,
  // then exit 128 + the signal's number. A second signal leaves at once (what is written is kept).
  const controller = new AbortController();
  let stoppedBy: NodeJS.Signals | null = null;
  const stop = (signal: NodeJS.Signals): void => {
    if (controller.signal.aborted) process.exit(signalExitCode(signal));
    stoppedBy = signal;
    say(`\nstopping (${signal}): finishing the points in flight (Ctrl-C again to leave now)`);
    controller.abort();
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  let summary: SweepSummary;
  let progress: ProgressSink | undefined;
  try {
    summary = await runSweep(plan, {
      jobs,
      // each point is checked in the worker that runs it: the main thread only hands out batches and writes rows
      validatePoints: true,
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
  if (summary.autoResumed) say(`continued the study already in ${summary.outDir}: ${summary.resumedFrom} of its ${summary.points} points were there`);
  if (summary.interrupted) {
    finish(`interrupted: ${done} of ${summary.points} points saved in ${summary.outDir}; run the same command again (or --resume --out ${summary.outDir}) to continue`);
    process.exitCode = signalExitCode(stoppedBy ?? 'SIGINT');
  } else {
    finish(`${summary.complete ? 'done' : 'stopped'}: ${done} of ${summary.points} points (${summary.ran} run now, ${summary.failed} failed) in ${formatDuration(summary.seconds)}, ${rate.toFixed(0)} shots/s → ${summary.outDir}`);
  }
  if (flags.json) process.stdout.write(`${JSON.stringify({ ...summary, shotsPerSecond: rate, jobs, report }, null, 2)}\n`);
  return summary;
}

export function registerSweepCommands(program: Command): void {
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
    .option('--resume', 'continue an interrupted study in --out (or the default directory); a folder that holds the same study is continued anyway')
    .option('--no-report', 'do not write study.html')
    .option('--json', 'print a summary as JSON on stdout')
    .option('--uncertainty', "add each point's standard uncertainties (the scenario's tolerances and calibration, linear propagation: 1 + 2k shots a point)")
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
}

/** The shell's convention: 128 + the signal number (130 for SIGINT, 143 for SIGTERM). */
function signalExitCode(signal: NodeJS.Signals): number {
  return signal === 'SIGTERM' ? 143 : 130;
}
