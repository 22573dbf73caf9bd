/**
 * Sweep throughput and memory. Prints shots/s for a 10,000-point sweep of a three-group scenario on all cores and on
 * one core, the parallel efficiency, and the peak resident memory of a 100,000-point sweep (the sweep process,
 * including its worker threads, measured by /usr/bin/time -v when present, else by the process itself).
 *
 *   node --import tsx bench/sweep.ts [--points 10000] [--rss-points 100000] [--skip-rss]
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';

const args = process.argv.slice(2);
const option = (name: string, fallback: number): number => {
  const at = args.indexOf(name);
  return at >= 0 ? Number(args[at + 1]) : fallback;
};
const points = option('--points', 10_000);
const rssPoints = option('--rss-points', 100_000);
const work = mkdtempSync(join(tmpdir(), 'railpulse-bench-sweep-'));

// A bench scenario of our own invention: three staggered groups of crowbarred modules on a 1.5 m gun.
const group = (label: string, trigger: string) => ({
  label,
  count: 3,
  capacitance: '400 uF',
  voltage: '4 kV',
  esr: '2 mohm',
  inductance: '6 uH',
  resistance: '2 mohm',
  trigger,
  crowbar: { drop: '1.5 V', resistance: '2 mohm' },
});
const scenarioFile = join(work, 'bench-three-group.json');
writeFileSync(
  scenarioFile,
  JSON.stringify({
    name: 'Sweep bench gun',
    bank: [group('a', '0 us'), group('b', '120 us'), group('c', '240 us')],
    feed: { inductance: '0.3 uH', resistance: '1 mohm' },
    rails: { length: '1.5 m', inductanceGradient: '0.45 uH/m', resistanceGradient: '0.2 mohm/m' },
    armature: { mass: '20 g', resistance: '0.1 mohm', contactResistance: '0.2 mohm' },
    solver: { endTime: '50 ms' },
  }),
);

// The built CLI once it carries the study commands; otherwise the study commands' own entry, bundled here with its
// worker the same way scripts/build.mjs bundles the CLI (so the figures are those of bundled code, not of tsx).
const builtCli = new URL('../dist/railpulse.mjs', import.meta.url);
const cliHasSweep = existsSync(builtCli) && spawnSync(process.execPath, [builtCli.pathname, 'sweep', '--help'], { encoding: 'utf8' }).stdout.includes('--vary');
const bundleDir = new URL('../node_modules/.cache/railpulse-bench-sweep/', import.meta.url).pathname;
let entry = [builtCli.pathname];
if (!cliHasSweep) {
  const { build } = await import('esbuild');
  await build({
    entryPoints: [
      { in: new URL('../test/study/study-cli.ts', import.meta.url).pathname, out: 'study-cli' },
      { in: new URL('../src/study/worker.ts', import.meta.url).pathname, out: 'sweep-worker' },
    ],
    // inside node_modules, so the bundles' runtime require('odex') resolves as it does from dist/
    outdir: bundleDir,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    banner: { js: "import { createRequire as __railpulseCreateRequire } from 'node:module'; const require = __railpulseCreateRequire(import.meta.url);" },
    logLevel: 'warning',
  });
  entry = [join(bundleDir, 'study-cli.mjs')];
}

/** `--vary` specs with about n grid points. */
function varies(n: number): string[] {
  const side = Math.round(Math.sqrt(n / 4));
  return ['--vary', `bank[0].voltage=3kV:5kV:${side}`, '--vary', `armature.mass=10g:40g:${side}`, '--vary', 'bank[1].trigger=60us,120us,180us,240us'];
}

interface Summary {
  ran: number;
  failed: number;
  seconds: number;
  shotsPerSecond: number;
}

function sweep(n: number, jobs: number, name: string, measureRss = false): { summary: Summary; maxRssKiB?: number } {
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
  rmSync(out, { recursive: true, force: true });
  return { summary, maxRssKiB: rss ? Number(rss[1]) : undefined };
}

const cores = availableParallelism();
console.log(`sweep bench: ${cliHasSweep ? 'built CLI' : 'study entry bundled with its worker'}, ${cores} cores, three-group scenario`);
const all = sweep(points, cores, 'all').summary;
console.log(`  ${all.ran} points on ${cores} workers: ${all.shotsPerSecond.toFixed(0)} shots/s (${all.seconds.toFixed(1)} s)`);
const one = sweep(points, 1, 'one').summary;
console.log(`  ${one.ran} points on 1 worker:  ${one.shotsPerSecond.toFixed(0)} shots/s (${one.seconds.toFixed(1)} s)`);
console.log(`  parallel efficiency: ${((100 * all.shotsPerSecond) / (one.shotsPerSecond * cores)).toFixed(0)} % (speed-up ${(all.shotsPerSecond / one.shotsPerSecond).toFixed(2)}× on ${cores})`);
if (!args.includes('--skip-rss')) {
  const big = sweep(rssPoints, cores, 'big', true);
  const rss = big.maxRssKiB !== undefined ? `${(big.maxRssKiB / 1024).toFixed(0)} MiB` : 'not measured (/usr/bin/time missing)';
  console.log(`  ${big.summary.ran} points on ${cores} workers: ${big.summary.shotsPerSecond.toFixed(0)} shots/s, peak RSS ${rss}`);
}
rmSync(work, { recursive: true, force: true });
