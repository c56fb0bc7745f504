import { parentPort } from 'node:worker_threads';
import { crossProductRows } from '../shared-core/linalg/cross-product.js';

/**
 * One thread of the two-core cross product measured by bench/estimators.ts: computes rows
 * [rowStart, rowEnd) of X'X with the pure kernel into shared memory. The core itself never
 * starts threads; this edge does.
 */
interface Job {
  x: SharedArrayBuffer;
  out: SharedArrayBuffer;
  rows: number;
  cols: number;
  rowStart: number;
  rowEnd: number;
}

parentPort!.on('message', (job: Job) => {
  const x = { rows: job.rows, cols: job.cols, data: new Float64Array(job.x) };
  crossProductRows(x, new Float64Array(job.out), job.rowStart, job.rowEnd);
  parentPort!.postMessage('done');
});
