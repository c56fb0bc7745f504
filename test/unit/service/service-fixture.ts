import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach } from 'vitest';
import type { ServiceReply } from '../../../shared-core/contract/define.js';
import { dispatch } from '../../../shared-core/contract/dispatch.js';
import { serviceApi, type ServiceApiTable } from '../../../shared-core/contract/service-api.js';
import type { ResponseOf } from '../../../shared-core/contract/define.js';
import { createService, type Service } from '../../../src-main/service/index.js';
import type { ServiceOptions } from '../../../src-main/service/options.js';
import { openStore, type Store } from '../../../src-main/store/store.js';
import { weekdays } from '../../support/calendar.js';

export { weekdays };

/**
 * A service over a fresh store in a temporary directory, called the way both transports call
 * it: through `dispatch`, with the request as plain JSON.
 */
export interface Harness {
  dir: string;
  store: Store;
  service: Service;
  /** The reply envelope, exactly as a transport would carry it. */
  reply(name: string, payload: unknown): Promise<ServiceReply>;
  /** The result of a call that must succeed (the error message otherwise). */
  call<K extends keyof ServiceApiTable>(name: K, payload: unknown): Promise<ResponseOf<ServiceApiTable, K>>;
}

export function useService(options: (dir: string) => ServiceOptions = () => ({})): () => Harness {
  const open: Harness[] = [];
  afterEach(() => {
    for (const h of open.splice(0)) {
      h.service.dispose();
      h.store.close();
      rmSync(h.dir, { recursive: true, force: true });
    }
  });
  return () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-service-'));
    const store = openStore(join(dir, 'store.sqlite'), { now: fixedClock() });
    const service = createService(store, options(dir));
    const reply = (name: string, payload: unknown) =>
      dispatch(serviceApi, service, name, JSON.parse(JSON.stringify(payload ?? {})));
    const h: Harness = {
      dir,
      store,
      service,
      reply,
      async call(name, payload) {
        const r = await reply(name, payload);
        if (!r.ok) throw new Error(`${name} failed: ${r.error.code}: ${r.error.message} (${r.error.where ?? ''})`);
        // Replies cross a process boundary as JSON: what survives that is what a caller sees.
        return JSON.parse(JSON.stringify(r.result));
      },
    };
    open.push(h);
    return h;
  };
}

/** A clock that moves one second per reading, so saved times are ordered and repeatable. */
export function fixedClock(start = Date.UTC(2026, 0, 5, 9, 0, 0)): () => Date {
  let t = start;
  return () => new Date((t += 1000));
}

/** Writes invented prices for assets straight into the store (one import batch). */
export function seedPrices(
  store: Store,
  universe: string,
  series: Record<
    string,
    { dates: string[]; closes?: number[]; currency?: string; fx?: { base: string; quote: string } }
  >,
): void {
  store.commitPrices({
    source: 'seed.csv',
    assets: Object.entries(series).map(([id, s]) => ({
      id,
      displayName: `Invented ${id}`,
      ...(s.currency ? { currency: s.currency } : {}),
      ...(s.fx ? { fx: s.fx } : {}),
    })),
    prices: Object.entries(series).map(([assetId, s]) => ({
      assetId,
      dates: s.dates,
      closes: s.closes ?? s.dates.map((_, i) => 100 * (1 + 0.001 * Math.sin(i))),
    })),
    universe: { name: universe },
  });
}
