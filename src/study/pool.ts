/**
 * Runners for batches of study points: a pool of worker threads (the sweep), or the current thread (tests, and
 * the sizing search, which is sequential by nature).
 */
import { Worker } from 'node:worker_threads';
import { makeBatchRunner, type BatchContext, type BatchRequest, type BatchResult, type RunShot } from './batch.js';
import type { RowLayout } from './rows.js';

export interface PointRunner {
  /** how many batches run at once */
  concurrency: number;
  submit(request: BatchRequest): Promise<BatchResult>;
  close(): Promise<void>;
}

interface FatalReply {
  sequence: number;
  fatal: string;
}

interface Pending {
  resolve: (result: BatchResult) => void;
  reject: (error: Error) => void;
}

export function makeWorkerPool(workerUrl: URL, context: BatchContext, jobs: number): PointRunner {
  const slots = Array.from({ length: jobs }, () => {
    const worker = new Worker(workerUrl, { workerData: context });
    const pending = new Map<number, Pending>();
    const failAll = (error: Error): void => {
      for (const entry of pending.values()) entry.reject(error);
      pending.clear();
    };
    worker.on('message', (reply: BatchResult | FatalReply) => {
      const entry = pending.get(reply.sequence);
      if (!entry) return;
      pending.delete(reply.sequence);
      if ('fatal' in reply) entry.reject(new Error(`sweep worker failed: ${reply.fatal}`));
      else entry.resolve(reply);
    });
    worker.on('error', (error) => failAll(error));
    worker.on('exit', (code) => failAll(new Error(`sweep worker stopped (exit code ${code})`)));
    return { worker, pending };
  });
  return {
    concurrency: jobs,
    submit(request) {
      // The least busy worker takes the batch; a worker with a batch queued starts it the moment it is free.
      const slot = slots.reduce((best, candidate) => (candidate.pending.size < best.pending.size ? candidate : best));
      return new Promise<BatchResult>((resolve, reject) => {
        slot.pending.set(request.sequence, { resolve, reject });
        slot.worker.postMessage(request);
      });
    },
    async close() {
      await Promise.all(slots.map((slot) => slot.worker.terminate()));
    },
  };
}

/** Run batches in this thread, one at a time, yielding to the event loop between batches. */
export function makeInProcessRunner(context: BatchContext, runShot: RunShot): PointRunner & { layout: RowLayout } {
  const runner = makeBatchRunner(context, runShot);
  let queue = Promise.resolve();
  return {
    concurrency: 1,
    layout: runner.layout,
    submit(request) {
      const result = queue.then(() => new Promise<BatchResult>((resolve) => setImmediate(() => resolve(runner.run(request)))));
      queue = result.then(() => undefined, () => undefined);
      return result;
    },
    async close() {
      await queue;
    },
  };
}
