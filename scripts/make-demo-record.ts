// Make the demo "measured" record scenarios/measured/bench-shot-17.csv: the bench demo simulated with a
// slightly different L′ and contact resistance (what the fit should find), plus seeded noise, written as our
// invented lab's digitiser export: two lines of notes in our own words, a raw channel name and kA units.
// Invented data for the demo only.
import { readFileSync, writeFileSync } from 'node:fs';
import { scenarioFromRaw } from '../src/scenario/load.js';
import { runShot } from '../src/solve/shot.js';

const raw = JSON.parse(readFileSync('scenarios/bench-shot.json', 'utf8'));
raw.rails.inductanceGradient = '0.43 uH/m';
raw.armature.contactResistance = '0.16 mohm';
raw.solver = { sampleInterval: '0.5 us', endTime: '3 ms' };
const shot = runShot(scenarioFromRaw(raw));
const w = shot.waveforms!;

let seed = 17;
const uniform = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
const gauss = () => Math.sqrt(-2 * Math.log(uniform() + 1e-12)) * Math.cos(2 * Math.PI * uniform());

const DEMO_RECORD_NOTES = [
  'Tarnwick Pulsed Power Laboratory (fictional) - bench rig B2 - shot 17 - invented demo data',
  'Channel CH1 is the Rogowski coil output at 1 V per kA - V_breech is the breech voltage probe',
];
const lines = [...DEMO_RECORD_NOTES, '', 't [us],CH1,V_breech [V]'];
for (let k = 0; k < w.t.length; k++) {
  const t = w.t[k]!;
  // the scope keeps the first 600 µs, one sample per time: at an event instant, the value just after it
  if (t > 600e-6 || w.t[k + 1] === t) continue;
  const currentKiloamps = w.current[k]! / 1e3 + 0.15 * gauss();
  const breech = w.breechVoltage[k]! + 0.2 * gauss();
  lines.push(`${(t * 1e6).toFixed(2)},${currentKiloamps.toFixed(4)},${breech.toFixed(3)}`);
}
writeFileSync('scenarios/measured/bench-shot-17.csv', lines.join('\n') + '\n');
console.log(`wrote scenarios/measured/bench-shot-17.csv (${lines.length - 4} rows); muzzle velocity ${shot.results.muzzleVelocity.toFixed(1)} m/s`);
