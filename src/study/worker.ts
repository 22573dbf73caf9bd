// Entry of the sweep worker bundle (dist/sweep-worker.mjs): the solver, the checks and the row formatter — no unit parser,
// no mathjs, so a worker starts in milliseconds.
import { runShot } from '../solve/shot.js';
import { serveSweep } from './workerHost.js';

serveSweep(runShot);
