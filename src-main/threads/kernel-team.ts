import { availableParallelism } from 'node:os';
import { MessageChannel, Worker } from 'node:worker_threads';
import type { KernelJob, KernelTeam } from '../../shared-core/linalg/kernel-team.js';
import { sharedKernelMemory } from '../../shared-core/linalg/wasm/wasm-kernels.js';
import { CONTROL, INTS_MAX, KERNELS, SPIN } from './kernel-protocol.js';

/**
 * The longest the first job waits for the worker to load: 30-60 ms on a quiet machine, much more
 * under load (the tests run beside many others). A worker not ready by then is given up.
 */
const READY_WAIT_MS = 3000;

/**
 * The command line's kernel team (shared-core/linalg/kernel-team.ts): one worker thread that makes
 * the second share of the dense kernels while this thread makes the first. The two meet on a
 * control block of shared integers (Atomics): a job is a sequence number, its kernel and its
 * integers; the helper spins briefly, then sleeps, until the number moves, and posts the number
 * back when done. Arrays go over a message port only when a job's buffers change, read by the
 * helper without its event loop (receiveMessageOnPort), so a kernel that forks at every step of a
 * loop pays a few atomic writes a step, not a message.
 *
 * The worker starts at the first job (a kernel asks only when its work is large), or earlier when
 * a caller knows one is coming (`prepare`): a small problem never pays for a thread. That first
 * job waits for the worker to load its kernels (tens of milliseconds, against the hundreds the
 * first large kernel takes on one thread). The worker is unreferenced: it never keeps the process
 * alive.
 */
export function kernelTeamOfTwo(workerFile: URL = new URL('./kernel-worker.js', import.meta.url)): KernelTeam | null {
  if (availableParallelism() < 2) return null;
  const control = new Int32Array(new SharedArrayBuffer(CONTROL.size * 4));
  // The WebAssembly kernels' memory, which the worker's instance of them shares (wasm-kernels.ts).
  const memory = sharedKernelMemory();
  const { port1, port2 } = new MessageChannel();
  port1.unref();
  let started = false;
  const start = (): void => {
    started = true;
    try {
      const worker = new Worker(workerFile, {
        workerData: { control, port: port2, memory },
        transferList: [port2],
      });
      worker.unref();
      worker.on('error', () => Atomics.store(control, CONTROL.gone, 1));
      worker.on('exit', () => Atomics.store(control, CONTROL.gone, 1));
    } catch {
      Atomics.store(control, CONTROL.gone, 1);
    }
  };
  let sequence = 0;
  let bound: readonly Float64Array[] = [];
  let pending = false;
  return {
    shared: (length) => new Float64Array(new SharedArrayBuffer(length * 8)),
    memory,
    prepare(): void {
      if (!started) start();
    },
    fork(job: KernelJob): boolean {
      if (pending) throw new Error('kernel team: a job is already running');
      if (Atomics.load(control, CONTROL.gone) === 1) return false;
      if (!started) start();
      // The worker's 'error' event cannot run while this thread waits: a bounded wait instead,
      // after which a worker that has not loaded is given up, and every kernel stays here.
      if (Atomics.load(control, CONTROL.ready) !== 1) {
        Atomics.wait(control, CONTROL.ready, 0, READY_WAIT_MS);
        if (Atomics.load(control, CONTROL.ready) !== 1) Atomics.store(control, CONTROL.gone, 1);
      }
      if (Atomics.load(control, CONTROL.gone) === 1) return false;
      const kernel = KERNELS.indexOf(job.kernel);
      if (kernel < 0 || job.ints.length > INTS_MAX) throw new Error(`kernel team: no share named ${job.kernel}`);
      for (const b of job.buffers)
        if (!(b.buffer instanceof SharedArrayBuffer)) throw new Error('kernel team: a buffer is not shared');
      sequence++;
      const rebind = job.buffers.length !== bound.length || job.buffers.some((b, k) => b !== bound[k]);
      if (rebind) {
        bound = job.buffers;
        port1.postMessage({ sequence, buffers: job.buffers });
      }
      Atomics.store(control, CONTROL.bind, rebind ? sequence : 0);
      Atomics.store(control, CONTROL.kernel, kernel);
      job.ints.forEach((v, k) => Atomics.store(control, CONTROL.ints + k, v));
      Atomics.store(control, CONTROL.job, sequence);
      Atomics.notify(control, CONTROL.job);
      pending = true;
      return true;
    },
    join(): void {
      pending = false;
      for (let spin = 0; spin < SPIN && Atomics.load(control, CONTROL.done) !== sequence; spin++);
      while (Atomics.load(control, CONTROL.done) !== sequence) {
        if (Atomics.load(control, CONTROL.gone) === 1) throw new Error('kernel team: the helper thread stopped');
        Atomics.wait(control, CONTROL.done, Atomics.load(control, CONTROL.done), 100);
      }
      if (Atomics.load(control, CONTROL.failed) === sequence)
        throw new Error('kernel team: the helper thread could not make its share');
    },
  };
}
