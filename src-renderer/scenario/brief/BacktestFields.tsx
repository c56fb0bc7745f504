import { setField } from '../editor-state.js';
import { messagesAt } from '../validate-draft.js';
import type { BriefProps } from './brief-props.js';
import { DocNumberField, DocPercentField, DocSelectField } from './doc-fields.js';
import { SelectField } from './fields.js';

/** Settings of the walk-forward test (`backtest` in the scenario file), with the schema's defaults shown. */
export function BacktestFields({ state, commit, messages }: Pick<BriefProps, 'state' | 'commit' | 'messages'>) {
  const b = state.doc.backtest ?? {};
  return (
    <fieldset className="sheet backtest-fields">
      <legend>Walk-forward test (out of sample)</legend>
      <div className="field-row">
        <DocNumberField
          label="Estimation window"
          unit="return periods"
          at={['backtest', 'estimationWindow']}
          placeholder="from the history"
          hint="empty: 36 monthly, 104 weekly or 252 daily returns, never more than half the history"
        />
        <SelectField
          label="Window"
          path="backtest.expanding"
          value={b.expanding ? 'expanding' : 'trailing'}
          options={[
            { value: 'trailing', label: 'trailing, fixed length' },
            { value: 'expanding', label: 'expanding from the start' },
          ]}
          messages={messagesAt(messages, 'backtest.expanding')}
          onChange={(v) =>
            commit(
              setField(state, ['backtest', 'expanding'], v === 'expanding' ? true : undefined),
              'backtest.expanding',
            )
          }
        />
        <DocSelectField
          label="Rebalance"
          at={['backtest', 'rebalance']}
          fallback="monthly"
          options={[
            { value: 'monthly', label: 'monthly' },
            { value: 'quarterly', label: 'quarterly' },
            { value: 'yearly', label: 'yearly' },
            { value: 'drift', label: 'when a weight drifts out of its band' },
          ]}
        />
        {b.rebalance === 'drift' ? (
          <DocPercentField label="Drift band" at={['backtest', 'driftBand']} placeholder="5" />
        ) : null}
        <DocNumberField label="Costs" unit="bp of traded value" at={['backtest', 'costBps']} placeholder="10" />
        <DocPercentField label="Cash rate for the Sharpe ratio" at={['backtest', 'cashRate']} placeholder="0" />
      </div>
    </fieldset>
  );
}
