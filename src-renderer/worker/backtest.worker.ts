import { InputError } from '../../shared-core/errors.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import { estimateAndSolve } from '../../shared-core/walkforward/estimate-and-solve.js';
import { runBacktest, type BacktestPhase, type BacktestRun } from '../../shared-core/walkforward/run-backtest.js';

/**
 * The walk-forward worker: the shared core's backtest of every candidate, with progress after
 * each step. It is long work, so it runs on request, not on every edit; cancelling terminates it.
 */
export type ToBacktest = { type: 'run'; requestId: number; scenario: Scenario; prices: PriceTable; fx?: PriceTable };
export type FromBacktest =
  | { type: 'progress'; requestId: number; phase: BacktestPhase; candidateId: string; done: number; total: number }
  | { type: 'done'; requestId: number; run: BacktestRun; ms: number }
  | { type: 'failed'; requestId: number; message: string; path?: string };

const scope = self as unknown as {
  postMessage(message: FromBacktest): void;
  onmessage: ((event: MessageEvent<ToBacktest>) => void) | null;
};

scope.onmessage = (event) => {
  const { requestId, scenario, prices, fx } = event.data;
  const t0 = performance.now();
  let last = 0;
  runBacktest(scenario, prices, {
    estimateAndSolve,
    ...(fx ? { fx } : {}),
    pause: () => new Promise((resolve) => setTimeout(resolve, 0)),
    onProgress: (phase, candidateId, done, total) => {
      const now = performance.now();
      if (now - last < 80 && done < total) return;
      last = now;
      scope.postMessage({ type: 'progress', requestId, phase, candidateId, done, total });
    },
  }).then(
    (run) => scope.postMessage({ type: 'done', requestId, run, ms: performance.now() - t0 }),
    (error: unknown) =>
      scope.postMessage({
        type: 'failed',
        requestId,
        message: error instanceof Error ? error.message : String(error),
        path: error instanceof InputError ? error.location.path : undefined,
      }),
  );
};
