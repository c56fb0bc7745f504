import { InputError } from '../../shared-core/errors.js';
import { buildComparison, createComparisonCache } from './comparison.js';
import type { FromWorker, ToWorker } from './protocol.js';

/**
 * The recompute worker: runs the shared core on the page's scenario and prices, so a solve never
 * blocks typing. Cancelling is terminating this worker; the page starts a fresh one.
 */
const scope = self as unknown as {
  postMessage(message: FromWorker): void;
  onmessage: ((event: MessageEvent<ToWorker>) => void) | null;
};

// Returns, estimates and their views carry over between edits that leave their inputs alone.
const cache = createComparisonCache();

scope.onmessage = (event) => {
  const message = event.data;
  if (message.type !== 'run') return;
  try {
    const comparison = buildComparison(message.scenario, message.prices, message.fx, undefined, cache);
    scope.postMessage({ type: 'done', requestId: message.requestId, comparison });
  } catch (error) {
    if (error instanceof InputError)
      scope.postMessage({
        type: 'failed',
        requestId: message.requestId,
        message: error.message,
        path: error.location.path,
        input: true,
      });
    else
      scope.postMessage({
        type: 'failed',
        requestId: message.requestId,
        message: `the recompute stopped on an internal error: ${(error as Error).message ?? String(error)}`,
        input: false,
      });
  }
};

scope.postMessage({ type: 'ready' });
