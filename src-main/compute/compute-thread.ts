import { parentPort, workerData } from 'node:worker_threads';
import { fusedColumns } from '../../shared-core/linalg/tridiagonal-form.js';
import { runPanelsJob, type PanelsJob } from './two-thread-cross-product.js';
import type { SecondThreadData } from './second-thread.js';
import { runRotationsJob, type RotationsJob } from './rotations-ahead.js';
import { runReduceJob, type ReduceJob } from './tridiagonal-ahead.js';
import * as tri from './two-thread-tridiagonal.js';
import { warmUpKernels } from './warm-up.js';

/**
 * The helper thread of src-main/compute: it runs its share of a two-thread kernel with the core's
 * own code on shared memory and says so through the job's flags, which the waiting main thread
 * reads.
 * - `panels` (two-thread-cross-product.ts): claims the job unless the main thread closed it,
 *   computes row panels of X'X from the shared claim until none is left.
 * - `tridiagonal` (two-thread-tridiagonal.ts): claims the job unless the main thread closed it,
 *   then runs the second column range of every step it is handed until told to stop.
 * - `reduce` (tridiagonal-ahead.ts): a whole reduction while the main thread goes on.
 * - `rotations` (rotations-ahead.ts): the QL iteration on a reduced matrix, recorded.
 */
parentPort!.on('message', (job: PanelsJob | tri.TridiagonalJob | ReduceJob | RotationsJob) => {
  if (job.kind === 'panels') runPanelsJob(job);
  else if (job.kind === 'reduce') runReduceJob(job);
  else if (job.kind === 'rotations') runRotationsJob(job);
  else tridiagonal(job);
});
// Compiled before any message is read, then ready: the starting thread may now hand over smaller
// jobs (second-thread.ts), which the thread takes at once.
warmUpKernels();
const data = workerData as SecondThreadData | undefined;
if (data?.ready) Atomics.store(new Int32Array(data.ready), 0, 1);

function tridiagonal(job: tri.TridiagonalJob): void {
  const control = new Int32Array(job.control);
  if (Atomics.compareExchange(control, tri.STATE, tri.OPEN, tri.CLAIMED) !== tri.OPEN) return;
  const w = new Float64Array(job.w);
  const u = new Float64Array(job.u);
  const q = new Float64Array(job.q);
  const v = new Float64Array(job.v);
  const second = new Float64Array(job.second);
  // Steps are numbered from 1 and none is handed over before the claim, so 0 is the last seen.
  let seen = 0;
  for (;;) {
    awaitChange(control, tri.GO, seen);
    seen = Atomics.load(control, tri.GO);
    const size = Atomics.load(control, tri.SIZE);
    if (size === tri.STOP_SIZE) return;
    try {
      fusedColumns(w, job.n, size, Atomics.load(control, tri.SPLIT), size, u, q, v, second);
      Atomics.store(control, tri.DONE, seen);
    } catch {
      Atomics.store(control, tri.DONE, tri.FAILED_STEP);
      Atomics.notify(control, tri.DONE);
      return;
    }
    Atomics.notify(control, tri.DONE);
  }
}

/** Waits until control[slot] differs from `from`: spins, then sleeps (the main thread never goes quiet for long). */
function awaitChange(control: Int32Array, slot: number, from: number): void {
  for (let spin = 0; spin < tri.SPINS; spin++) if (Atomics.load(control, slot) !== from) return;
  while (Atomics.load(control, slot) === from) Atomics.wait(control, slot, from);
}
