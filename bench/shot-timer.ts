/**
 * The in-process part of the shot benchmark (bench/run.ts) for one scenario, run as its own process from a bundle
 * made like the CLI's and the sweep workers' (so it times the code that ships: the TypeScript sources under tsx
 * carry tsx's helpers in every function and closure), and in a fresh process per scenario, as a sweep worker sees
 * one scenario (timing every demo in one process lets the demos before it make the shot code polymorphic).
 *
 *   node dist/bench-shot-timer.mjs <scenario.json> [--off-only]   → one line of JSON
 * (--off-only: only the waveforms-off timing, for the sweep bench's contention figure)
 */
import { loadScenarioFile } from '../src/scenario/load.js';
import { runShot } from '../src/solve/shot.js';
import { PROFILE_PHASES, createProfile } from '../src/solve/profile.js';
import type { Scenario } from '../src/scenario/types.js';

export interface ShotTiming {
  /** median wall time per shot, ms */
  wall: number;
  /** CPU time per shot over the timed shots, ms */
  cpu: number;
  stats: { rhsEvaluations: number; steps: number; restarts: number };
  samples: number;
}

export interface ShotTimerReport {
  off: ShotTiming;
  on: ShotTiming;
  /** profiled time per shot (ms), the share of each phase, dense-output evaluations per shot */
  profile: { ms: number; shares: Record<string, number>; dense: number; rhsPerStep: number };
}

const median = (values: number[]): number => {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
};

/** Time shots until both a minimum count and a minimum duration are reached, after a warm-up. */
function timeShots(scenario: Scenario, waveforms: boolean, warmup: number, count: number, seconds: number): ShotTiming {
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
  return {
    wall: median(times),
    cpu: (cpu.user + cpu.system) / 1000 / times.length,
    stats: shot.stats,
    samples: shot.waveforms?.t.length ?? 0,
  };
}

/** The same shots with the opt-in profile: where the time goes, as shares (the clock reads inflate the total). */
function profileShots(scenario: Scenario): ShotTimerReport['profile'] {
  for (let k = 0; k < 30; k++) runShot(scenario, { waveforms: false, profile: createProfile() });
  const profile = createProfile();
  let shot = runShot(scenario, { waveforms: false, profile });
  const start = performance.now();
  while (profile.shots < 200 || performance.now() - start < 1000) shot = runShot(scenario, { waveforms: false, profile });
  const total = PROFILE_PHASES.reduce((sum, p) => sum + profile.ms[p], 0);
  return {
    ms: total / profile.shots,
    shares: Object.fromEntries(PROFILE_PHASES.map((p) => [p, profile.ms[p] / total])),
    dense: profile.denseEvaluations / profile.shots,
    rhsPerStep: shot.stats.rhsEvaluations / Math.max(1, shot.stats.steps),
  };
}

const file = process.argv[2];
if (!file) {
  process.stderr.write('usage: node dist/bench-shot-timer.mjs <scenario.json> [--off-only]\n');
  process.exit(2);
}
const { scenario } = loadScenarioFile(file);
const off = timeShots(scenario, false, 50, 300, 2);
if (process.argv.includes('--off-only')) {
  process.stdout.write(`${JSON.stringify({ off })}\n`);
} else {
  const on = timeShots(scenario, true, 5, 30, 2);
  const report: ShotTimerReport = { off, on, profile: profileShots(scenario) };
  process.stdout.write(`${JSON.stringify(report)}\n`);
}
