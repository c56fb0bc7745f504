import { memo } from 'react';
import type { ScenarioInput } from '../../../shared-core/scenario/schema.js';
import { setField } from '../editor-state.js';
import { formatDate, formatPercent } from '../format.js';
import { weightsFromHoldings } from '../trade-list.js';
import { messagesAt, type FieldMessage } from '../validate-draft.js';
import type { BriefProps, Bound } from './brief-props.js';
import { FieldNote, PercentField } from './fields.js';
import { assetClassWords } from '../../../shared-core/scenario/asset-class.js';

/** The messages a row shows, as one string, so a row re-renders only when its own change. */
function messageKey(messages: readonly FieldMessage[], asset: string): string {
  return ['current', 'constraints.weightBounds', 'expectedReturns']
    .flatMap((p) => messagesAt(messages, `${p}.${asset}`).map((m) => `${m.path}\u0000${m.message}`))
    .join('\u0001');
}

/** A bound pair with one side typed: the other side from the default, else the long-only or open end. */
function boundPair(lo: number | undefined, hi: number | undefined, def: Bound | undefined, longOnly: boolean): Bound {
  return [lo ?? def?.[0] ?? (longOnly ? 0 : -1), hi ?? def?.[1] ?? 1];
}

const AssetRow = memo(
  function AssetRow(props: {
    asset: string;
    name: string;
    assetClass: string;
    liquidity: string;
    current: number | undefined;
    lower: number | undefined;
    upper: number | undefined;
    defaultLower: number | undefined;
    defaultUpper: number | undefined;
    longOnly: boolean;
    /** undefined: no column; null: empty. */
    expectedReturn: number | null | undefined;
    problems: string;
    messages: readonly FieldMessage[];
    update: BriefProps['update'];
    onTyping: BriefProps['onTyping'];
  }) {
    const { asset: a, update, onTyping, messages } = props;
    const setBound = (side: 0 | 1, v: number | undefined) =>
      update((s) => {
        const bounds = s.doc.constraints?.weightBounds ?? {};
        const own = bounds[a] as Bound | undefined;
        const lo = side === 0 ? v : own?.[0];
        const hi = side === 1 ? v : own?.[1];
        const longOnly = s.doc.constraints?.longOnly !== false;
        const value =
          lo === undefined && hi === undefined
            ? undefined
            : boundPair(lo, hi, bounds.default as Bound | undefined, longOnly);
        return setField(s, ['constraints', 'weightBounds', a], value);
      }, `constraints.weightBounds.${a}.${side}`);
    return (
      <tr>
        <th scope="row">
          <span className="code">{a}</span> <span className="faint">{props.name}</span>
        </th>
        <td>{assetClassWords(props.assetClass)}</td>
        <td>{props.liquidity}</td>
        <td className="num">
          <PercentField
            compact
            label={`Current weight of ${a}`}
            path={`current.${a}`}
            value={props.current}
            decimals={1}
            placeholder="0"
            messages={messagesAt(messages, `current.${a}`)}
            onTyping={onTyping}
            onChange={(v) => update((s) => setField(s, ['current', a], v), `current.${a}`)}
          />
        </td>
        <td className="num">
          <PercentField
            compact
            label={`Lower bound of ${a}`}
            path={`constraints.weightBounds.${a}.0`}
            value={props.lower}
            placeholder={
              props.defaultLower !== undefined ? String(props.defaultLower * 100) : props.longOnly ? '0' : ''
            }
            messages={[]}
            onTyping={onTyping}
            onChange={(v) => setBound(0, v)}
          />
        </td>
        <td className="num">
          <PercentField
            compact
            label={`Upper bound of ${a}`}
            path={`constraints.weightBounds.${a}.1`}
            value={props.upper}
            placeholder={props.defaultUpper !== undefined ? String(Math.round(props.defaultUpper * 1e4) / 100) : '100'}
            messages={messagesAt(messages, `constraints.weightBounds.${a}`)}
            onTyping={onTyping}
            onChange={(v) => setBound(1, v)}
          />
        </td>
        {props.expectedReturn !== undefined ? (
          <td className="num">
            <PercentField
              compact
              label={`Expected return of ${a}`}
              path={`expectedReturns.${a}`}
              value={props.expectedReturn ?? undefined}
              messages={messagesAt(messages, `expectedReturns.${a}`)}
              onTyping={onTyping}
              onChange={(v) => update((s) => setField(s, ['expectedReturns', a], v), `expectedReturns.${a}`)}
            />
          </td>
        ) : null}
      </tr>
    );
  },
  // The messages list changes on every keystroke; the row's own share of it is `problems`.
  (a, b) => (Object.keys(a) as (keyof typeof a)[]).every((k) => k === 'messages' || Object.is(a[k], b[k])),
);

/** One row per asset: its tags, current weight, own bounds and (where needed) expected return. */
export function AssetTable(props: BriefProps) {
  const { state, commit, messages, onTyping, catalogue, holdings, locale } = props;
  const doc: ScenarioInput = state.doc;
  const assets = doc.assets ?? [];
  const names = new Map(catalogue.map((a) => [a.id, a]));
  const bounds = doc.constraints?.weightBounds ?? {};
  const def = bounds.default as Bound | undefined;
  const longOnly = doc.constraints?.longOnly !== false;
  const needsReturns = (doc.candidates ?? []).some((c) => c.objective?.method === 'max-sharpe');
  const currentSum = assets.reduce((s, a) => s + (doc.current?.[a] ?? 0), 0);
  const fromHoldings = holdings ? weightsFromHoldings(holdings) : null;
  return (
    <fieldset className="sheet asset-table">
      <legend>Per asset: current weight, own bounds{needsReturns ? ', expected return' : ''}</legend>
      <div className="actions">
        {fromHoldings?.ok ? (
          <button
            type="button"
            onClick={() => {
              const w: Record<string, number> = {};
              for (const [a, v] of Object.entries(fromHoldings.weights)) w[a] = Math.round(v * 1e6) / 1e6;
              commit(setField(state, ['current'], w), 'current');
            }}
          >
            Take current weights from the holdings{holdings?.asOf ? ` of ${formatDate(holdings.asOf, locale)}` : ''}
          </button>
        ) : (
          <span className="faint">
            {fromHoldings ? `Holdings cannot be used: ${fromHoldings.reason}.` : 'No holdings on file.'}
          </span>
        )}
        <span className="faint">
          Current weights add to {formatPercent(currentSum, locale)}
          {doc.current && Object.keys(doc.current).some((a) => !assets.includes(a))
            ? '; some current holdings are outside the chosen assets (they count fully as turnover)'
            : ''}
          . Turnover is measured against them.
        </span>
      </div>
      <FieldNote id="current-note" messages={messagesAt(messages, 'current')} />
      {needsReturns ? <FieldNote id="returns-note" messages={messagesAt(messages, 'expectedReturns')} /> : null}
      <div className="table-scroll">
        <table className="grid compact-table">
          <thead>
            <tr>
              <th scope="col">Asset</th>
              <th scope="col">Class</th>
              <th scope="col">Liquidity</th>
              <th scope="col" className="num">
                Current
              </th>
              <th scope="col" className="num">
                Lower bound
              </th>
              <th scope="col" className="num">
                Upper bound
              </th>
              {needsReturns ? (
                <th scope="col" className="num">
                  Expected return
                </th>
              ) : null}
            </tr>
          </thead>
          <tbody>
            {assets.map((a) => (
              <AssetRow
                key={a}
                asset={a}
                name={names.get(a)?.name ?? doc.assetInfo?.[a]?.name ?? ''}
                assetClass={doc.assetInfo?.[a]?.assetClass ?? names.get(a)?.assetClass ?? ''}
                liquidity={doc.assetInfo?.[a]?.liquidity ?? names.get(a)?.liquidity ?? ''}
                current={doc.current?.[a]}
                lower={(bounds[a] as Bound | undefined)?.[0]}
                upper={(bounds[a] as Bound | undefined)?.[1]}
                defaultLower={def?.[0]}
                defaultUpper={def?.[1]}
                longOnly={longOnly}
                expectedReturn={needsReturns ? (doc.expectedReturns?.[a] ?? null) : undefined}
                problems={messageKey(messages, a)}
                messages={messages}
                update={props.update}
                onTyping={onTyping}
              />
            ))}
          </tbody>
        </table>
      </div>
    </fieldset>
  );
}
