import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';

/**
 * The one helper thread a process runs its two-thread kernels on (compute-thread.ts), started on
 * first use or ahead of it (`start`), never keeping the process alive. Where the compiled script
 * is absent (sources run by a test runner) there is no thread and every kernel runs on the calling
 * thread alone.
 */
export interface SecondThread {
  /** The thread, started now if it was not. */
  worker(): Worker | undefined;
  /**
   * Starts the thread without waiting for it: a command that will need it calls this first, so
   * the 30-60 ms the thread takes to boot overlap reading the input.
   */
  start(): void;
  /**
   * True once the thread has loaded its kernels and can take a job at once. Read from shared
   * memory, so it is current even while the calling thread has not returned to its event loop.
   */
  ready(): boolean;
}

/** What compute-thread.ts receives as workerData. */
export interface SecondThreadData {
  /** Int32 slot 0 is set to 1 when the thread is ready. */
  ready: SharedArrayBuffer;
}

export function createSecondThread(script: URL = new URL('./compute-thread.js', import.meta.url)): SecondThread {
  let worker: Worker | undefined;
  let ready: Int32Array | undefined;
  const thread: SecondThread = {
    worker() {
      if (!worker) {
        if (!existsSync(fileURLToPath(script))) return undefined;
        ready = new Int32Array(new SharedArrayBuffer(4));
        worker = new Worker(script, {
          workerData: { ready: ready.buffer as SharedArrayBuffer } satisfies SecondThreadData,
        });
        worker.unref();
        worker.on('error', () => {
          worker = undefined;
          ready = undefined;
        });
      }
      return worker;
    },
    start() {
      thread.worker();
    },
    ready() {
      return ready !== undefined && Atomics.load(ready, 0) === 1;
    },
  };
  return thread;
}

/** The command line's. */
export const processSecondThread = createSecondThread();
