import { useEffect, useRef, useState } from 'react';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import {
  RecomputeClient,
  type RecomputeOutcome,
  type RecomputeState,
  type WorkerLike,
} from '../worker/recompute-client.js';

function createWorker(): WorkerLike {
  return new Worker(new URL('../worker/recompute.worker.ts', import.meta.url), {
    type: 'module',
    name: 'holdfast-recompute',
  }) as unknown as WorkerLike;
}

/** One recompute worker for the life of a component; outcomes reach the latest handler. */
export function useRecompute(onOutcome: (outcome: RecomputeOutcome) => void) {
  const handler = useRef(onOutcome);
  handler.current = onOutcome;
  const [state, setState] = useState<RecomputeState>({ busy: false });
  const client = useRef<RecomputeClient | null>(null);
  useEffect(() => {
    const c = new RecomputeClient({ createWorker, onOutcome: (o) => handler.current(o), onState: setState });
    client.current = c;
    return () => {
      c.dispose();
      client.current = null;
    };
  }, []);
  return {
    state,
    request: (scenario: Scenario, prices: PriceTable, immediate = false, fx?: PriceTable) =>
      client.current?.request(scenario, prices, immediate, fx),
    cancel: () => client.current?.cancel(),
  };
}
