import { loadScenarioFile } from './src/scenario/load.js';
import { runShot } from './src/solve/shot.js';
for (const f of ['test/study/fixtures/two-group.json','scenarios/staggered-bank.json','scenarios/sizing-target.json']) {
const s = loadScenarioFile(f).scenario;
let t=performance.now(); let r; for (let i=0;i<20;i++) r=runShot(s,{waveforms:false}); console.log(f,(performance.now()-t)/20, r!.results.outcome, r!.results.muzzleVelocity, r!.stats);
}
