import { useMemo } from 'react';
import type { Asset } from '../../../shared-core/contract/service-api.js';
import { setAssets } from '../editor-state.js';
import { messagesAt } from '../validate-draft.js';
import type { BriefProps } from './brief-props.js';
import { FieldNote } from './fields.js';

/** The assets the scenario chooses from the catalogue, by class (exchange-rate series left out). */
export function AssetChooser({
  state,
  commit,
  catalogue,
  messages,
}: Pick<BriefProps, 'state' | 'commit' | 'catalogue' | 'messages'>) {
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
