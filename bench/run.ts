/**
 * Shot benchmark (issue 2): for each demo scenario, the in-process time of one shot with waveforms off (as
 * sweeps run it) and on, the solver's work per shot, and the whole-process wall time of the bundled CLI.
 * Run with `npm run bench` (it builds dist/ first). Figures, not tests: nothing here asserts on time.
 *
 * Times are medians of many shots after a warm-up. CPU time per shot (process.cpuUsage over the same batch)
 * is printed beside the wall time because a busy machine inflates wall time; the load average is printed too.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ShotTimerReport } from './shot-timer.js';
import { PROFILE_PHASES } from '../src/solve/profile.js';
import { buildShotTimer } from './build-timer.js';

// The in-process timings run bench/shot-timer.ts, bundled as the CLI and the sweep workers are, one process per demo.
const TIMER = await buildShotTimer();
const PHASES = PROFILE_PHASES;

function timeDemo(file: string): ShotTimerReport {
  const run = spawnSync(process.execPath, [TIMER, file], { encoding: 'utf8' });
  if (run.status !== 0) throw new Error(`shot timer failed on ${file}: ${run.stderr}`);
  return JSON.parse(run.stdout) as ShotTimerReport;
}

const SCENARIO_DIR = 'scenarios';
const CLI_RUNS = Number(process.env.RAILPULSE_BENCH_CLI_RUNS ?? 11);
/** Targets (issue 16), printed beside the figures. */
const TARGET_SHOT_MS = 0.25;
const TARGET_SHOT_SCENARIO = 'staggered-bank';
const TARGET_PROCESS_S = 0.25;

const median = (values: number[]): number => {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
};

/** CPU seconds (user + system, all threads) of each timed process, by /usr/bin/time when present. */
const cliCpu: number[] = [];

/**
 * Median wall time of a whole CLI process, in seconds; the median CPU time of the same runs goes to cliCpu (a
 * loaded machine stretches the wall time of a process far more than its CPU time).
 */
function timeCli(args: string[]): number | string {
  const times: number[] = [];
  const cpu: number[] = [];
  const timeFile = join(tmpdir(), `railpulse-bench-time-${process.pid}`);
  const useTime = existsSync('/usr/bin/time');
  for (let k = 0; k < CLI_RUNS; k++) {
    const t0 = performance.now();
    const command = useTime ? ['/usr/bin/time', ['-f', '%U %S', '-o', timeFile, process.execPath, 'bin/railpulse.js', ...args]] as const : [process.execPath, ['bin/railpulse.js', ...args]] as const;
    const run = spawnSync(command[0], command[1], { encoding: 'utf8' });
    const elapsed = (performance.now() - t0) / 1000;
    if (run.status !== 0) return `exit ${run.status}: ${(run.stderr || '').trim().split('\n')[0]}`;
    times.push(elapsed);
    if (useTime) {
      const [user, system] = readFileSync(timeFile, 'utf8').trim().split('\n').pop()!.split(' ').map(Number);
      cpu.push(user! + system!);
    }
  }
  if (useTime) rmSync(timeFile, { force: true });
  cliCpu.push(cpu.length ? median(cpu) : NaN);
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

let targetShot: ShotTimerReport['off'] | null = null;
const reports = new Map<string, ShotTimerReport>();
for (const file of demos) reports.set(file, timeDemo(join(SCENARIO_DIR, file)));
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
console.log('in-process, one core, the bundled code (as the CLI and the sweep workers run it), a fresh process per demo: median per shot; "off" = waveforms off (as sweeps run), "on" = with waveforms');
console.log(header);
console.log('-'.repeat(header.length));
for (const file of demos) {
  const { off, on } = reports.get(file)!;
  if (file === `${TARGET_SHOT_SCENARIO}.json`) targetShot = off;
  console.log(
    [
      pad(file.replace(/\.json$/, ''), 24),
      pad(ms(off.wall), 9),
      pad(ms(off.cpu), 9),
      pad((1000 / off.wall).toFixed(0), 9),
      pad(ms(on.wall), 9),
      pad(ms(on.cpu), 9),
      pad(String(off.stats.rhsEvaluations), 10),
      pad(String(off.stats.steps), 6),
      pad(String(off.stats.restarts), 9),
      pad(String(on.samples), 8),
    ].join(' '),
  );
}

if (targetShot) {
  const t = targetShot as ShotTimerReport['off'];
  console.log(`target: ${TARGET_SHOT_SCENARIO}, waveforms off, ≤ ${TARGET_SHOT_MS} ms per shot in-process on one core; measured ${ms(t.wall)} ms (cpu ${ms(t.cpu)} ms): ${t.wall <= TARGET_SHOT_MS ? 'met' : 'missed'}`);
}

// Where the time of a shot goes: the same shots with the opt-in profile (runShot's `profile` option). The clock
// reads inflate the total somewhat, so the phases are shown as shares of the profiled time. "integration" is odex's
// own work (steps, extrapolation tables, dense-output coefficients); "rhs" the model's right-hand side it calls.
console.log('');
console.log('where a shot goes (waveforms off; profiled shots, shares of the profiled time; "integration" = odex itself, "rhs" = the model it calls; "dense" = dense-output evaluations per shot)');
const phaseHeader = [pad('scenario', 24), pad('prof ms', 8), ...PHASES.map((p) => pad(p, p.length < 8 ? 8 : p.length + 1)), pad('dense', 7), pad('rhs/step', 9)].join(' ');
console.log(phaseHeader);
console.log('-'.repeat(phaseHeader.length));
for (const file of demos) {
  const { profile } = reports.get(file)!;
  console.log(
    [
      pad(file.replace(/\.json$/, ''), 24),
      pad(ms(profile.ms), 8),
      ...PHASES.map((p) => pad(`${(100 * (profile.shares[p] ?? 0)).toFixed(1)} %`, p.length < 8 ? 8 : p.length + 1)),
      pad(profile.dense.toFixed(0), 7),
      pad(profile.rhsPerStep.toFixed(1), 9),
    ].join(' '),
  );
}

console.log('');
console.log(`whole process, median of ${CLI_RUNS}: node bin/railpulse.js run <demo> --json (bundled CLI: dist/railpulse.mjs runs dist/railpulse-cli.cjs through its V8 code cache, made by the first run)`);
const cliHeader = [pad('scenario', 24), pad('--no-report s', 14), pad('(cpu s)', 8), pad('with report s', 14), pad('(cpu s)', 8)].join(' ');
console.log(cliHeader);
console.log('-'.repeat(cliHeader.length));
// `run` writes its HTML record by default; the second column measures that path into a temporary folder so the
// benchmark leaves nothing in reports/.
let worstBare = 0;
let worstBareCpu = 0;
const timeCliCpu = (): number => cliCpu[cliCpu.length - 1] ?? NaN;
const reportDir = mkdtempSync(join(tmpdir(), 'railpulse-bench-'));
try {
  for (const file of demos) {
    const path = join(SCENARIO_DIR, file);
    const bare = timeCli(['run', path, '--json', '--no-report']);
    const bareCpu = timeCliCpu();
    const withReport = timeCli(['run', path, '--json', '--report', reportDir]);
    const reportCpu = timeCliCpu();
    const show = (v: number | string) => (typeof v === 'number' ? v.toFixed(3) : v);
    const cpuText = (v: number) => (Number.isNaN(v) ? '' : v.toFixed(3));
    console.log([pad(file.replace(/\.json$/, ''), 24), pad(show(bare), 14), pad(cpuText(bareCpu), 8), pad(show(withReport), 14), pad(cpuText(reportCpu), 8)].join(' '));
    if (typeof bare === 'number') worstBare = Math.max(worstBare, bare);
    if (!Number.isNaN(bareCpu)) worstBareCpu = Math.max(worstBareCpu, bareCpu);
  }
  // What the slow demos spend: the same scenario without its tolerances (no linear propagation: 1 + 4k shots for k
  // uncertain inputs), and the floor no command can go below (node starting and exiting, the CLI's start-up).
  console.log('');
  for (const file of demos) {
    const raw = JSON.parse(readFileSync(join(SCENARIO_DIR, file), 'utf8')) as Record<string, unknown>;
    if (!('tolerances' in raw) && !('calibration' in raw)) continue;
    delete raw.tolerances;
    delete raw.calibration;
    const copy = join(reportDir, `without-uncertainty-${file}`);
    writeFileSync(copy, JSON.stringify(raw));
    const bare = timeCli(['run', copy, '--json', '--no-report']);
    console.log(`  ${file.replace(/\.json$/, '')} without its tolerances (no uncertainty shots): ${typeof bare === 'number' ? `${bare.toFixed(3)} s` : bare}`);
  }
  const empty = timeProcess(['-e', '0']);
  const version = timeCli(['--version']);
  console.log(`  floor: node alone (node -e 0) ${empty.toFixed(3)} s; railpulse --version ${typeof version === 'number' ? version.toFixed(3) : version} s`);
} finally {
  rmSync(reportDir, { recursive: true, force: true });
}
console.log(`target: --no-report ≤ ${TARGET_PROCESS_S} s for every demo; slowest ${worstBare.toFixed(3)} s wall (${worstBare <= TARGET_PROCESS_S ? 'met' : 'missed'}), ${worstBareCpu.toFixed(3)} s CPU; load average now ${loadavg().map((l) => l.toFixed(2)).join(' ')}`);

/** Median wall time of `node <args>`, in seconds. */
function timeProcess(args: string[]): number {
  const times: number[] = [];
  for (let k = 0; k < CLI_RUNS; k++) {
    const t0 = performance.now();
    spawnSync(process.execPath, args);
    times.push((performance.now() - t0) / 1000);
  }
  return median(times);
}
