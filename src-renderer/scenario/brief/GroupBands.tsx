import { useState } from 'react';
import { setField } from '../editor-state.js';
import { messagesAt } from '../validate-draft.js';
import type { BriefProps } from './brief-props.js';
import { DocPercentField, DocTextField } from './doc-fields.js';
import { FieldNote } from './fields.js';

/** Bands on the share of the portfolio in a named set of assets (a class, or a set the advisor picks). */
export function GroupBands(props: Pick<BriefProps, 'state' | 'commit' | 'messages'>) {
  const { state, commit, messages } = props;
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
              <DocTextField label="Band" at={['constraints', 'groups', i, 'name']} required />
              <DocPercentField label="At least" at={['constraints', 'groups', i, 'min']} placeholder="no floor" />
              <DocPercentField label="At most" at={['constraints', 'groups', i, 'max']} placeholder="no ceiling" />
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
