import { useEffect, useId, useRef, useState, type FormEvent } from 'react';
import type { HouseholdSummary, ScenarioSummary } from '../../shared-core/contract/service-api.js';
import { api } from '../bridge.js';
import { formatInstant } from '../../shared-core/present/format.js';
import { takeNewScenarioRequest, useMenuCommands } from '../app/menu.js';
import { ErrorNote, errorText, Loading } from '../app/notes.js';
import { href, navigate } from '../app/route.js';
import { useLoad } from '../app/use-load.js';
import { formatPercent } from '../scenario/format.js';
import { priceTableFromWire } from '../../shared-core/contract/service-api.js';
import { shareOutsideUniverse, starterScenario, startingLimits } from './starter-scenario.js';

/** A household's scenarios, each with its revision history; a new one starts from a universe. */
export function ScenariosPanel({ household }: { household: HouseholdSummary }) {
  const scenarios = useLoad(() => api['scenarios.list']({ householdId: household.id }), [household.id]);
  // The menu's "New scenario" opens the form here, also when it was chosen on another page.
  const [creating, setCreating] = useState(false);
  const panel = useRef<HTMLElement>(null);
  useMenuCommands({ 'new-scenario': () => setCreating(true) });
  useEffect(() => {
    if (takeNewScenarioRequest(household.id)) setCreating(true);
  }, [household.id]);
  useEffect(() => {
    if (!creating) return;
    panel.current?.scrollIntoView({ block: 'start' });
    panel.current?.querySelector<HTMLInputElement>('form input')?.focus({ preventScroll: true });
  }, [creating]);
  return (
    <section className="section" aria-labelledby="scenarios-head" ref={panel}>
      <div className="section-head">
        <h2 id="scenarios-head">Scenarios</h2>
        {!creating ? (
          <button type="button" onClick={() => setCreating(true)}>
            New scenario
          </button>
        ) : null}
      </div>
      {creating ? <NewScenarioForm household={household} onCancel={() => setCreating(false)} /> : null}
      {scenarios.error ? <ErrorNote error={scenarios.error} /> : null}
      {scenarios.loading && !scenarios.data ? <Loading what="the scenarios" /> : null}
      {scenarios.data && scenarios.data.length === 0 && !creating ? (
        <p className="muted">No scenario yet for this household.</p>
      ) : null}
      {scenarios.data?.map((s) => (
        <ScenarioCard key={s.id} scenario={s} onChanged={scenarios.reload} />
      ))}
    </section>
  );
}

function ScenarioCard({ scenario, onChanged }: { scenario: ScenarioSummary; onChanged: () => void }) {
  const [open, setOpen] = useState(false);
  const latest = scenario.latestRevision;
  const listId = useId();
  return (
    <article className="scenario-card" aria-label={`Scenario ${scenario.name}`}>
      <h3>
        <a href={href({ page: 'scenario', householdId: scenario.householdId, scenarioId: scenario.id })}>
          {scenario.name}
        </a>
        {scenario.hasDraft ? (
          <>
            {' '}
            <span className="flag">unsaved draft</span>
          </>
        ) : null}
      </h3>
      <p className="muted" style={{ margin: 0 }}>
        {latest
          ? `Revision ${latest.number}, saved ${formatInstant(latest.savedAt)} by ${latest.author}${latest.note ? `: \u201c${latest.note}\u201d` : ''}`
          : 'No saved revision yet'}
        {scenario.universe ? ` · universe ${scenario.universe}` : ''}
      </p>
      <div className="actions">
        <a
          className="button"
          href={href({ page: 'scenario', householdId: scenario.householdId, scenarioId: scenario.id })}
        >
          Open scenario
        </a>
        <button
          type="button"
          className="quiet"
          aria-expanded={open}
          aria-controls={listId}
          onClick={() => setOpen((o) => !o)}
        >
          {open ? 'Hide' : 'Show'} the {scenario.revisionCount} revision{scenario.revisionCount === 1 ? '' : 's'}
        </button>
      </div>
      <div id={listId}>{open ? <RevisionList scenario={scenario} onChanged={onChanged} /> : null}</div>
    </article>
  );
}

function RevisionList({ scenario, onChanged }: { scenario: ScenarioSummary; onChanged: () => void }) {
  const revisions = useLoad(() => api['scenarios.revisions']({ scenarioId: scenario.id }), [scenario.id]);
  const settings = useLoad(() => api['settings.get']({}), []);
  const [failure, setFailure] = useState<unknown>();
  const [busy, setBusy] = useState(false);
  const initials = settings.data?.preparedBy ?? null;

  const restore = async (number: number) => {
    if (!initials) return;
    setBusy(true);
    setFailure(undefined);
    try {
      await api['scenarios.restore']({
        scenarioId: scenario.id,
        revision: number,
        author: initials,
        note: `restored revision ${number}`,
      });
      revisions.reload();
      onChanged();
    } catch (error) {
      setFailure(error);
    } finally {
      setBusy(false);
    }
  };

  if (revisions.error) return <ErrorNote error={revisions.error} />;
  if (!revisions.data) return <Loading what="the revisions" />;
  const newest = revisions.data[0]?.number;
  return (
    <>
      <table className="grid" style={{ marginTop: '0.6rem' }}>
        <caption>
          Newest first. Restoring saves an earlier revision again as the newest; no revision is ever overwritten.
          {!initials ? (
            <>
              {' '}
              Set your initials in <a href={href({ page: 'settings' })}>settings</a> to restore.
            </>
          ) : null}
        </caption>
        <thead>
          <tr>
            <th scope="col" className="num">
              No.
            </th>
            <th scope="col">Saved</th>
            <th scope="col">By</th>
            <th scope="col">Note</th>
            <th scope="col">Fingerprint</th>
            <th scope="col">
              <span className="faint">Action</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {revisions.data.map((r) => (
            <tr key={r.number}>
              <td className="num">{r.number}</td>
              <td className="tabular">{formatInstant(r.savedAt)}</td>
              <td>{r.author}</td>
              <td>{r.note || <span className="faint">no note</span>}</td>
              <td className="code" title={r.hash}>
                {r.hash.slice(0, 10)}
              </td>
              <td>
                {r.number !== newest ? (
                  <button
                    type="button"
                    className="quiet"
                    disabled={!initials || busy}
                    onClick={() => restore(r.number)}
                  >
                    Restore as newest
                  </button>
                ) : (
                  <span className="faint">current</span>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {failure ? <ErrorNote error={failure} /> : null}
    </>
  );
}

function NewScenarioForm({ household, onCancel }: { household: HouseholdSummary; onCancel: () => void }) {
  const id = useId();
  const universes = useLoad(() => api['universes.list']({}), []);
  const settings = useLoad(() => api['settings.get']({}), []);
  const holdings = useLoad(() => api['holdings.get']({ householdId: household.id }), [household.id]);
  const [name, setName] = useState('');
  const [universeId, setUniverseId] = useState('');
  const [initials, setInitials] = useState<string>();
  const [failure, setFailure] = useState<string>();
  const [busy, setBusy] = useState(false);

  const chosenUniverse = universeId || universes.data?.[0]?.id || '';
  const universe = useLoad(
    () => (chosenUniverse ? api['universes.get']({ universeId: chosenUniverse }) : Promise.resolve(undefined)),
    [chosenUniverse],
  );
  const author = initials ?? settings.data?.preparedBy ?? '';
  const nameReason = name.trim() ? undefined : 'a scenario needs a name';
  const authorReason = /^[A-Za-z]{2,4}$/.test(author.trim()) ? undefined : 'two to four letters';
  const outside = universe.data ? shareOutsideUniverse(holdings.data, universe.data.members) : null;

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    if (nameReason || authorReason || !universe.data) return;
    setBusy(true);
    setFailure(undefined);
    try {
      const priced = universe.data.members.filter((m) => m.asset.fx === null).map((m) => m.asset.id);
      const prices =
        priced.length > 0
          ? await api['prices.table']({ assets: priced }).then((r) => priceTableFromWire(r.table))
          : undefined;
      const { document, origin } = starterScenario({
        name: name.trim(),
        baseCurrency: household.baseCurrency,
        members: universe.data.members,
        holdings: holdings.data,
        prices,
        mandate: household.mandate,
      });
      const created = await api['scenarios.create']({
        householdId: household.id,
        document,
        universe: universe.data.universe.name,
        author: author.trim(),
        note: `Started: ${origin}`,
      });
      // Initials are asked once: the first ones typed are kept for every later save and memo.
      if (!settings.data?.preparedBy) await api['settings.set']({ preparedBy: author.trim().toUpperCase() });
      navigate({ page: 'scenario', householdId: household.id, scenarioId: created.scenario.id });
    } catch (error) {
      setFailure(errorText(error));
      setBusy(false);
    }
  };

  if (universes.data && universes.data.length === 0)
    return (
      <div className="note warning">
        A scenario chooses from a universe of priced assets, and the store has none yet.{' '}
        <a href={href({ page: 'import' })}>Import a price file</a> to create one.{' '}
        <button type="button" className="quiet" onClick={onCancel}>
          Close
        </button>
      </div>
    );

  return (
    <form className="sheet" onSubmit={submit} noValidate aria-label="New scenario" style={{ marginBottom: '1rem' }}>
      <div className="form-grid">
        <div className="field">
          <label htmlFor={`${id}-name`}>Scenario name</label>
          <input
            id={`${id}-name`}
            type="text"
            value={name}
            onChange={(e) => setName(e.target.value)}
            aria-invalid={name && nameReason ? true : undefined}
            autoComplete="off"
            size={30}
          />
          {name && nameReason ? <div className="reason">{nameReason}</div> : null}
        </div>
        <div className="field">
          <label htmlFor={`${id}-universe`}>Universe</label>
          <select id={`${id}-universe`} value={chosenUniverse} onChange={(e) => setUniverseId(e.target.value)}>
            {(universes.data ?? []).map((u) => (
              <option key={u.id} value={u.id}>
                {u.name} ({u.assetCount} assets)
              </option>
            ))}
          </select>
          {outside !== null && outside > 0.0005 ? (
            <div className="hint">{formatPercent(outside)} of the holdings are outside this universe.</div>
          ) : null}
        </div>
        {settings.data?.preparedBy ? (
          <div className="field">
            <span className="label-like">Signed as</span>
            <div>
              {settings.data.preparedBy} <a href={href({ page: 'settings' })}>change in settings</a>
            </div>
          </div>
        ) : (
          <div className="field">
            <label htmlFor={`${id}-author`}>Your initials</label>
            <input
              id={`${id}-author`}
              type="text"
              value={author}
              maxLength={4}
              size={6}
              onChange={(e) => setInitials(e.target.value.toUpperCase())}
              aria-invalid={author && authorReason ? true : undefined}
              aria-describedby={`${id}-author-hint`}
            />
            <div className="hint" id={`${id}-author-hint`}>
              asked once: kept in the settings for every save and memo
            </div>
            {author && authorReason ? <div className="reason">{authorReason}</div> : null}
          </div>
        )}
      </div>
      <p className="hint">
        Starts with the universe's assets, five years of log returns at the frequency the coarsest of them is priced at,
        the current holdings as the turnover reference and one candidate (Ledoit-Wolf, maximum diversification); change
        all of it in the scenario. {startingLimits(household.mandate).origin}
      </p>
      {failure ? (
        <div className="note error" role="alert">
          {failure}
        </div>
      ) : null}
      <div className="actions">
        <button type="submit" className="primary" disabled={busy || !!nameReason || !!authorReason || !universe.data}>
          Create scenario
        </button>
        <button type="button" onClick={onCancel} disabled={busy}>
          Cancel
        </button>
      </div>
    </form>
  );
}
