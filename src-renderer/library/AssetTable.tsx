import { useId, useState } from 'react';
import type { Coverage, UniverseMember } from '../../shared-core/contract/service-api.js';
import { liquidityTags } from '../../shared-core/scenario/schema.js';
import { api } from '../bridge.js';
import { errorText } from '../app/notes.js';
import { href } from '../app/route.js';
import { formatDate } from '../scenario/format.js';
import { assetClassWords } from '../../shared-core/scenario/asset-class.js';

const LIQUIDITY_WORDS: Record<(typeof liquidityTags)[number], string> = {
  daily: 'daily dealing',
  monthly: 'monthly dealing',
  illiquid: 'illiquid',
};

/** The universe's assets with their tags; the selected one can be re-tagged in place. */
export function AssetTable({
  universeId,
  members,
  coverage,
  selected,
  onChanged,
}: {
  universeId: string;
  members: UniverseMember[];
  coverage: Coverage | undefined;
  selected: string | undefined;
  onChanged: () => void;
}) {
  const [editing, setEditing] = useState<string>();
  const byAsset = new Map((coverage?.assets ?? []).map((c) => [c.asset, c]));
  return (
    <section className="section" aria-labelledby="assets-head">
      <div className="section-head">
        <h2 id="assets-head">Assets and tags</h2>
        <span className="faint">
          Pick an asset to chart it; tags describe it to scenarios, group bands and the memo.
        </span>
      </div>
      <table className="grid">
        <thead>
          <tr>
            <th scope="col">Asset</th>
            <th scope="col">Name</th>
            <th scope="col">Class</th>
            <th scope="col">Region</th>
            <th scope="col">Ccy</th>
            <th scope="col">Liquidity</th>
            <th scope="col">Groups</th>
            <th scope="col" className="num">
              Prices
            </th>
            <th scope="col" className="num">
              From
            </th>
            <th scope="col">
              <span className="faint">Action</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {members.map((m) => {
            const a = m.asset;
            const c = byAsset.get(a.id);
            return editing === a.id ? (
              <tr key={a.id} aria-selected="true">
                <td colSpan={10}>
                  <TagEditor
                    universeId={universeId}
                    member={m}
                    onDone={(changed) => {
                      setEditing(undefined);
                      if (changed) onChanged();
                    }}
                  />
                </td>
              </tr>
            ) : (
              <tr key={a.id} aria-selected={a.id === selected ? 'true' : undefined}>
                <td className="code">
                  <a href={href({ page: 'library', universeId, assetId: a.id })} aria-label={`Chart ${a.id}`}>
                    {a.id}
                  </a>
                </td>
                <td>{a.name}</td>
                <td>{a.assetClass ? assetClassWords(a.assetClass) : <span className="faint">untagged</span>}</td>
                <td>{a.region || <span className="faint">untagged</span>}</td>
                <td className="code">{a.currency ?? <span className="flag">unset</span>}</td>
                <td style={{ whiteSpace: 'nowrap' }}>
                  {LIQUIDITY_WORDS[a.liquidity]}
                  {a.lockUpDays !== null ? `, ${a.lockUpDays}-day lock-up` : ''}
                </td>
                <td>
                  {m.groups.length ? (
                    m.groups.map((g) => (
                      <span className="tag" key={g}>
                        {g}
                      </span>
                    ))
                  ) : (
                    <span className="faint">none</span>
                  )}
                </td>
                <td className="num">{c ? c.observations.toLocaleString() : '\u2013'}</td>
                <td className="num">{c?.firstDate ? formatDate(c.firstDate) : '\u2013'}</td>
                <td>
                  <button
                    type="button"
                    className="quiet"
                    onClick={() => setEditing(a.id)}
                    aria-label={`Edit the tags of ${a.id}`}
                  >
                    Edit
                  </button>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </section>
  );
}

function TagEditor({
  universeId,
  member,
  onDone,
}: {
  universeId: string;
  member: UniverseMember;
  onDone: (changed: boolean) => void;
}) {
  const id = useId();
  const a = member.asset;
  const [name, setName] = useState(a.name);
  const [assetClass, setAssetClass] = useState(a.assetClass);
  const [region, setRegion] = useState(a.region);
  const [currency, setCurrency] = useState(a.currency ?? '');
  const [liquidity, setLiquidity] = useState(a.liquidity);
  const [lockUp, setLockUp] = useState(a.lockUpDays === null ? '' : String(a.lockUpDays));
  const [groups, setGroups] = useState(member.groups.join(', '));
  const [failure, setFailure] = useState<string>();
  const [busy, setBusy] = useState(false);

  const why = {
    name: name.trim() ? undefined : 'an asset needs a display name',
    currency: currency === '' || /^[A-Z]{3}$/.test(currency) ? undefined : 'ISO 4217 code, such as EUR',
    lockUp: lockUp === '' || /^\d+$/.test(lockUp) ? undefined : 'whole days',
  };
  const valid = !why.name && !why.currency && !why.lockUp;

  const save = async () => {
    setBusy(true);
    setFailure(undefined);
    try {
      await api['assets.update']({
        assetId: a.id,
        fields: {
          name: name.trim(),
          assetClass: assetClass.trim(),
          region: region.trim(),
          ...(currency ? { currency } : {}),
          liquidity,
          lockUpDays: liquidity === 'illiquid' && lockUp !== '' ? Number(lockUp) : null,
        },
      });
      await api['universes.setGroups']({
        universeId,
        asset: a.id,
        groups: groups
          .split(',')
          .map((g) => g.trim())
          .filter(Boolean),
      });
      onDone(true);
    } catch (error) {
      setFailure(errorText(error));
      setBusy(false);
    }
  };

  return (
    <div aria-label={`Tags of ${a.id}`} role="group">
      <p style={{ margin: '0 0 0.5rem' }}>
        <strong className="code">{a.id}</strong> <span className="muted">tags</span>
      </p>
      <div className="form-grid">
        <div className="field">
          <label htmlFor={`${id}-name`}>Display name</label>
          <input
            id={`${id}-name`}
            type="text"
            value={name}
            onChange={(e) => setName(e.target.value)}
            aria-invalid={why.name ? true : undefined}
          />
          {why.name ? <div className="reason">{why.name}</div> : null}
        </div>
        <div className="field">
          <label htmlFor={`${id}-class`}>Asset class</label>
          <input id={`${id}-class`} type="text" value={assetClass} onChange={(e) => setAssetClass(e.target.value)} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-region`}>Region</label>
          <input id={`${id}-region`} type="text" value={region} onChange={(e) => setRegion(e.target.value)} />
        </div>
        <div className="field">
          <label htmlFor={`${id}-ccy`}>Price currency</label>
          <input
            id={`${id}-ccy`}
            type="text"
            value={currency}
            maxLength={3}
            size={5}
            onChange={(e) => setCurrency(e.target.value.toUpperCase())}
            aria-invalid={why.currency ? true : undefined}
          />
          {why.currency ? <div className="reason">{why.currency}</div> : null}
        </div>
        <div className="field">
          <label htmlFor={`${id}-liq`}>Liquidity</label>
          <select id={`${id}-liq`} value={liquidity} onChange={(e) => setLiquidity(e.target.value as typeof liquidity)}>
            {liquidityTags.map((t) => (
              <option key={t} value={t}>
                {LIQUIDITY_WORDS[t]}
              </option>
            ))}
          </select>
        </div>
        {liquidity === 'illiquid' ? (
          <div className="field">
            <label htmlFor={`${id}-lock`}>Lock-up (days)</label>
            <input
              id={`${id}-lock`}
              type="text"
              inputMode="numeric"
              value={lockUp}
              size={6}
              onChange={(e) => setLockUp(e.target.value.trim())}
              aria-invalid={why.lockUp ? true : undefined}
            />
            {why.lockUp ? <div className="reason">{why.lockUp}</div> : null}
          </div>
        ) : null}
        <div className="field">
          <label htmlFor={`${id}-groups`}>Groups in this universe</label>
          <input id={`${id}-groups`} type="text" value={groups} onChange={(e) => setGroups(e.target.value)} />
          <div className="hint">Comma-separated, e.g. equity, growth</div>
        </div>
      </div>
      {failure ? (
        <div className="note error" role="alert">
          {failure}
        </div>
      ) : null}
      <div className="actions">
        <button type="button" className="primary" onClick={save} disabled={!valid || busy}>
          Save tags
        </button>
        <button type="button" onClick={() => onDone(false)} disabled={busy}>
          Cancel
        </button>
      </div>
    </div>
  );
}
