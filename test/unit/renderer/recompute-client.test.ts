import { describe, expect, it } from 'vitest';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import type { Scenario } from '../../../shared-core/scenario/schema.js';
import type { Comparison } from '../../../src-renderer/worker/comparison.js';
import type { FromWorker, ToWorker } from '../../../src-renderer/worker/protocol.js';
import {
  RecomputeClient,
  type RecomputeOutcome,
  type RecomputeState,
  type WorkerLike,
} from '../../../src-renderer/worker/recompute-client.js';

class FakeWorker implements WorkerLike {
  onmessage: ((event: { data: FromWorker }) => void) | null = null;
  onerror: ((event: { message?: string }) => void) | null = null;
  sent: ToWorker[] = [];
  terminated = false;
  postMessage(message: ToWorker) {
    this.sent.push(message);
  }
  terminate() {
    this.terminated = true;
  }
  finish(requestId: number, name: string) {
    this.onmessage?.({
      data: { type: 'done', requestId, comparison: { computeMs: 1, name } as unknown as Comparison },
    });
  }
}

function harness(debounceMs = 60) {
  let clock = 0;
  const timers: { fn: () => void; at: number; id: number }[] = [];
  let nextTimer = 1;
  const workers: FakeWorker[] = [];
  const outcomes: RecomputeOutcome[] = [];
  const states: RecomputeState[] = [];
  const client = new RecomputeClient({
    createWorker: () => {
      const w = new FakeWorker();
      workers.push(w);
      return w;
    },
    onOutcome: (o) => outcomes.push(o),
    onState: (s) => states.push(s),
    debounceMs,
    supersedeAfterMs: 250,
    now: () => clock,
    setTimer: (fn, ms) => {
      const id = nextTimer++;
      timers.push({ fn, at: clock + ms, id });
      return id;
    },
    clearTimer: (h) => {
      const i = timers.findIndex((t) => t.id === h);
      if (i >= 0) timers.splice(i, 1);
    },
  });
  const advance = (ms: number) => {
    clock += ms;
    for (const t of timers.filter((t) => t.at <= clock)) {
      timers.splice(timers.indexOf(t), 1);
      t.fn();
    }
  };
  return { client, workers, outcomes, states, advance };
}

const scenario = (name: string) => ({ name }) as unknown as Scenario;
const prices = {} as PriceTable;

// The behaviour an editor with live recompute needs (common practice for debounced work).
describe('recompute client', () => {
  it('waits for a quiet moment: keystrokes within the debounce start one run, for the last edit', () => {
    const h = harness();
    h.client.request(scenario('1'), prices);
    h.advance(30);
    h.client.request(scenario('15'), prices);
    h.advance(59);
    expect(h.workers).toHaveLength(0);
    h.advance(1);
    expect(h.workers[0].sent.map((m) => (m.scenario as unknown as { name: string }).name)).toEqual(['15']);
    expect(h.states.at(-1)).toEqual({ busy: true, since: 90 });
    h.workers[0].finish(1, 'fifteen');
    expect(h.outcomes).toEqual([
      {
        kind: 'done',
        comparison: { computeMs: 1, name: 'fifteen' },
        scenario: { name: '15' },
        requestedAt: 30,
        startedAt: 90,
        finishedAt: 90,
      },
    ]);
    expect(h.states.at(-1)).toEqual({ busy: false });
  });

  it('without a debounce, starts an edit at once when idle and folds edits during a run into one', () => {
    const h = harness(0);
    h.client.request(scenario('1'), prices);
    expect(h.workers[0].sent.map((m) => (m.scenario as unknown as { name: string }).name)).toEqual(['1']);
    expect(h.states.at(-1)).toEqual({ busy: true, since: 0 });
    h.advance(20);
    h.client.request(scenario('15'), prices);
    h.advance(10);
    h.client.request(scenario('150'), prices);
    expect(h.workers[0].sent).toHaveLength(1);
    h.advance(20);
    h.workers[0].finish(1, 'one');
    // The run for '1' is stale: skip straight to the newest edit, never showing '1' or '15'.
    expect(h.outcomes).toEqual([]);
    expect(h.workers[0].sent.map((m) => (m.scenario as unknown as { name: string }).name)).toEqual(['1', '150']);
    h.workers[0].finish(2, 'one-fifty');
    expect(h.outcomes).toEqual([
      {
        kind: 'done',
        comparison: { computeMs: 1, name: 'one-fifty' },
        scenario: { name: '150' },
        requestedAt: 30,
        startedAt: 50,
        finishedAt: 50,
      },
    ]);
    expect(h.states.at(-1)).toEqual({ busy: false });
  });

  it('lets the newest edit win: a result for an edit already replaced is never shown', () => {
    const h = harness();
    h.client.request(scenario('a'), prices, true);
    h.client.request(scenario('b'), prices, true);
    h.client.request(scenario('c'), prices, true);
    const w = h.workers[0];
    expect(w.sent).toHaveLength(1);
    w.finish(1, 'a');
    expect(h.outcomes).toEqual([]);
    expect(w.sent.map((m) => (m.scenario as unknown as { name: string }).name)).toEqual(['a', 'c']);
    w.finish(2, 'c');
    expect(h.outcomes.map((o) => o.kind === 'done' && (o.comparison as unknown as { name: string }).name)).toEqual([
      'c',
    ]);
  });

  it('terminates a long run that a newer edit replaces, and starts the new one at once', () => {
    const h = harness();
    h.client.request(scenario('slow'), prices, true);
    h.advance(400);
    h.client.request(scenario('next'), prices, true);
    expect(h.workers[0].terminated).toBe(true);
    expect(h.workers[1].sent.map((m) => (m.scenario as unknown as { name: string }).name)).toEqual(['next']);
  });

  it('cancels by terminating the worker; a late reply from it is ignored', () => {
    const h = harness();
    h.client.request(scenario('a'), prices, true);
    h.client.cancel();
    expect(h.workers[0].terminated).toBe(true);
    expect(h.outcomes).toEqual([{ kind: 'cancelled' }]);
    expect(h.states.at(-1)).toEqual({ busy: false });
    h.workers[0].finish(1, 'late');
    expect(h.outcomes).toHaveLength(1);
    expect(h.client.busy).toBe(false);
  });

  it('passes a bad input on with its JSON path', () => {
    const h = harness();
    h.client.request(scenario('a'), prices, true);
    h.workers[0].onmessage?.({
      data: { type: 'failed', requestId: 1, message: 'no prices in the window', path: 'window.from', input: true },
    });
    expect(h.outcomes).toEqual([
      {
        kind: 'failed',
        message: 'no prices in the window',
        path: 'window.from',
        input: true,
        scenario: { name: 'a' },
        requestedAt: 0,
      },
    ]);
  });

  it('reports a crashed worker in words and starts a fresh one for the next edit', () => {
    const h = harness();
    h.client.request(scenario('a'), prices, true);
    h.workers[0].onerror?.({ message: 'out of memory' });
    expect(h.outcomes[0]).toMatchObject({ kind: 'failed', message: 'the recompute worker stopped: out of memory' });
    h.client.request(scenario('b'), prices, true);
    expect(h.workers).toHaveLength(2);
  });
});
