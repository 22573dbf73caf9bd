// Benchmark, not a test (vitest runs *.test.ts only): `npx tsx test/checks/bench-inductance.ts`.
// Prints the time of fresh converged field solutions and of cached lookups; belongs in bench/ when the
// lead wires the benchmarks.
import { clearInductanceCache, inductanceGradientOf, type RailGeometry } from '../src/conductors/inductance.js';

const shapes: Array<[string, RailGeometry]> = [
  ['square rails h = w = s', { kind: 'rectangular', height: 0.02, width: 0.02, separation: 0.02 }],
  ['tall thin rails h/w = 5, s = h', { kind: 'rectangular', height: 0.05, width: 0.01, separation: 0.05 }],
  ['wide flat rails w/h = 50', { kind: 'rectangular', height: 0.002, width: 0.1, separation: 0.002 }],
  ['close rails s/h = 0.02', { kind: 'rectangular', height: 0.05, width: 0.05, separation: 0.001 }],
  ['thin rails w/h = 0.02', { kind: 'rectangular', height: 0.05, width: 0.001, separation: 0.05 }],
  ['round d/2a = 1.5', { kind: 'round', radius: 0.01, centreDistance: 0.03 }],
  ['round close, gap 0.02 a', { kind: 'round', radius: 0.01, centreDistance: 0.0202 }],
];

for (const [name, geometry] of shapes) {
  clearInductanceCache();
  const t0 = performance.now();
  const result = inductanceGradientOf(geometry);
  const fresh = performance.now() - t0;
  const repeats = 100000;
  const t1 = performance.now();
  for (let k = 0; k < repeats; k++) inductanceGradientOf(geometry);
  const cached = ((performance.now() - t1) / repeats) * 1e3;
  console.log(
    `${name.padEnd(32)} L′HF ${(result.inductanceGradientHighFrequency * 1e6).toFixed(5)} µH/m  L′DC ${(result.inductanceGradientUniform * 1e6).toFixed(5)} µH/m  ` +
      `err ${result.estimatedRelativeError.toExponential(1)}  panels ${String(result.panels).padStart(4)}  fresh ${fresh.toFixed(1)} ms  cached ${cached.toFixed(2)} µs`,
  );
}
