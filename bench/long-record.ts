/**
 * Long records: `overlay` and `fit` on a ten-million-row scope export (0.5 ns sampling over 5 ms, the bench
 * demo's shot with seeded noise), generated here in a temporary folder and deleted afterwards. Prints, for
 * each command run as the real CLI (dist bundle), the wall time, the CPU time and the peak resident memory
 * of its process. Figures, not tests: nothing here asserts.
 *
 *   node --import tsx bench/long-record.ts [--rows 10000000] [--no-fit]
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { loadScenarioFile } from '../src/scenario/load.js';
import { runShot } from '../src/solve/shot.js';
import { writeLongRecord } from '../test/measure/long-record.js';

const argument = (name: string): string | undefined => {
  const at = process.argv.indexOf(name);
  return at > 0 ? process.argv[at + 1] : undefined;
};
const rows = Number(argument('--rows') ?? 10_000_000);
const span = 5e-3;
const scenarioFile = 'scenarios/bench-shot.json';
/** Reports the child's own resource use when it exits: wall time is measured outside, CPU and memory inside. */
const USAGE = 'data:text/javascript,process.on("exit",()=>{const u=process.resourceUsage();process.stderr.write("usage "+u.maxRSS+" "+(u.userCPUTime+u.systemCPUTime)+"\\n")})';

const dir = mkdtempSync(join(tmpdir(), 'railpulse-bench-long-'));
try {
  const loaded = loadScenarioFile(scenarioFile);
  const shot = runShot({ ...loaded.scenario, solver: { ...loaded.scenario.solver, sampleInterval: 0.05e-6 } });
  const record = join(dir, 'long.csv');
  // the fit starts from L′ and R_c 10 % and 20 % off the values the record was made with
  const raw = loaded.raw as { rails: Record<string, unknown>; armature: Record<string, unknown> };
  writeFileSync(join(dir, 'start.json'), JSON.stringify({ ...raw, rails: { ...raw.rails, inductanceGradient: '0.495 uH/m' }, armature: { ...raw.armature, contactResistance: '0.08 mohm' } }));
  const written = performance.now();
  const interval = writeLongRecord(record, shot, { rows, span, noise: { I: 150, V_breech: 0.2 }, seed: 5 });
  console.log(`record: ${rows.toLocaleString('en')} rows, ${(statSync(record).size / 2 ** 20).toFixed(0)} MiB, ${(interval * 1e9).toFixed(2)} ns sampling, written in ${((performance.now() - written) / 1000).toFixed(1)} s`);
  const run = (label: string, args: string[]): void => {
    const started = performance.now();
    const result = spawnSync(process.execPath, ['--import', USAGE, 'bin/railpulse.js', ...args], { encoding: 'utf8', maxBuffer: 1 << 26 });
    const wall = (performance.now() - started) / 1000;
    const usage = /usage (\d+) (\d+)/.exec(result.stderr);
    if (result.status !== 0 || !usage) {
      console.log(`${label}: exit ${result.status}: ${result.stderr.trim().split('\n')[0]}`);
      return;
    }
    const peakMiB = Number(usage[1]) / 1024;
    const cpu = Number(usage[2]) / 1e6;
    console.log(`${label}: ${wall.toFixed(1)} s wall, ${cpu.toFixed(1)} s CPU, peak RSS ${peakMiB.toFixed(0)} MiB`);
  };
  run(`overlay, ${rows.toLocaleString('en')} rows`, ['overlay', scenarioFile, record, '--report', join(dir, 'reports')]);
  if (!process.argv.includes('--no-fit')) {
    run(`fit (L′, R_c), ${rows.toLocaleString('en')} rows`, ['fit', join(dir, 'start.json'), record, '--free', 'rails.inductanceGradient', '--free', 'armature.contactResistance', '--no-report']);
  }
  console.log(`load average ${loadavg().map((l) => l.toFixed(2)).join(' ')} (a busy machine inflates wall time, not CPU time)`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
