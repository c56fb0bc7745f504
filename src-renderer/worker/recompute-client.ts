import type { PriceTable } from '../../shared-core/prices/price-table.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import type { Comparison } from './comparison.js';
import type { FromWorker, ToWorker } from './protocol.js';

/**
 * The page's side of the recompute worker: debounces edits, keeps one run in flight, lets the
 * newest edit win, and cancels by terminating the worker (a running solve cannot be interrupted
 * any other way) and starting a fresh one.
 */
export interface WorkerLike {
  postMessage(message: ToWorker): void;
  terminate(): void;
  onmessage: ((event: { data: FromWorker }) => void) | null;
  onerror: ((event: { message?: string }) => void) | null;
}

export type RecomputeOutcome =
  | {
      kind: 'done';
      comparison: Comparison;
      scenario: Scenario;
      requestedAt: number;
      /** When the run was posted to the worker (after the debounce and any queue). */
      startedAt: number;
      finishedAt: number;
    }
  | { kind: 'failed'; message: string; path?: string; input: boolean; scenario?: Scenario; requestedAt: number }
  | { kind: 'cancelled' };

export type RecomputeState = { busy: false } | { busy: true; since: number };

export interface RecomputeOptions {
  createWorker: () => WorkerLike;
  onOutcome: (outcome: RecomputeOutcome) => void;
  onState: (state: RecomputeState) => void;
  /** Quiet time after the last edit before a run starts; 0 starts it at once. */
  debounceMs?: number;
  /** A run older than this is terminated rather than waited for when a newer edit arrives. */
  supersedeAfterMs?: number;
  now?: () => number;
  setTimer?: (fn: () => void, ms: number) => unknown;
  clearTimer?: (handle: unknown) => void;
}

/**
 * No wait: an edit while the worker is idle starts its run at once, and edits that arrive while
 * a run is in flight fold into the one queued behind it (the newest wins), so typing faster than
 * a run still starts one run per run's length. A 40 ms debounce cost about 40 ms of the 200 ms
 * from keystroke to paint and a 16 ms one about 16 ms (bench first-screen), folding almost
 * nothing the queue does not fold already, since typing is slower than a frame.
 */
export const DEBOUNCE_MS = 0;
export const SUPERSEDE_AFTER_MS = 250;

interface Job {
  scenario: Scenario;
  prices: PriceTable;
  fx?: PriceTable;
  /** When the edit that asked for it happened. */
  requestedAt: number;
}

export class RecomputeClient {
  private worker: WorkerLike | null = null;
  private nextId = 1;
  private running: (Job & { id: number; startedAt: number }) | null = null;
  private queued: Job | null = null;
  private timer: unknown = null;
  private readonly o: Required<RecomputeOptions>;

  constructor(options: RecomputeOptions) {
    this.o = {
      debounceMs: DEBOUNCE_MS,
      supersedeAfterMs: SUPERSEDE_AFTER_MS,
      now: () => performance.now(),
      setTimer: (fn, ms) => setTimeout(fn, ms),
      clearTimer: (h) => clearTimeout(h as ReturnType<typeof setTimeout>),
      ...options,
    };
  }

  /** Asks for a run after the debounce; a later call before it starts replaces this one. */
  request(scenario: Scenario, prices: PriceTable, immediate = false, fx?: PriceTable): void {
    const job: Job = { scenario, prices, fx, requestedAt: this.o.now() };
    if (this.timer !== null) this.o.clearTimer(this.timer);
    this.timer = null;
    if (immediate || this.o.debounceMs <= 0) this.submit(job);
    else
      this.timer = this.o.setTimer(() => {
        this.timer = null;
        this.submit(job);
      }, this.o.debounceMs);
    this.o.onState({ busy: true, since: this.running?.startedAt ?? job.requestedAt });
  }

  /** Stops the run in flight and anything waiting; the last good result stays on the page. */
  cancel(): void {
    if (this.timer !== null) this.o.clearTimer(this.timer);
    this.timer = null;
    this.queued = null;
    const wasBusy = this.running !== null;
    this.killWorker();
    this.o.onState({ busy: false });
    if (wasBusy) this.o.onOutcome({ kind: 'cancelled' });
  }

  get busy(): boolean {
    return this.running !== null || this.timer !== null || this.queued !== null;
  }

  dispose(): void {
    if (this.timer !== null) this.o.clearTimer(this.timer);
    this.timer = null;
    this.queued = null;
    this.killWorker();
  }

  private submit(job: Job): void {
    if (this.running) {
      if (this.o.now() - this.running.startedAt > this.o.supersedeAfterMs) {
        // A long run for an edit nobody wants any more: drop it and start the new one now.
        this.killWorker();
      } else {
        this.queued = job;
        return;
      }
    }
    this.start(job);
  }

  private start(job: Job): void {
    const worker = this.ensureWorker();
    const id = this.nextId++;
    this.running = { ...job, id, startedAt: this.o.now() };
    this.o.onState({ busy: true, since: this.running.startedAt });
    worker.postMessage({ type: 'run', requestId: id, scenario: job.scenario, prices: job.prices, fx: job.fx });
  }

  private ensureWorker(): WorkerLike {
    if (this.worker) return this.worker;
    const worker = this.o.createWorker();
    worker.onmessage = (event) => this.receive(event.data);
    worker.onerror = (event) => {
      const running = this.running;
      this.killWorker();
      this.o.onState({ busy: false });
      this.o.onOutcome({
        kind: 'failed',
        message: `the recompute worker stopped: ${event.message ?? 'no reason given'}`,
        input: false,
        requestedAt: running?.requestedAt ?? this.o.now(),
      });
    };
    this.worker = worker;
    return worker;
  }

  private killWorker(): void {
    this.worker?.terminate();
    this.worker = null;
    this.running = null;
  }

  private receive(message: FromWorker): void {
    if (message.type === 'ready') return;
    const running = this.running;
    if (!running || message.requestId !== running.id) return;
    this.running = null;
    const queued = this.queued;
    this.queued = null;
    if (queued) {
      // A newer edit is waiting: this result is already stale, so skip straight to it.
      this.start(queued);
      return;
    }
    if (this.timer === null) this.o.onState({ busy: false });
    if (message.type === 'done')
      this.o.onOutcome({
        kind: 'done',
        comparison: message.comparison,
        scenario: running.scenario,
        requestedAt: running.requestedAt,
        startedAt: running.startedAt,
        finishedAt: this.o.now(),
      });
    else
      this.o.onOutcome({
        kind: 'failed',
        message: message.message,
        path: message.path,
        input: message.input,
        scenario: running.scenario,
        requestedAt: running.requestedAt,
      });
  }
}
