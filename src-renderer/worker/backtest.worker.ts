import { InputError } from '../../shared-core/errors.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { notWalkedWords, walkForwardScenario } from '../../shared-core/run/walk-forward.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import type { BacktestPhase, BacktestRun } from '../../shared-core/walkforward/run-backtest.js';

/**
 * The walk-forward worker: shared-core's walk-forward of a scenario (the same function as
 * `holdfast backtest` and the memo), with progress after each step. It is long work, so it runs
 * on request, not on every edit; cancelling terminates it.
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
  walkForwardScenario(scenario, prices, {
    ...(fx ? { fx } : {}),
    pause: () => new Promise((resolve) => setTimeout(resolve, 0)),
    onProgress: (phase, candidateId, done, total) => {
      const now = performance.now();
      if (now - last < 80 && done < total) return;
      last = now;
      scope.postMessage({ type: 'progress', requestId, phase, candidateId, done, total });
    },
  }).then(
    (outcome) =>
      scope.postMessage(
        outcome.status === 'done'
          ? { type: 'done', requestId, run: outcome.run, ms: performance.now() - t0 }
          : { type: 'failed', requestId, message: notWalkedWords(outcome.candidates) },
      ),
    (error: unknown) =>
      scope.postMessage({
        type: 'failed',
        requestId,
        message: error instanceof Error ? error.message : String(error),
        path: error instanceof InputError ? error.location.path : undefined,
      }),
  );
};
