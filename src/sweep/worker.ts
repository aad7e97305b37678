/**
 * Worker thread of a parallel run (see parallel.ts): runs the tasks it is
 * sent with the same task runner as the main thread (tasks.ts).
 */
import { parentPort, workerData } from 'node:worker_threads';
import { createTaskRunner, type FromWorker, type ToWorker, type WorkerInit } from './tasks.js';

function main(): void {
  const port = parentPort;
  if (!port) throw new Error('worker.ts runs as a worker thread only');
  const post = (m: FromWorker, transfer: ArrayBuffer[] = []) => port.postMessage(m, transfer);
  const run = createTaskRunner(workerData as WorkerInit, post);
  port.on('message', (msg: ToWorker) => {
    run(msg).catch((err: unknown) => {
      const e = err instanceof Error ? err : new Error(String(err));
      post({ type: 'error', name: e.name, message: e.message, stack: e.stack });
    });
  });
}

main();
