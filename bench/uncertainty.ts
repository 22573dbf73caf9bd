/**
 * Uncertainty benchmark (issue 12): the time of a linear propagation and of a 1,000-shot Monte Carlo (all cores,
 * worker threads of the built bundle) for the staggered demo and its tolerances, and of sizing the sizing demo.
 * Figures, not tests: nothing here asserts on time. The load average is printed because a busy machine inflates
 * every figure.
 *
 *   node --import tsx bench/uncertainty.ts [--shots 1000]
 */
import { availableParallelism, loadavg } from 'node:os';
import { validateScenario } from '../src/scenario/validate.js';
import { loadScenarioFile } from '../src/scenario/load.js';
import { runShot } from '../src/solve/shot.js';
import { monteCarlo } from '../src/study/montecarlo.js';
import { propagateLinear } from '../src/study/propagate.js';
import { sizeBank } from '../src/study/size.js';
import { readSizingInput } from '../src/study/sizeInput.js';
import { uncertaintyModel } from '../src/study/uncertainInputs.js';

const at = process.argv.indexOf('--shots');
const shots = at > 0 ? Number(process.argv[at + 1]) : 1000;
const seconds = (start: number): string => ((performance.now() - start) / 1000).toFixed(3);

console.log(`uncertainty bench — node ${process.version}, ${availableParallelism()} cores, load average ${loadavg().map((l) => l.toFixed(2)).join(' ')}`);
const { scenario } = loadScenarioFile('scenarios/staggered-bank.json');
const model = uncertaintyModel(scenario)!;
// warm the solver up, as a running command is
for (let k = 0; k < 20; k++) runShot(scenario, { waveforms: false });

let start = performance.now();
const linear = propagateLinear(scenario, runShot)!;
console.log(`linear propagation, staggered demo (${model.inputs.length} inputs, ${linear.shots} shots, waveforms off): ${seconds(start)} s; muzzle velocity ${linear.nominal.muzzleVelocity!.toFixed(1)} ± ${linear.standardUncertainty.muzzleVelocity!.toFixed(1)} m/s`);
start = performance.now();
const banded = propagateLinear(scenario, runShot, { waveforms: true })!;
console.log(`linear propagation with the current and velocity bands (waveforms on, ${banded.shots} shots): ${seconds(start)} s`);

start = performance.now();
const mc = await monteCarlo(scenario, model, { shots, seed: 1, validate: (s) => validateScenario(s) });
const v = mc.results.muzzleVelocity!;
console.log(`Monte Carlo, ${shots} shots on ${availableParallelism()} worker threads: ${seconds(start)} s (${(shots / mc.seconds).toFixed(0)} shots/s); muzzle velocity mean ${v.mean.toFixed(1)}, σ ${v.standardDeviation.toFixed(1)} m/s, 2.5–97.5 % ${v.percentiles['2.5']!.toFixed(1)}–${v.percentiles['97.5']!.toFixed(1)} m/s`);

const input = readSizingInput('scenarios/sizing-target.json');
start = performance.now();
const sized = sizeBank(input.scenario, input.target, input.limits, runShot);
const best = sized.best!;
console.log(`sizing the sizing demo: ${seconds(start)} s, ${sized.shots} shots; ${best.modulesPerGroup} modules per group at ${(best.chargeVoltages[0]! / 1e3).toFixed(4)} kV, ${(best.storedEnergy / 1e3).toFixed(3)} kJ, binding ${sized.binding.join(', ')}`);
