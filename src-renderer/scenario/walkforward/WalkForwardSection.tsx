import { memo, useEffect, useRef, useState } from 'react';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import type { Scenario } from '../../../shared-core/scenario/schema.js';
import type { BacktestRun } from '../../../shared-core/walkforward/run-backtest.js';
import type { FromBacktest, ToBacktest } from '../../worker/backtest.worker.js';
import { describeField } from '../../../shared-core/present/field-words.js';
import { formatDuration } from '../format.js';
import { walkForwardInputsKey } from './kept-settings.js';
import { WalkForwardView } from './WalkForwardView.js';

/**
 * The walk-forward part of the reasons: run on request (it re-estimates and re-solves every
 * candidate at every rebalance), with a progress bar and cancel; its result belongs to the
 * inputs it ran on, so an edit marks it as out of date rather than hiding it. A finished run
 * calls `onRan`, for the page to keep its settings in the draft (and so in the memo).
 */
type State =
  | { kind: 'idle' }
  | { kind: 'running'; done: number; total: number; label: string }
  | { kind: 'done'; run: BacktestRun; ms: number; scenario: Scenario }
  | { kind: 'failed'; message: string };

export const WalkForwardSection = memo(function WalkForwardSection(props: {
  scenario: Scenario | null;
  prices: PriceTable | undefined;
  /** Exchange rates into the base currency for assets priced in another currency. */
  fx?: PriceTable;
  colourIndex: (id: string) => number;
  onRan?: () => void;
}) {
  const [state, setState] = useState<State>({ kind: 'idle' });
  const [shown, setShown] = useState<{ run: BacktestRun; ms: number; scenario: Scenario } | null>(null);
  const worker = useRef<Worker | null>(null);
  const nextId = useRef(1);
  useEffect(() => () => worker.current?.terminate(), []);
  const start = () => {
    const { scenario, prices, fx } = props;
    if (!scenario || !prices) return;
    worker.current?.terminate();
    const w = new Worker(new URL('../../worker/backtest.worker.ts', import.meta.url), {
      type: 'module',
      name: 'holdfast-backtest',
    });
    worker.current = w;
    const requestId = nextId.current++;
    setState({ kind: 'running', done: 0, total: 1, label: 'starting' });
    w.onmessage = (event: MessageEvent<FromBacktest>) => {
      const m = event.data;
      if (m.requestId !== requestId) return;
      if (m.type === 'progress')
        setState({ kind: 'running', done: m.done, total: m.total, label: `${m.phase} of ${m.candidateId}` });
      else if (m.type === 'done') {
        setState({ kind: 'done', run: m.run, ms: m.ms, scenario });
        setShown({ run: m.run, ms: m.ms, scenario });
        w.terminate();
        worker.current = null;
        props.onRan?.();
      } else {
        setState({ kind: 'failed', message: m.path ? describeField(m.path, m.message) : m.message });
        w.terminate();
        worker.current = null;
      }
    };
    w.onerror = (e) => setState({ kind: 'failed', message: `the walk-forward worker stopped: ${e.message}` });
    w.postMessage({ type: 'run', requestId, scenario, prices, ...(fx ? { fx } : {}) } satisfies ToBacktest);
  };
  const cancel = () => {
    worker.current?.terminate();
    worker.current = null;
    setState({ kind: 'idle' });
  };
  const outdated =
    shown !== null &&
    props.scenario !== null &&
    shown.scenario !== props.scenario &&
    walkForwardInputsKey(shown.scenario) !== walkForwardInputsKey(props.scenario);
  return (
    <section className="walkforward-section" aria-labelledby="walkforward-title">
      <h3 id="walkforward-title">Out of sample: walk-forward test and stress</h3>
      <div className="actions">
        <button type="button" onClick={start} disabled={!props.scenario || !props.prices || state.kind === 'running'}>
          {shown ? 'Run the walk-forward test again' : 'Run the walk-forward test'}
        </button>
        {state.kind === 'running' ? (
          <>
            <span
              className="progress"
              role="progressbar"
              aria-valuemin={0}
              aria-valuemax={state.total}
              aria-valuenow={state.done}
              aria-label="Walk-forward progress"
            >
              <span className="progress-track">
                <span
                  className="progress-fill"
                  style={{ width: `${(100 * state.done) / Math.max(1, state.total)}%` }}
                />
              </span>
              <span className="faint progress-label">
                {Math.round((100 * state.done) / Math.max(1, state.total))} % · {state.label}
              </span>
            </span>
            <button type="button" onClick={cancel}>
              Cancel
            </button>
          </>
        ) : null}
        {state.kind === 'done' ? <span className="faint">Finished in {formatDuration(state.ms)}.</span> : null}
      </div>
      {state.kind === 'failed' ? (
        <p className="note warning" role="alert">
          <span className="marker" aria-hidden="true">
            ◆
          </span>{' '}
          The walk-forward test did not run: {state.message}
        </p>
      ) : null}
      {outdated ? (
        <p className="note warning">
          <span className="marker" aria-hidden="true">
            ◆
          </span>{' '}
          These figures are for the inputs before your latest edits; run the test again to bring them up to date.
        </p>
      ) : null}
      {shown ? <WalkForwardView run={shown.run} colourIndex={props.colourIndex} /> : null}
    </section>
  );
});
