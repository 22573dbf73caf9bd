/**
 * Shot benchmark (issue 2): for each demo scenario, the in-process time of one shot with waveforms off (as
 * sweeps run it) and on, the solver's work per shot, and the whole-process wall time of the bundled CLI.
 * Run with `npm run bench` (it builds dist/ first). Figures, not tests: nothing here asserts on time.
 *
 * Times are medians of many shots after a warm-up. CPU time per shot (process.cpuUsage over the same batch)
 * is printed beside the wall time because a busy machine inflates wall time; the load average is printed too.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadScenarioFile } from '../src/scenario/load.js';
import { runShot } from '../src/solve/shot.js';
import type { Scenario } from '../src/scenario/types.js';
import type { Shot } from '../src/solve/types.js';

const SCENARIO_DIR = 'scenarios';
const CLI_RUNS = 5;

interface Timing {
  /** median wall time per shot, ms */
  wall: number;
  /** CPU time per shot over the timed shots, ms */
  cpu: number;
  shot: Shot;
}

const median = (values: number[]): number => {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
};

/** Time shots until both a minimum count and a minimum duration are reached, after a warm-up. */
function timeShots(scenario: Scenario, waveforms: boolean, warmup: number, count: number, seconds: number): Timing {
  let shot = runShot(scenario, { waveforms });
  for (let k = 1; k < warmup; k++) shot = runShot(scenario, { waveforms });
  const times: number[] = [];
  const cpuStart = process.cpuUsage();
  const start = performance.now();
  while (times.length < count || performance.now() - start < seconds * 1000) {
    const t0 = performance.now();
    shot = runShot(scenario, { waveforms });
    times.push(performance.now() - t0);
  }
  const cpu = process.cpuUsage(cpuStart);
  return { wall: median(times), cpu: (cpu.user + cpu.system) / 1000 / times.length, shot };
}

/** Median wall time of a whole CLI process, in seconds. */
function timeCli(args: string[]): number | string {
  const times: number[] = [];
  for (let k = 0; k < CLI_RUNS; k++) {
    const t0 = performance.now();
    const run = spawnSync(process.execPath, ['bin/railpulse.js', ...args], { encoding: 'utf8' });
    const elapsed = (performance.now() - t0) / 1000;
    if (run.status !== 0) return `exit ${run.status}: ${(run.stderr || '').trim().split('\n')[0]}`;
    times.push(elapsed);
  }
  return median(times);
}

const pad = (text: string, width: number) => text.padStart(width);
const ms = (value: number) => value.toFixed(3);

const demos = readdirSync(SCENARIO_DIR)
  .filter((f) => f.endsWith('.json') && !f.includes('schema'))
  .sort();

console.log(`railpulse shot benchmark — node ${process.version}, ${cpus().length} CPU(s) ${cpus()[0]?.model ?? ''}`);
console.log(`load average at start: ${loadavg().map((l) => l.toFixed(2)).join(' ')} (a busy machine inflates every figure)`);
console.log('');

const header = [
  pad('scenario', 24),
  pad('off ms', 9),
  pad('off cpu', 9),
  pad('shots/s', 9),
  pad('on ms', 9),
  pad('on cpu', 9),
  pad('rhs evals', 10),
  pad('steps', 6),
  pad('restarts', 9),
  pad('samples', 8),
].join(' ');
console.log('in-process, one core: median per shot; "off" = waveforms off (as sweeps run), "on" = with waveforms');
console.log(header);
console.log('-'.repeat(header.length));
for (const file of demos) {
  const { scenario } = loadScenarioFile(join(SCENARIO_DIR, file));
  const off = timeShots(scenario, false, 50, 300, 2);
  const on = timeShots(scenario, true, 5, 30, 2);
  const stats = off.shot.stats;
  console.log(
    [
      pad(file.replace(/\.json$/, ''), 24),
      pad(ms(off.wall), 9),
      pad(ms(off.cpu), 9),
      pad((1000 / off.wall).toFixed(0), 9),
      pad(ms(on.wall), 9),
      pad(ms(on.cpu), 9),
      pad(String(stats.rhsEvaluations), 10),
      pad(String(stats.steps), 6),
      pad(String(stats.restarts), 9),
      pad(String(on.shot.waveforms?.t.length ?? 0), 8),
    ].join(' '),
  );
}

console.log('');
console.log(`whole process, median of ${CLI_RUNS}: node bin/railpulse.js run <demo> --json (bundled CLI, dist/railpulse.mjs)`);
const cliHeader = [pad('scenario', 24), pad('--no-report s', 14), pad('with report s', 14)].join(' ');
console.log(cliHeader);
console.log('-'.repeat(cliHeader.length));
// `run` writes its HTML record by default; the second column measures that path into a temporary folder so the
// benchmark leaves nothing in reports/.
const reportDir = mkdtempSync(join(tmpdir(), 'railpulse-bench-'));
try {
  for (const file of demos) {
    const path = join(SCENARIO_DIR, file);
    const bare = timeCli(['run', path, '--json', '--no-report']);
    const withReport = timeCli(['run', path, '--json', '--report', reportDir]);
    const show = (v: number | string) => (typeof v === 'number' ? v.toFixed(3) : v);
    console.log([pad(file.replace(/\.json$/, ''), 24), pad(show(bare), 14), pad(show(withReport), 14)].join(' '));
  }
} finally {
  rmSync(reportDir, { recursive: true, force: true });
}
