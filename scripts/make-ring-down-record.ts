// Make the demo ring-down record scenarios/measured/bench-ring-down-3.csv: the bench module fired into a short
// (scenarios/bench-ring-down.json) with a pulse inductance and resistance above the nominal ones (what the fit
// should find: 4.2 µH and 4.5 mΩ for the module, against 4 µH and 3 mΩ in the file), plus seeded scope noise,
// written as a scope export. Invented data for the demo only.
import { readFileSync, writeFileSync } from 'node:fs';
import { scenarioFromRaw } from '../src/scenario/load.js';
import { runShot } from '../src/solve/shot.js';

const raw = JSON.parse(readFileSync('scenarios/bench-ring-down.json', 'utf8'));
raw.bank[0].inductance = '4.2 uH';
raw.bank[0].resistance = '4.5 mohm';
raw.solver = { sampleInterval: '0.5 us', endTime: '3 ms' };
const shot = runShot(scenarioFromRaw(raw));
const w = shot.waveforms!;

let seed = 3;
const uniform = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
const gauss = () => Math.sqrt(-2 * Math.log(uniform() + 1e-12)) * Math.cos(2 * Math.PI * uniform());

const lines = ['Model,TRW-4 (fictional scope)', 'Record,bench module ring-down 3, Tarnwick Pulsed Power Laboratory (fictional)', 'CH1,Rogowski coil, 1 V/kA', '', 't [us],CH1'];
const end = w.t[w.t.length - 1]!;
for (let k = 0; k * 0.5e-6 <= 1.5e-3; k++) {
  const t = k * 0.5e-6;
  // the scope samples on its own 0.5 µs grid (the trigger at 20 µs is on it); after the model's end, no current
  let j = 0;
  while (j + 1 < w.t.length && w.t[j + 1]! <= t) j++;
  const current = t > end ? 0 : j + 1 < w.t.length ? w.current[j]! + ((w.current[j + 1]! - w.current[j]!) * (t - w.t[j]!)) / (w.t[j + 1]! - w.t[j]! || 1) : w.current[j]!;
  lines.push(`${(t * 1e6).toFixed(2)},${(current / 1e3 + 0.03 * gauss()).toFixed(4)}`);
}
writeFileSync('scenarios/measured/bench-ring-down-3.csv', lines.join('\n') + '\n');
console.log(`wrote scenarios/measured/bench-ring-down-3.csv (${lines.length - 5} rows); the ring ended at ${(end * 1e3).toFixed(3)} ms (${shot.results.outcome})`);
