/**
 * The message loop of a sweep worker thread, with the shot function injected (the real one in worker.ts, a test
 * double in the tests). Worker-safe: no unit parser, no mathjs.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { makeBatchRunner, type BatchContext, type BatchRequest, type RunShot } from './batch.js';

export function serveSweep(runShot: RunShot): void {
  const port = parentPort;
  if (!port) throw new Error('serveSweep must run in a worker thread');
  const runner = makeBatchRunner(workerData as BatchContext, runShot);
  port.on('message', (request: BatchRequest) => {
    try {
      port.postMessage(runner.run(request));
    } catch (error) {
      port.postMessage({ sequence: request.sequence, fatal: error instanceof Error ? error.stack ?? error.message : String(error) });
    }
  });
}
