import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';

/**
 * The one helper thread a process runs its two-thread kernels on (compute-thread.ts), started on
 * first use and never keeping the process alive. Where the compiled script is absent (sources run
 * by a test runner) there is no thread and every kernel runs on the calling thread alone.
 */
export interface SecondThread {
  worker(): Worker | undefined;
}

export function createSecondThread(script: URL = new URL('./compute-thread.js', import.meta.url)): SecondThread {
  let worker: Worker | undefined;
  return {
    worker() {
      if (!worker) {
        if (!existsSync(fileURLToPath(script))) return undefined;
        worker = new Worker(script);
        worker.unref();
        worker.on('error', () => (worker = undefined));
      }
      return worker;
    },
  };
}

/** The command line's. */
export const processSecondThread = createSecondThread();
