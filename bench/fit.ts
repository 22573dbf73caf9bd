/**
 * Calibration cost: wall time, shots and iterations of the three-parameter fit of the measure CLI tests
 * (L′, contact resistance, μ from a noisy current, breech voltage and five probes), in process, a few
 * seeded noise draws, with the samples left out at switching instants and those the Huber loss
 * down-weighted. Prints figures; asserts nothing. Long records: bench/long-record.ts.
 *
 *   node --import tsx bench/fit.ts [--draws 3]
 */
import { readFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { readMeasurement, readPositionPoints } from '../src/measure/csv.js';
import { fitScenario } from '../src/measure/fit.js';
import { setScenarioPath } from '../src/scenario/paths.js';
import { loadScenarioFile } from '../src/scenario/load.js';
import { runShot } from '../src/solve/shot.js';
import { makeFixture, NOISE, PROBE_JITTER, TRIGGER_OFFSET_US, TRUTH } from '../test/measure/cli-fixture.js';

const at = process.argv.indexOf('--draws');
const draws = at > 0 ? Number(process.argv[at + 1]) : 3;
const shotStart = performance.now();
let shots = 0;
const normalised: Record<string, number[]> = Object.fromEntries(Object.keys(TRUTH).map((path) => [path, []]));
const timedShot: typeof runShot = (scenario, options) => {
  shots++;
  return runShot(scenario, options);
};
for (let seed = 1; seed <= draws; seed++) {
  const fixture = makeFixture(seed);
  const scenario = loadScenarioFile(fixture.scenario).scenario;
  const measurement = readMeasurement(readFileSync(fixture.csv, 'utf8'), {
    source: fixture.csv, map: { CH1: 'I' }, units: { CH1: 'kA' }, scale: { CH1: 10 }, offset: { t: TRIGGER_OFFSET_US },
  });
  const positions = readPositionPoints(readFileSync(fixture.positions, 'utf8'), { source: fixture.positions });
  const setPath = (s: typeof scenario, path: string, value: number): typeof scenario => {
    const next = setScenarioPath(s, path, value);
    return path === 'friction.coefficient' ? setScenarioPath(next, 'friction.staticCoefficient', value) : next;
  };
  shots = 0;
  const started = performance.now();
  const fit = fitScenario({ scenario, measurement, positions, free: Object.keys(TRUTH).map((path) => ({ path })), noise: { ...NOISE, arrivalTime: PROBE_JITTER }, runShot: timedShot, setPath });
  const seconds = (performance.now() - started) / 1000;
  for (const [path, truth] of Object.entries(TRUTH)) normalised[path]!.push((fit.parameters[path]!.value - truth) / fit.parameters[path]!.uncertainty);
  const errors = Object.entries(TRUTH).map(([path, truth]) => `${path} ${((fit.parameters[path]!.value - truth) / fit.parameters[path]!.uncertainty).toFixed(2)}σ`);
  const use = fit.samples;
  console.log(`draw ${seed}: ${seconds.toFixed(2)} s, ${fit.shots} shots (${shots} counted), ${use.outerIterations} fit run(s), ${fit.iterations} iterations in the last, ${((seconds / shots) * 1000).toFixed(1)} ms/shot, ${measurement.t.length} samples (${use.excluded.length} left out at switching instants, ${use.downWeighted.length} down-weighted); errors ${errors.join(', ')}`);
}
// for a correct covariance the (value − truth)/σ of repeated draws have unit spread (Numerical Recipes §15.6)
for (const [path, z] of Object.entries(normalised)) {
  console.log(`${path}: RMS of (value − truth)/σ over ${z.length} draws = ${Math.sqrt(z.reduce((a, b) => a + b * b, 0) / z.length).toFixed(2)}`);
}
console.log(`total ${((performance.now() - shotStart) / 1000).toFixed(1)} s`);
