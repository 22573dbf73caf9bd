/**
 * Sweep throughput and memory. Prints shots/s for a 10,000-point sweep of the multi-group demo on all cores and on
 * one core, the parallel efficiency, and the peak resident memory of a 100,000-point sweep (the sweep process,
 * including its worker threads, measured by /usr/bin/time -v when present, else by the process itself).
 *
 *   node --import tsx bench/sweep.ts [--points 10000] [--rss-points 100000] [--skip-rss]
 */
import { spawn, spawnSync } from 'node:child_process';
import { buildShotTimer } from './build-timer.js';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';

const args = process.argv.slice(2);
const option = (name: string, fallback: number): number => {
  const at = args.indexOf(name);
  return at >= 0 ? Number(args[at + 1]) : fallback;
};
const points = option('--points', 10_000);
const rssPoints = option('--rss-points', 100_000);
/** runs of each configuration; the efficiency is the ratio of the medians */
const repeats = option('--repeats', 3);
/** Targets (issue 16), printed beside the figures. */
const TARGET_EFFICIENCY = 0.85;
const TARGET_RSS_MIB = 300;
const work = mkdtempSync(join(tmpdir(), 'railpulse-bench-sweep-'));

// The multi-group demo: four staggered groups of four crowbarred modules (scenarios/staggered-bank.json).
const scenarioFile = new URL('../scenarios/staggered-bank.json', import.meta.url).pathname;

// The built CLI (npm run bench builds it first), as a user runs it.
const entry = [new URL('../dist/railpulse.mjs', import.meta.url).pathname];

/** `--vary` specs with about n grid points. */
function varies(n: number): string[] {
  const side = Math.round(Math.sqrt(n / 4));
  return ['--vary', `bank[0].voltage=8kV:10kV:${side}`, '--vary', `armature.mass=30g:60g:${side}`, '--vary', 'bank[1].trigger=100us,140us,180us,220us'];
}

interface Summary {
  ran: number;
  failed: number;
  seconds: number;
  shotsPerSecond: number;
}

function sweep(n: number, jobs: number, name: string, measureRss = false): { summary: Summary; maxRssKiB?: number; cpuSeconds?: number } {
  const out = join(work, name);
  const command = [...entry, 'sweep', scenarioFile, ...varies(n), '--jobs', String(jobs), '--out', out, '--no-report', '--json'];
  const useTime = measureRss && existsSync('/usr/bin/time');
  const result = useTime
    ? spawnSync('/usr/bin/time', ['-v', process.execPath, ...command], { encoding: 'utf8', maxBuffer: 1 << 26 })
    : spawnSync(process.execPath, command, { encoding: 'utf8', maxBuffer: 1 << 26 });
  if (result.status !== 0) throw new Error(`sweep failed: ${result.stderr.slice(-2000)}`);
  const summary = JSON.parse(result.stdout) as Summary;
  // A failing point costs no solver time: a rate over failures would be meaningless.
  if (summary.failed > 0) throw new Error(`${summary.failed} of ${summary.ran} points failed; see ${join(out, 'points.jsonl')}`);
  const rss = useTime ? /Maximum resident set size \(kbytes\): (\d+)/.exec(result.stderr) : null;
  const user = useTime ? /User time \(seconds\): ([\d.]+)/.exec(result.stderr) : null;
  const system = useTime ? /System time \(seconds\): ([\d.]+)/.exec(result.stderr) : null;
  rmSync(out, { recursive: true, force: true });
  return { summary, maxRssKiB: rss ? Number(rss[1]) : undefined, cpuSeconds: user && system ? Number(user[1]) + Number(system[1]) : undefined };
}

const cores = availableParallelism();
const load = () => loadavg().map((l) => l.toFixed(2)).join(' ');
const median = (values: number[]): number => {
  const sorted = values.slice().sort((x, y) => x - y);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
};
console.log(`sweep bench: built CLI, ${cores} cores, scenarios/staggered-bank.json; load average at start ${load()} (other work on the machine lowers the efficiency: read it beside the load)`);
// Alternate the configurations so a change of the machine's load falls on both alike.
const rates: Record<'all' | 'one', number[]> = { all: [], one: [] };
const cpu: Record<'all' | 'one', number[]> = { all: [], one: [] };
for (let k = 0; k < repeats; k++) {
  for (const [key, jobs] of [['all', cores], ['one', 1]] as const) {
    const run = sweep(points, jobs, `${key}${k}`, true);
    rates[key].push(run.summary.shotsPerSecond);
    if (run.cpuSeconds !== undefined) cpu[key].push((1e3 * run.cpuSeconds) / run.summary.ran);
  }
}
const all = median(rates.all);
const one = median(rates.one);
const cpuNote = (key: 'all' | 'one') => (cpu[key].length ? `, process CPU ${median(cpu[key]).toFixed(3)} ms/point` : '');
console.log(`  ${points} points on ${cores} workers: ${all.toFixed(0)} shots/s (median of ${repeats}: ${rates.all.map((r) => r.toFixed(0)).join(', ')})${cpuNote('all')}`);
console.log(`  ${points} points on 1 worker:  ${one.toFixed(0)} shots/s (median of ${repeats}: ${rates.one.map((r) => r.toFixed(0)).join(', ')})${cpuNote('one')}`);
const efficiency = all / (one * cores);
console.log(`  parallel efficiency: ${(100 * efficiency).toFixed(0)} % (speed-up ${(all / one).toFixed(2)}× on ${cores}); target ≥ ${(100 * TARGET_EFFICIENCY).toFixed(0)} %: ${efficiency >= TARGET_EFFICIENCY ? 'met' : 'missed'}; load average now ${load()}`);
// What limits the efficiency on this machine, measured apart from the sweep: the CPU a one-worker sweep uses beyond
// one core (its worker's garbage-collector and compiler threads, the main thread), and how much two independent shot
// loops (separate processes, no sweep code, nothing shared) slow each other when they run at once.
{
  const timer = await buildShotTimer();
  const offWall = (text: string) => (JSON.parse(text) as { off: { wall: number } }).off.wall;
  const once = () =>
    new Promise<number>((resolve, reject) => {
      const child = spawn(process.execPath, [timer, scenarioFile, '--off-only']);
      let out = '';
      child.stdout.on('data', (chunk: Buffer) => (out += chunk.toString()));
      child.on('error', reject);
      child.on('close', (code) => (code === 0 ? resolve(offWall(out)) : reject(new Error(`shot timer exit ${code}`))));
    });
  // alternated, three of each, medians: the machine's load drifts
  const alones: number[] = [];
  const pairs: number[] = [];
  for (let k = 0; k < 3; k++) {
    alones.push(await once());
    pairs.push(...(await Promise.all([once(), once()])));
  }
  const alone = median(alones);
  const pair = [median(pairs)];
  const slowdown = pair[0]! / alone - 1;
  // With every core busy, efficiency = 1 / (cores one worker's sweep uses × rise of CPU per point with all workers)
  const oneCores = cpu.one.length ? median(cpu.one) / (1e3 / one) : NaN;
  const rise = cpu.one.length && cpu.all.length ? median(cpu.all) / median(cpu.one) : NaN;
  const known = !Number.isNaN(oneCores) && !Number.isNaN(rise);
  console.log(
    `  where it goes: a 1-worker sweep uses ${known ? oneCores.toFixed(2) : '?'} cores (its worker's garbage-collector and compiler threads, the main thread); ` +
      `with ${cores} workers each point costs ${known ? `${(100 * (rise - 1)).toFixed(0)} %` : '?'} more CPU; 1 / (${known ? `${oneCores.toFixed(2)} × ${rise.toFixed(2)}` : '?'}) = ${known ? `${(100 / (oneCores * rise)).toFixed(0)} %` : '?'}. ` +
      `Two bare shot loops in separate processes run ${(100 * slowdown).toFixed(0)} % slower each when together (median ${alone.toFixed(3)} ms a shot alone, ${pair[0]!.toFixed(3)} ms together)`,
  );
}
if (!args.includes('--skip-rss')) {
  const big = sweep(rssPoints, cores, 'big', true);
  const rss = big.maxRssKiB !== undefined ? `${(big.maxRssKiB / 1024).toFixed(0)} MiB` : 'not measured (/usr/bin/time missing)';
  const verdict = big.maxRssKiB !== undefined ? `; target < ${TARGET_RSS_MIB} MB: ${big.maxRssKiB * 1024 < TARGET_RSS_MIB * 1e6 ? 'met' : 'missed'}` : '';
  console.log(`  ${big.summary.ran} points on ${cores} workers: ${big.summary.shotsPerSecond.toFixed(0)} shots/s, peak RSS ${rss}${verdict}`);
}
rmSync(work, { recursive: true, force: true });
