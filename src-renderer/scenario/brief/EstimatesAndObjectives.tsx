import { useState } from 'react';
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
import { describeEstimator, describeObjective, findCandidate } from '../candidate-grid.js';
import {
  addEstimator,
  addObjective,
  removeEstimator,
  removeObjective,
  setCell,
  updateEstimator,
  updateObjective,
} from '../editor-state.js';
import { messagesAt, type FieldMessage } from '../validate-draft.js';
import type { BriefProps } from './brief-props.js';
import { FieldNote, NumberField, PercentField, SelectField } from './fields.js';

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

const isRateMessage = (m: FieldMessage) => m.path.endsWith('.riskFreeRate');

/**
 * An objective's own option beside its name: the annualised risk-free rate of the maximum
 * Sharpe ratio (Sharpe 1966), the return the portfolio's excess is measured over; empty: 0 %.
 */
function ObjectiveOptions({
  spec,
  index,
  state,
  commit,
  messages,
  onTyping,
}: BriefProps & { spec: ObjectiveSpec; index: number }) {
  if (spec.method !== 'max-sharpe') return null;
  const path = `objectives[${index}].riskFreeRate`;
  return (
    <PercentField
      label="Risk-free rate, annualised"
      path={path}
      value={spec.riskFreeRate}
      placeholder="0"
      hint="the Sharpe ratio's excess return is over this rate"
      messages={messages}
      onTyping={onTyping}
      onChange={(v) =>
        commit(
          updateObjective(
            state,
            index,
            v === undefined ? { method: 'max-sharpe' } : { method: 'max-sharpe', riskFreeRate: v },
          ),
          path,
        )
      }
    />
  );
}

/** The estimator object the editor starts from when a method is picked (its definition's). */
const defaultEstimator = (method: EstimatorSpec['method']): EstimatorSpec => estimatorDefinition(method).initial;

/** The risk estimates (rows) and objectives (columns) whose ticked cells are the candidates. */
export function EstimatesAndObjectives(props: BriefProps) {
  const { state, commit, messages } = props;
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
                      messages={objectiveMessages(o).filter((m) => !isRateMessage(m))}
                      onChange={(m) => commit(updateObjective(state, j, objectiveDefinition(m).initial))}
                    />
                    <ObjectiveOptions
                      {...props}
                      spec={o}
                      index={j}
                      messages={[
                        ...messagesAt(messages, `objectives[${j}]`),
                        ...objectiveMessages(o).filter(isRateMessage),
                      ]}
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
        <AddMethod
          what="Risk estimate"
          definitions={estimatorDefinitions}
          initial="oas"
          onAdd={(m) => commit(addEstimator(state, defaultEstimator(m)))}
        />
        <AddMethod
          what="Objective"
          definitions={objectiveDefinitions}
          initial="equal-risk-contribution"
          onAdd={(m) => commit(addObjective(state, objectiveDefinition(m).initial))}
        />
      </div>
    </fieldset>
  );
}

/** A method to add, chosen from its registry's list, and the button that adds it ("Add objective"). */
function AddMethod<M extends string>(props: {
  what: string;
  definitions: readonly { method: M; label: string }[];
  initial: M;
  onAdd: (method: M) => void;
}) {
  const [chosen, setChosen] = useState<M>(props.initial);
  return (
    <>
      <label>
        <span className="visually-hidden">{props.what} to add</span>
        <select value={chosen} onChange={(e) => setChosen(e.target.value as M)}>
          {props.definitions.map((d) => (
            <option key={d.method} value={d.method}>
              {d.label}
            </option>
          ))}
        </select>
      </label>
      <button type="button" onClick={() => props.onAdd(chosen)}>
        Add {props.what.toLowerCase()}
      </button>
    </>
  );
}
