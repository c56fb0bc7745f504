import { memo, useMemo, useState } from 'react';
import type { Asset, Holdings } from '../../../shared-core/contract/service-api.js';
import {
  estimatorDefinition,
  estimatorDefinitions,
  type EstimatorSpec,
} from '../../../shared-core/methods/estimator-registry.js';
import { shrinkageTargets } from '../../../shared-core/methods/estimators/ledoit-wolf.js';
import {
  objectiveDefinition,
  objectiveDefinitions,
  type ObjectiveSpec,
} from '../../../shared-core/methods/objective-registry.js';
import type { ScenarioInput } from '../../../shared-core/scenario/schema.js';
import { describeEstimator, describeObjective, findCandidate } from '../candidate-grid.js';
import {
  addEstimator,
  addObjective,
  removeEstimator,
  removeObjective,
  setAssets,
  setCell,
  setField,
  updateEstimator,
  updateObjective,
  type EditorState,
} from '../editor-state.js';
import { formatDate, formatPercent } from '../format.js';
import { weightsFromHoldings } from '../trade-list.js';
import { messagesAt, type FieldMessage } from '../validate-draft.js';
import { FieldNote, NumberField, PercentField, SelectField, TextField } from './fields.js';

/**
 * The first part of the page: what the advisor is asking. Assets, the estimation window, the
 * risk estimates and objectives whose grid forms the candidates, the mandate's limits, the
 * current holdings and, where an objective needs them, expected returns.
 */
export interface BriefProps {
  state: EditorState;
  commit: (next: EditorState, key?: string) => void;
  /** An edit applied to the latest state: stable, so memoised rows need not re-render. */
  update: (edit: (state: EditorState) => EditorState, key?: string) => void;
  messages: readonly FieldMessage[];
  onTyping: (path: string, message: string | null) => void;
  catalogue: readonly Asset[];
  holdings: Holdings | null;
  locale?: string;
}

type Bound = [number, number];

export const BriefSection = memo(function BriefSection(props: BriefProps) {
  const { state, commit, messages } = props;
  const doc = state.doc;
  const at = (path: string) => messagesAt(messages, path);
  const set = (path: (string | number)[], value: unknown) => commit(setField(state, path, value), path.join('.'));
  return (
    <section className="section brief" aria-labelledby="brief-title">
      <div className="section-head">
        <h2 id="brief-title">1. The brief</h2>
        <span className="faint">What the candidates must answer: every field is checked as you type.</span>
      </div>
      <div className="brief-grid">
        <fieldset className="sheet">
          <legend>Scenario</legend>
          <TextField
            label="Name"
            path="name"
            value={doc.name}
            messages={at('name')}
            onChange={(v) => set(['name'], v ?? '')}
          />
          <WindowFields {...props} />
        </fieldset>
        <AssetChooser {...props} />
      </div>
      <EstimatesAndObjectives {...props} />
      <LimitsFields {...props} set={set} />
      <AssetTable {...props} />
      <GroupBands {...props} />
      <BacktestFields {...props} />
      {at('(document)').length > 0 ? <FieldNote id="doc-messages" messages={at('(document)')} /> : null}
    </section>
  );
});

function WindowFields({ state: s, commit, messages, onTyping }: BriefProps) {
  const at = (path: string) => messagesAt(messages, path);
  const set = (path: (string | number)[], value: unknown) => commit(setField(s, path, value), path.join('.'));
  const w = s.doc.window ?? {};
  const byYears = w.years !== undefined || (w.from === undefined && w.to === undefined);
  const returns = s.doc.returns ?? {};
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
          <NumberField
            label="Years"
            path="window.years"
            value={w.years}
            unit="years"
            messages={at('window.years')}
            onTyping={onTyping}
            onChange={(v) => set(['window', 'years'], v)}
          />
        ) : (
          <TextField
            label="From"
            path="window.from"
            placeholder="YYYY-MM-DD"
            value={w.from}
            messages={at('window.from')}
            onChange={(v) => set(['window', 'from'], v)}
          />
        )}
        <TextField
          label={byYears ? 'Ending' : 'To'}
          path="window.to"
          placeholder="latest"
          value={w.to}
          messages={at('window.to')}
          hint={byYears ? 'empty: up to the latest price' : undefined}
          onChange={(v) => set(['window', 'to'], v)}
        />
      </div>
      <div className="field-row">
        <SelectField
          label="Return frequency"
          path="returns.frequency"
          value={returns.frequency ?? 'daily'}
          options={[
            { value: 'daily', label: 'daily' },
            { value: 'weekly', label: 'weekly' },
            { value: 'monthly', label: 'monthly' },
          ]}
          messages={at('returns.frequency')}
          onChange={(v) => set(['returns', 'frequency'], v)}
        />
        <SelectField
          label="Return type"
          path="returns.method"
          value={returns.method ?? 'log'}
          options={[
            { value: 'log', label: 'log returns' },
            { value: 'simple', label: 'simple returns' },
          ]}
          messages={at('returns.method')}
          onChange={(v) => set(['returns', 'method'], v)}
        />
      </div>
    </div>
  );
}

function AssetChooser({ state, commit, catalogue, messages }: BriefProps) {
  const chosen = new Set(state.doc.assets ?? catalogue.filter((a) => !a.fx).map((a) => a.id));
  const byClass = useMemo(() => {
    const map = new Map<string, Asset[]>();
    for (const a of catalogue) {
      if (a.fx) continue;
      const key = a.assetClass || 'not tagged';
      map.set(key, [...(map.get(key) ?? []), a]);
    }
    return [...map.entries()];
  }, [catalogue]);
  const toggle = (ids: string[], on: boolean) => {
    const next = catalogue.filter((a) => (ids.includes(a.id) ? on : chosen.has(a.id))).map((a) => a.id);
    commit(setAssets(state, next, catalogue), 'assets');
  };
  const problems = messagesAt(messages, 'assets');
  return (
    <fieldset className="sheet asset-chooser">
      <legend>
        Assets <span className="faint">({chosen.size} chosen)</span>
      </legend>
      <FieldNote id="assets-note" messages={problems} />
      <div className="asset-classes">
        {byClass.map(([cls, assets]) => {
          const all = assets.every((a) => chosen.has(a.id));
          return (
            <div key={cls} className="asset-class">
              <label className="class-label">
                <input
                  type="checkbox"
                  checked={all}
                  onChange={(e) =>
                    toggle(
                      assets.map((a) => a.id),
                      e.target.checked,
                    )
                  }
                />{' '}
                {cls}
              </label>
              <ul className="plain-list">
                {assets.map((a) => (
                  <li key={a.id}>
                    <label title={a.name}>
                      <input
                        type="checkbox"
                        checked={chosen.has(a.id)}
                        data-asset={a.id}
                        onChange={(e) => toggle([a.id], e.target.checked)}
                      />{' '}
                      <span className="code">{a.id}</span>
                      {a.liquidity === 'illiquid' ? <span className="tag">illiquid</span> : null}
                    </label>
                  </li>
                ))}
              </ul>
            </div>
          );
        })}
      </div>
    </fieldset>
  );
}

function EstimatorOptions({
  spec,
  index,
  state,
  commit,
  messages,
  onTyping,
}: BriefProps & { spec: EstimatorSpec; index: number }) {
  const path = `estimators[${index}]`;
  if (spec.method === 'ewma') {
    const byHalfLife = spec.halfLife !== undefined;
    return (
      <span className="estimator-options">
        <SelectField
          compact
          label="Decay given as"
          path={`${path}.decay`}
          value={byHalfLife ? 'halfLife' : 'lambda'}
          options={[
            { value: 'lambda', label: 'lambda' },
            { value: 'halfLife', label: 'half-life' },
          ]}
          messages={[]}
          onChange={(v) =>
            commit(
              updateEstimator(
                state,
                index,
                v === 'halfLife' ? { method: 'ewma', halfLife: 60 } : { method: 'ewma', lambda: 0.97 },
              ),
            )
          }
        />
        {byHalfLife ? (
          <NumberField
            compact
            label="Half-life in periods"
            path={`${path}.halfLife`}
            value={spec.halfLife}
            unit="periods"
            messages={messages}
            onTyping={onTyping}
            onChange={(v) => commit(updateEstimator(state, index, { method: 'ewma', halfLife: v }), `${path}.halfLife`)}
          />
        ) : (
          <NumberField
            compact
            label="Lambda"
            path={`${path}.lambda`}
            value={spec.lambda}
            messages={messages}
            onTyping={onTyping}
            onChange={(v) => commit(updateEstimator(state, index, { method: 'ewma', lambda: v }), `${path}.lambda`)}
          />
        )}
      </span>
    );
  }
  if (spec.method === 'ledoit-wolf')
    return (
      <SelectField
        compact
        label="Shrinkage target"
        path={`${path}.target`}
        value={spec.target ?? 'scaled-identity'}
        options={shrinkageTargets.map((t) => ({ value: t, label: `${t} target` }))}
        messages={messages}
        onChange={(v) =>
          commit(
            updateEstimator(
              state,
              index,
              v === 'scaled-identity' ? { method: 'ledoit-wolf' } : { method: 'ledoit-wolf', target: v },
            ),
          )
        }
      />
    );
  return null;
}

/** The estimator object the editor starts from when a method is picked (its definition's). */
const defaultEstimator = (method: EstimatorSpec['method']): EstimatorSpec => estimatorDefinition(method).initial;

function EstimatesAndObjectives(props: BriefProps) {
  const { state, commit, messages } = props;
  const [newEstimator, setNewEstimator] = useState<EstimatorSpec['method']>('oas');
  const [newObjective, setNewObjective] = useState<ObjectiveSpec['method']>('equal-risk-contribution');
  const { estimators, objectives } = state.grid;
  const candidates = state.doc.candidates ?? [];
  // Messages about a candidate's estimator or objective, shown on its row or column.
  const estimatorMessages = (spec: EstimatorSpec) =>
    candidates.flatMap((c, i) => (c.estimator === spec ? messagesAt(messages, `candidates[${i}].estimator`) : []));
  const objectiveMessages = (spec: ObjectiveSpec) =>
    candidates.flatMap((c, i) => (c.objective === spec ? messagesAt(messages, `candidates[${i}].objective`) : []));
  return (
    <fieldset className="sheet candidate-grid">
      <legend>
        Candidates: risk estimates × objectives <span className="faint">({candidates.length} ticked)</span>
      </legend>
      <FieldNote
        id="candidates-note"
        messages={messagesAt(messages, 'candidates').filter(
          (m) => !/candidates\[\d+\]\.(estimator|objective)/.test(m.path),
        )}
      />
      <div className="table-scroll">
        <table className="grid">
          <thead>
            <tr>
              <th scope="col">Risk estimate</th>
              {objectives.map((o, j) => (
                <th key={j} scope="col" className="objective-head">
                  <span className="objective-name">{describeObjective(o)}</span>
                  <span className="head-controls">
                    <SelectField
                      compact
                      label={`Objective ${j + 1}`}
                      path={`objectives[${j}]`}
                      value={o.method}
                      options={objectiveDefinitions.map((d) => ({ value: d.method, label: d.label }))}
                      messages={objectiveMessages(o)}
                      onChange={(m) => commit(updateObjective(state, j, objectiveDefinition(m).initial))}
                    />
                    <button type="button" className="quiet" onClick={() => commit(removeObjective(state, j))}>
                      Remove<span className="visually-hidden"> {describeObjective(o)}</span>
                    </button>
                  </span>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {estimators.map((e, i) => (
              <tr key={i}>
                <th scope="row">
                  <span className="estimator-row">
                    <SelectField
                      compact
                      label={`Risk estimate ${i + 1}`}
                      path={`estimators[${i}]`}
                      value={e.method}
                      options={estimatorDefinitions.map((d) => ({ value: d.method, label: d.label }))}
                      messages={[]}
                      onChange={(m) => commit(updateEstimator(state, i, defaultEstimator(m)))}
                    />
                    <EstimatorOptions {...props} spec={e} index={i} messages={estimatorMessages(e)} />
                    <button type="button" className="quiet" onClick={() => commit(removeEstimator(state, i))}>
                      Remove<span className="visually-hidden"> {describeEstimator(e)}</span>
                    </button>
                  </span>
                </th>
                {objectives.map((o, j) => {
                  const c = findCandidate(candidates, e, o);
                  return (
                    <td key={j} className="cell-tick">
                      <label>
                        <input
                          type="checkbox"
                          checked={c !== undefined}
                          onChange={(ev) => commit(setCell(state, e, o, ev.target.checked))}
                          aria-label={`${describeObjective(o)} with ${describeEstimator(e)}`}
                        />{' '}
                        <span className="code">{c?.id ?? 'off'}</span>
                      </label>
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="actions add-row">
        <label>
          <span className="visually-hidden">Risk estimate to add</span>
          <select value={newEstimator} onChange={(e) => setNewEstimator(e.target.value as EstimatorSpec['method'])}>
            {estimatorDefinitions.map((d) => (
              <option key={d.method} value={d.method}>
                {d.label}
              </option>
            ))}
          </select>
        </label>
        <button type="button" onClick={() => commit(addEstimator(state, defaultEstimator(newEstimator)))}>
          Add risk estimate
        </button>
        <label>
          <span className="visually-hidden">Objective to add</span>
          <select value={newObjective} onChange={(e) => setNewObjective(e.target.value as ObjectiveSpec['method'])}>
            {objectiveDefinitions.map((d) => (
              <option key={d.method} value={d.method}>
                {d.label}
              </option>
            ))}
          </select>
        </label>
        <button type="button" onClick={() => commit(addObjective(state, objectiveDefinition(newObjective).initial))}>
          Add objective
        </button>
      </div>
    </fieldset>
  );
}

function LimitsFields(props: BriefProps & { set: (path: (string | number)[], value: unknown) => void }) {
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
          <PercentField
            compact
            label="Default lower bound"
            path="constraints.weightBounds.default.0"
            value={def?.[0]}
            placeholder={longOnly ? '0' : 'none'}
            messages={[]}
            onTyping={onTyping}
            onChange={(v) => setDefault(v, def?.[1])}
          />
          <span>and</span>
          <PercentField
            compact
            label="Default cap per asset"
            path="constraints.weightBounds.default.1"
            value={def?.[1]}
            placeholder={longOnly ? '100' : 'none'}
            messages={[]}
            onTyping={onTyping}
            onChange={(v) => setDefault(def?.[0], v)}
          />
          <FieldNote id="default-bound-note" messages={at('constraints.weightBounds.default')} />
        </div>
        <PercentField
          label="Maximum turnover (sum of |w − current|)"
          path="constraints.maxTurnover"
          value={c.maxTurnover}
          placeholder="no limit"
          messages={at('constraints.maxTurnover')}
          onTyping={onTyping}
          onChange={(v) => set(['constraints', 'maxTurnover'], v)}
        />
        <PercentField
          label="Maximum gross exposure (sum of |w|)"
          path="constraints.maxGrossExposure"
          value={c.maxGrossExposure}
          placeholder={longOnly ? '100' : 'none'}
          disabled={longOnly && c.maxGrossExposure === undefined}
          hint={longOnly ? 'applies to long-short mandates' : undefined}
          messages={at('constraints.maxGrossExposure')}
          onTyping={onTyping}
          onChange={(v) => set(['constraints', 'maxGrossExposure'], v)}
        />
        <PercentField
          label="Cap on illiquid assets together"
          path="constraints.illiquidMax"
          value={c.illiquidMax}
          placeholder="no limit"
          messages={at('constraints.illiquidMax')}
          onTyping={onTyping}
          onChange={(v) => set(['constraints', 'illiquidMax'], v)}
        />
        <PercentField
          label="Minimum position size (each weight 0 or at least this)"
          path="constraints.minPosition"
          value={c.minPosition}
          placeholder="none"
          disabled={!longOnly && c.minPosition === undefined}
          hint={longOnly ? 'found by a heuristic, not a proven optimum' : 'applies to long-only mandates'}
          messages={at('constraints.minPosition')}
          onTyping={onTyping}
          onChange={(v) => set(['constraints', 'minPosition'], v)}
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
        <td>{props.assetClass}</td>
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
function AssetTable(props: BriefProps) {
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

/** Settings of the walk-forward test (`backtest` in the scenario file), with the schema's defaults shown. */
function BacktestFields({ state, commit, messages, onTyping }: BriefProps) {
  const b = state.doc.backtest ?? {};
  const at = (p: string) => messagesAt(messages, p);
  const set = (key: string, value: unknown) => commit(setField(state, ['backtest', key], value), `backtest.${key}`);
  return (
    <fieldset className="sheet backtest-fields">
      <legend>Walk-forward test (out of sample)</legend>
      <div className="field-row">
        <NumberField
          label="Estimation window"
          unit="return periods"
          path="backtest.estimationWindow"
          value={b.estimationWindow}
          placeholder="from the history"
          hint="empty: 36 monthly, 104 weekly or 252 daily returns, never more than half the history"
          messages={at('backtest.estimationWindow')}
          onTyping={onTyping}
          onChange={(v) => set('estimationWindow', v)}
        />
        <SelectField
          label="Window"
          path="backtest.expanding"
          value={b.expanding ? 'expanding' : 'trailing'}
          options={[
            { value: 'trailing', label: 'trailing, fixed length' },
            { value: 'expanding', label: 'expanding from the start' },
          ]}
          messages={at('backtest.expanding')}
          onChange={(v) => set('expanding', v === 'expanding' ? true : undefined)}
        />
        <SelectField
          label="Rebalance"
          path="backtest.rebalance"
          value={b.rebalance ?? 'monthly'}
          options={[
            { value: 'monthly', label: 'monthly' },
            { value: 'quarterly', label: 'quarterly' },
            { value: 'yearly', label: 'yearly' },
            { value: 'drift', label: 'when a weight drifts out of its band' },
          ]}
          messages={at('backtest.rebalance')}
          onChange={(v) => set('rebalance', v)}
        />
        {b.rebalance === 'drift' ? (
          <PercentField
            label="Drift band"
            path="backtest.driftBand"
            value={b.driftBand}
            placeholder="5"
            messages={at('backtest.driftBand')}
            onTyping={onTyping}
            onChange={(v) => set('driftBand', v)}
          />
        ) : null}
        <NumberField
          label="Costs"
          unit="bp of traded value"
          path="backtest.costBps"
          value={typeof b.costBps === 'number' ? b.costBps : undefined}
          placeholder="10"
          messages={at('backtest.costBps')}
          onTyping={onTyping}
          onChange={(v) => set('costBps', v)}
        />
        <PercentField
          label="Cash rate for the Sharpe ratio"
          path="backtest.cashRate"
          value={b.cashRate}
          placeholder="0"
          messages={at('backtest.cashRate')}
          onTyping={onTyping}
          onChange={(v) => set('cashRate', v)}
        />
      </div>
    </fieldset>
  );
}

function GroupBands(props: BriefProps) {
  const { state, commit, messages, onTyping } = props;
  const groups = state.doc.constraints?.groups ?? [];
  const assets = state.doc.assets ?? [];
  const info = state.doc.assetInfo ?? {};
  const classes = [...new Set(assets.map((a) => info[a]?.assetClass).filter((c): c is string => !!c))];
  const [fromClass, setFromClass] = useState('');
  const set = (path: (string | number)[], value: unknown) =>
    commit(setField(state, ['constraints', 'groups', ...path], value), ['groups', ...path].join('.'));
  const add = (name: string, members: string[]) =>
    commit(setField(state, ['constraints', 'groups'], [...groups, { name, members, max: 1 }]));
  return (
    <fieldset className="sheet groups">
      <legend>Group bands (share of the portfolio in a named set of assets)</legend>
      {groups.length === 0 ? <p className="faint">No bands.</p> : null}
      {groups.map((g, i) => {
        const path = `constraints.groups[${i}]`;
        return (
          <div key={i} className="group-band">
            <div className="field-row">
              <TextField
                label="Band"
                path={`${path}.name`}
                value={g.name}
                messages={messagesAt(messages, `${path}.name`)}
                onChange={(v) => set([i, 'name'], v ?? '')}
              />
              <PercentField
                label="At least"
                path={`${path}.min`}
                value={g.min}
                placeholder="no floor"
                messages={messagesAt(messages, `${path}.min`)}
                onTyping={onTyping}
                onChange={(v) => set([i, 'min'], v)}
              />
              <PercentField
                label="At most"
                path={`${path}.max`}
                value={g.max}
                placeholder="no ceiling"
                messages={messagesAt(messages, `${path}.max`)}
                onTyping={onTyping}
                onChange={(v) => set([i, 'max'], v)}
              />
              <button
                type="button"
                className="quiet"
                onClick={() =>
                  commit(
                    setField(
                      state,
                      ['constraints', 'groups'],
                      groups.filter((_, k) => k !== i),
                    ),
                  )
                }
              >
                Remove band<span className="visually-hidden"> {g.name}</span>
              </button>
            </div>
            <details>
              <summary>
                Members: {g.members.length} ({g.members.slice(0, 6).join(', ')}
                {g.members.length > 6 ? ', …' : ''})
              </summary>
              <div className="member-list">
                {assets.map((a) => (
                  <label key={a}>
                    <input
                      type="checkbox"
                      checked={g.members.includes(a)}
                      onChange={(e) =>
                        set([i, 'members'], e.target.checked ? [...g.members, a] : g.members.filter((m) => m !== a))
                      }
                    />{' '}
                    <span className="code">{a}</span>
                  </label>
                ))}
              </div>
            </details>
            <FieldNote
              id={`group-${i}-note`}
              messages={messagesAt(messages, path).filter((m) => !/\.(name|min|max)$/.test(m.path))}
            />
          </div>
        );
      })}
      <div className="actions add-row">
        <label>
          <span className="visually-hidden">Asset class for a new band</span>
          <select value={fromClass} onChange={(e) => setFromClass(e.target.value)}>
            <option value="">an empty band</option>
            {classes.map((c) => (
              <option key={c} value={c}>
                the {c} assets
              </option>
            ))}
          </select>
        </label>
        <button
          type="button"
          onClick={() =>
            add(
              fromClass ? fromClass[0].toUpperCase() + fromClass.slice(1) : `Band ${groups.length + 1}`,
              fromClass ? assets.filter((a) => info[a]?.assetClass === fromClass) : [],
            )
          }
        >
          Add band
        </button>
      </div>
    </fieldset>
  );
}
