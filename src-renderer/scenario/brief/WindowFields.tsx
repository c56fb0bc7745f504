import { setField } from '../editor-state.js';
import type { BriefProps } from './brief-props.js';
import { DocNumberField, DocSelectField, DocTextField } from './doc-fields.js';

/** The estimation window (the last years of data, or between two dates) and the returns it takes. */
export function WindowFields({ state: s, commit }: Pick<BriefProps, 'state' | 'commit'>) {
  const w = s.doc.window ?? {};
  const byYears = w.years !== undefined || (w.from === undefined && w.to === undefined);
  return (
    <div className="window-fields">
      <div role="radiogroup" aria-label="Estimation window" className="inline-choice">
        <label>
          <input
            type="radio"
            name="window-mode"
            checked={byYears}
            onChange={() => commit(setField(s, ['window'], { years: w.years ?? 5, ...(w.to ? { to: w.to } : {}) }))}
          />{' '}
          Last years of data
        </label>
        <label>
          <input
            type="radio"
            name="window-mode"
            checked={!byYears}
            onChange={() => commit(setField(s, ['window'], { from: w.from ?? '', to: w.to }))}
          />{' '}
          Between dates
        </label>
      </div>
      <div className="field-row">
        {byYears ? (
          <DocNumberField label="Years" at={['window', 'years']} unit="years" />
        ) : (
          <DocTextField label="From" at={['window', 'from']} placeholder="YYYY-MM-DD" />
        )}
        <DocTextField
          label={byYears ? 'Ending' : 'To'}
          at={['window', 'to']}
          placeholder="latest"
          hint={byYears ? 'empty: up to the latest price' : undefined}
        />
      </div>
      <div className="field-row">
        <DocSelectField
          label="Return frequency"
          at={['returns', 'frequency']}
          fallback="daily"
          options={[
            { value: 'daily', label: 'daily' },
            { value: 'weekly', label: 'weekly' },
            { value: 'monthly', label: 'monthly' },
          ]}
        />
        <DocSelectField
          label="Return type"
          at={['returns', 'method']}
          fallback="log"
          options={[
            { value: 'log', label: 'log returns' },
            { value: 'simple', label: 'simple returns' },
          ]}
        />
      </div>
    </div>
  );
}
