/**
 * Shot effects benchmark: for the geometry and staggered demos, the per-shot time (waveforms off, as sweeps run it)
 * and the headline figures with every optional shot effect off, each one on by itself, and all on. Figures, not
 * tests: nothing here asserts on time. The effects' settings for the demos are invented demo values.
 *
 *   diffusion    rails.resistanceModel "diffusion" (off: "quarter-period"); only for rails from geometry and material
 *   transition   armature.transition (the contact turns into an arc at a specific action of the contact)
 *   heating      heating "adiabatic"; only with materials (the geometry demo)
 *   shock drag   drag.model "strong-shock" (off: the file's drag, if any)
 *
 * Run: node --import tsx bench/effects.ts [--json]
 */
import { readFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { scenarioFromRaw } from '../src/scenario/load.js';
import { runShot } from '../src/solve/shot.js';
import type { Shot } from '../src/solve/types.js';

type Raw = Record<string, any>;

interface Effect {
  name: string;
  applies: (raw: Raw) => boolean;
  on: (raw: Raw) => void;
  off: (raw: Raw) => void;
}

const EFFECTS: Effect[] = [
  {
    name: 'diffusion',
    applies: (raw) => raw.rails.geometry !== undefined && raw.rails.material !== undefined && raw.rails.resistanceGradient === undefined,
    on: (raw) => (raw.rails.resistanceModel = 'diffusion'),
    off: (raw) => (raw.rails.resistanceModel = 'quarter-period'),
  },
  {
    name: 'transition',
    applies: () => true,
    on: (raw) => (raw.armature.transition = { specificAction: '5e14 A^2 s/m^4', contactArea: '3 cm^2', arcDrop: '60 V' }),
    off: (raw) => delete raw.armature.transition,
  },
  {
    name: 'heating',
    applies: (raw) => raw.armature.material !== undefined || raw.rails.material !== undefined,
    on: (raw) => (raw.heating = 'adiabatic'),
    off: (raw) => delete raw.heating,
  },
  {
    name: 'shock drag',
    applies: () => true,
    on: (raw) => (raw.drag = { model: 'strong-shock', gasDensity: '1.2 kg/m^3', boreArea: raw.drag?.boreArea ?? '2.25 cm^2', heatCapacityRatio: 1.4 }),
    off: () => {},
  },
];

const DEMOS = ['geometry-shot', 'staggered-bank'];
const median = (values: number[]) => values.slice().sort((a, b) => a - b)[values.length >> 1]!;

function variant(file: string, on: Set<string>): Raw {
  const raw = JSON.parse(readFileSync(`scenarios/${file}.json`, 'utf8')) as Raw;
  delete raw.tolerances;
  for (const effect of EFFECTS) {
    if (!effect.applies(raw)) continue;
    if (on.has(effect.name)) effect.on(raw);
    else effect.off(raw);
  }
  return raw;
}

function timed(raw: Raw, name: string): { shot: Shot; ms: number; cpu: number } {
  const s = scenarioFromRaw(raw, name);
  let shot = runShot(s, { waveforms: false });
  for (let k = 0; k < 3; k++) shot = runShot(s, { waveforms: false });
  const times: number[] = [];
  const cpuStart = process.cpuUsage();
  const start = performance.now();
  while (times.length < 15 || performance.now() - start < 1500) {
    const t0 = performance.now();
    shot = runShot(s, { waveforms: false });
    times.push(performance.now() - t0);
  }
  const cpu = process.cpuUsage(cpuStart);
  return { shot, ms: median(times), cpu: (cpu.user + cpu.system) / 1000 / times.length };
}

const json = process.argv.includes('--json');
const rows: Record<string, unknown>[] = [];
if (!json) {
  console.log(`railpulse shot effects — node ${process.version}, ${cpus().length} CPU(s); load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}`);
  console.log('');
}
for (const demo of DEMOS) {
  const base = JSON.parse(readFileSync(`scenarios/${demo}.json`, 'utf8')) as Raw;
  const applicable = EFFECTS.filter((e) => e.applies(base)).map((e) => e.name);
  const sets: [string, Set<string>][] = [['all off', new Set()], ...applicable.map((n) => [n, new Set([n])] as [string, Set<string>]), ['all on', new Set(applicable)]];
  let offMs = 0;
  let offCpu = 0;
  for (const [label, on] of sets) {
    const { shot, ms, cpu } = timed(variant(demo, on), `${demo}.json`);
    if (label === 'all off') {
      offMs = ms;
      offCpu = cpu;
    }
    const r = shot.results;
    const row = {
      demo,
      effects: label,
      ms,
      ratio: ms / offMs,
      cpu,
      cpuRatio: cpu / offCpu,
      steps: shot.stats.steps,
      evaluations: shot.stats.rhsEvaluations,
      muzzleVelocity: r.muzzleVelocity,
      ...r.energy.losses,
      transitionTime: r.transitionTime ?? null,
      armatureTemperature: r.armatureTemperature ?? null,
      railTemperature: r.railTemperature ?? null,
      residual: r.energy.residual / r.energy.initial,
    };
    rows.push(row);
  }
}
if (json) console.log(JSON.stringify(rows, null, 1));
else {
  const keys = ['bank', 'crowbar', 'modules', 'feed', 'rails', 'armature', 'contacts', 'arc', 'friction', 'drag'];
  console.log(['demo'.padEnd(15), 'effects'.padEnd(12), 'ms/shot'.padStart(8), '×off'.padStart(5), 'cpu ms'.padStart(7), '×off'.padStart(5), 'steps'.padStart(6), 'evals'.padStart(6), 'v m/s'.padStart(8), ...keys.map((k) => `${k} kJ`.padStart(11)), 'transition'.padStart(11)].join(' '));
  for (const row of rows as Record<string, any>[]) {
    console.log(
      [
        String(row.demo).padEnd(15),
        String(row.effects).padEnd(12),
        row.ms.toFixed(2).padStart(8),
        row.ratio.toFixed(2).padStart(5),
        row.cpu.toFixed(2).padStart(7),
        row.cpuRatio.toFixed(2).padStart(5),
        String(row.steps).padStart(6),
        String(row.evaluations).padStart(6),
        row.muzzleVelocity.toFixed(1).padStart(8),
        ...keys.map((k) => (row[k] / 1e3).toFixed(3).padStart(11)),
        (row.transitionTime === null ? '—' : `${(row.transitionTime * 1e6).toFixed(1)} µs`).padStart(11),
      ].join(' '),
    );
  }
}
