import { parentPort } from 'node:worker_threads';
import { crossProductRows } from '../../shared-core/linalg/cross-product.js';
import { CLAIMED, DONE, FAILED, TAKEN_BACK, type RowsJob } from './two-thread-cross-product.js';

/**
 * The second thread of two-thread-cross-product.ts: claims a job (unless the main thread took it
 * back), computes its rows of X'X with the core's kernel into shared memory, and says so through
 * the job's flag, which the waiting main thread reads.
 */
parentPort!.on('message', (job: RowsJob) => {
  const flag = new Int32Array(job.flag);
  if (Atomics.compareExchange(flag, 0, 0, CLAIMED) === TAKEN_BACK) return;
  try {
    const x = { rows: job.rows, cols: job.cols, data: new Float64Array(job.x) };
    crossProductRows(x, new Float64Array(job.out), job.rowStart, job.rowEnd);
    Atomics.store(flag, 0, DONE);
  } catch {
    Atomics.store(flag, 0, FAILED);
  }
  Atomics.notify(flag, 0);
});
