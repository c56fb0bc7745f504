import { Fragment } from 'react';
import { messagesAt } from '../validate-draft.js';
import type { BriefProps, Bound } from './brief-props.js';
import { DocPercentField } from './doc-fields.js';
import { FieldNote, PercentField } from './fields.js';

/** The mandate's limits on the whole portfolio: long-only, the default bounds, turnover, exposure, illiquid assets. */
export function LimitsFields(
  props: Pick<BriefProps, 'state' | 'messages' | 'onTyping'> & {
    set: (path: (string | number)[], value: unknown) => void;
  },
) {
  const { state, messages, onTyping, set } = props;
  const c = state.doc.constraints ?? {};
  const longOnly = c.longOnly !== false;
  const def = (c.weightBounds?.default as Bound | undefined) ?? undefined;
  const at = (p: string) => messagesAt(messages, p);
  const setDefault = (lo: number | undefined, hi: number | undefined) => {
    // Both empty, or an empty cap over the long-only floor of 0: no default bound at all.
    if (hi === undefined && (lo === undefined || (longOnly && lo === 0)))
      set(['constraints', 'weightBounds', 'default'], undefined);
    else set(['constraints', 'weightBounds', 'default'], [lo ?? (longOnly ? 0 : -1), hi ?? 1]);
  };
  return (
    <fieldset className="sheet limits">
      <legend>Mandate limits</legend>
      <div className="limits-grid">
        <label className="check">
          <input
            type="checkbox"
            checked={longOnly}
            onChange={(e) => set(['constraints', 'longOnly'], e.target.checked ? true : false)}
          />{' '}
          Long-only (no short positions)
        </label>
        <div className="bound-pair">
          <span className="group-label">Every asset between</span>
          {([0, 1] as const).map((side) => (
            <Fragment key={side}>
              {side === 1 ? <span>and</span> : null}
              <PercentField
                compact
                label={side === 0 ? 'Default lower bound' : 'Default cap per asset'}
                path={`constraints.weightBounds.default.${side}`}
                value={def?.[side]}
                placeholder={longOnly ? (side === 0 ? '0' : '100') : 'none'}
                messages={[]}
                onTyping={onTyping}
                onChange={(v) => (side === 0 ? setDefault(v, def?.[1]) : setDefault(def?.[0], v))}
              />
            </Fragment>
          ))}
          <FieldNote id="default-bound-note" messages={at('constraints.weightBounds.default')} />
        </div>
        <DocPercentField
          label="Maximum turnover (sum of |w − current|)"
          at={['constraints', 'maxTurnover']}
          placeholder="no limit"
        />
        <DocPercentField
          label="Maximum gross exposure (sum of |w|)"
          at={['constraints', 'maxGrossExposure']}
          placeholder={longOnly ? '100' : 'none'}
          disabled={longOnly && c.maxGrossExposure === undefined}
          hint={longOnly ? 'applies to long-short mandates' : undefined}
        />
        <DocPercentField
          label="Cap on illiquid assets together"
          at={['constraints', 'illiquidMax']}
          placeholder="no limit"
        />
        <DocPercentField
          label="Minimum position size (each weight 0 or at least this)"
          at={['constraints', 'minPosition']}
          placeholder="none"
          disabled={!longOnly && c.minPosition === undefined}
          hint={longOnly ? 'found by a heuristic, not a proven optimum' : 'applies to long-only mandates'}
        />
      </div>
      <FieldNote
        id="limits-note"
        messages={at('constraints').filter(
          (m) =>
            !/^constraints\.(weightBounds|maxTurnover|maxGrossExposure|illiquidMax|minPosition|groups)/.test(m.path),
        )}
      />
    </fieldset>
  );
}
