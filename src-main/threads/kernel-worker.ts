import { receiveMessageOnPort, workerData, type MessagePort } from 'node:worker_threads';
import { bindHelperKernels, type KernelMemory } from '../../shared-core/linalg/wasm/wasm-kernels.js';
import { CONTROL, KERNELS, SHARES, SPIN } from './kernel-protocol.js';

/**
 * The kernel helper thread (kernel-team.ts): waits for a job on the control block, makes its
 * share, posts the job's number back. It never returns to its event loop, so buffers arrive by
 * reading the port directly.
 */
const { control, port, memory } = workerData as { control: Int32Array; port: MessagePort; memory: KernelMemory | null };
// The WebAssembly kernels' shares run on the team's memory; a share of one is asked for only when
// the caller's kernels run on that memory too.
if (memory) bindHelperKernels(memory);
const shares = KERNELS.map((name) => SHARES[name]);
const ints: number[] = new Array<number>(CONTROL.size - CONTROL.ints).fill(0);
let buffers: readonly Float64Array[] = [];
let seen = 0;
Atomics.store(control, CONTROL.ready, 1);
Atomics.notify(control, CONTROL.ready);
for (;;) {
  let job = Atomics.load(control, CONTROL.job);
  for (let spin = 0; spin < SPIN && job === seen; spin++) job = Atomics.load(control, CONTROL.job);
  while (job === seen) {
    Atomics.wait(control, CONTROL.job, seen);
    job = Atomics.load(control, CONTROL.job);
  }
  seen = job;
  try {
    if (Atomics.load(control, CONTROL.bind) === job) {
      let message = receiveMessageOnPort(port);
      while (!message || (message.message as { sequence: number }).sequence !== job)
        message = receiveMessageOnPort(port);
      buffers = (message.message as { buffers: Float64Array[] }).buffers;
    }
    for (let k = 0; k < ints.length; k++) ints[k] = Atomics.load(control, CONTROL.ints + k);
    shares[Atomics.load(control, CONTROL.kernel)](buffers, ints);
  } catch {
    Atomics.store(control, CONTROL.failed, job);
  }
  Atomics.store(control, CONTROL.done, job);
  Atomics.notify(control, CONTROL.done);
}
