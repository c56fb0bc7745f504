import { useEffect, useMemo, useRef, useState, type RefObject } from 'react';
import type { RevisionSummary } from '../../../shared-core/contract/service-api.js';
import { isSolved } from '../../../shared-core/optimise/result.js';
import { priceTableFromWire } from '../../../shared-core/contract/service-api.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { parseScenario, type Scenario, type ScenarioInput } from '../../../shared-core/scenario/schema.js';
import { errorText } from '../../app/notes.js';
import { api } from '../../bridge.js';
import type { Comparison } from '../../worker/comparison.js';
import { diffDocuments, showValue } from '../document-diff.js';
import { fieldWords } from '../../../shared-core/present/field-words.js';
import { formatDateTime, formatPercent, formatRatio } from '../format.js';
import { useRecompute } from '../use-recompute.js';

/** "Save as revision" with a note and initials, and the list of revisions to open beside. */
export function RevisionBar(props: {
  scenarioId: string;
  document: ScenarioInput;
  valid: boolean;
  preparedBy: string | null;
  revisions: readonly RevisionSummary[];
  saveButton: RefObject<HTMLButtonElement | null>;
  onSaved: (revision: RevisionSummary) => void;
  /** Initials typed here the first time are kept in the settings; the page learns them so. */
  onInitialsKept: (initials: string) => void;
  onOpenBeside: (revision: number) => void;
}) {
  const [open, setOpen] = useState(false);
  const [note, setNote] = useState('');
  const [initials, setInitials] = useState(props.preparedBy ?? '');
  const author = (props.preparedBy ?? initials).trim().toUpperCase();
  const initialsReason = /^[A-Z]{2,4}$/.test(author) ? undefined : 'Your initials: two to four letters';
  const [saving, setSaving] = useState(false);
  const [error, setError] = useState<unknown>(null);
  const [saved, setSaved] = useState<RevisionSummary | null>(null);
  const [pick, setPick] = useState<number | ''>(props.revisions[0]?.number ?? '');
  const noteBox = useRef<HTMLTextAreaElement>(null);
  useEffect(() => {
    if (open) noteBox.current?.focus();
  }, [open]);
  useEffect(() => {
    if (pick === '' && props.revisions[0]) setPick(props.revisions[0].number);
  }, [props.revisions, pick]);
  const save = () => {
    if (initialsReason) return;
    setSaving(true);
    setError(null);
    const keep = props.preparedBy
      ? Promise.resolve()
      : api['settings.set']({ preparedBy: author }).then(() => props.onInitialsKept(author));
    keep
      .then(() =>
        api['scenarios.saveRevision']({
          scenarioId: props.scenarioId,
          document: props.document,
          author,
          note,
        }),
      )
      .then(
        (r) => {
          setSaving(false);
          setSaved(r);
          setOpen(false);
          setNote('');
          props.onSaved(r);
        },
        (e: unknown) => {
          setSaving(false);
          setError(e);
        },
      );
  };
  return (
    <>
      <button
        ref={props.saveButton}
        type="button"
        className="primary"
        aria-expanded={open}
        aria-keyshortcuts="Control+S"
        disabled={!props.valid}
        aria-describedby={props.valid ? undefined : 'save-why'}
        onClick={() => setOpen((o) => !o)}
      >
        Save as revision…
      </button>
      {props.valid ? null : (
        <span id="save-why" className="why-disabled">
          Put right the inputs marked in the brief first.
        </span>
      )}
      <span className="revision-pick">
        <label>
          <span className="visually-hidden">Revision to open beside the current one</span>
          <select value={pick} onChange={(e) => setPick(e.target.value === '' ? '' : Number(e.target.value))}>
            {props.revisions.map((r) => (
              <option key={r.number} value={r.number}>
                revision {r.number} · {r.author} · {shortNote(r.note)}
              </option>
            ))}
          </select>
        </label>
        <button type="button" disabled={pick === ''} onClick={() => pick !== '' && props.onOpenBeside(pick)}>
          Open beside
        </button>
      </span>
      {saved ? (
        <span className="faint" role="status" data-testid="revision-saved">
          Saved as revision {saved.number}.
        </span>
      ) : null}
      {open ? (
        <div className="save-panel sheet" role="dialog" aria-label="Save as revision">
          <label htmlFor="revision-note">Note for the file (what changed and why)</label>
          <textarea
            id="revision-note"
            ref={noteBox}
            value={note}
            maxLength={2000}
            onChange={(e) => setNote(e.target.value)}
            onKeyDown={(e) => {
              if (e.key === 'Escape') setOpen(false);
            }}
          />
          {props.preparedBy ? (
            <p className="faint" data-testid="revision-signed">
              Signed {props.preparedBy} (from the settings).
            </p>
          ) : (
            <>
              <label htmlFor="revision-initials">Your initials</label>
              <input
                id="revision-initials"
                type="text"
                value={initials}
                size={5}
                maxLength={4}
                aria-invalid={initials !== '' && initialsReason ? true : undefined}
                aria-describedby="revision-initials-hint"
                onChange={(e) => setInitials(e.target.value.toUpperCase())}
              />
              <span id="revision-initials-hint" className="hint">
                Asked once: kept in the settings for every later revision and memo.
              </span>
            </>
          )}
          {error ? (
            <p className="reason" role="alert">
              {errorText(error)}
            </p>
          ) : null}
          <div className="actions">
            <button
              type="button"
              className="primary"
              disabled={saving || initialsReason !== undefined}
              aria-describedby="revision-save-why"
              onClick={save}
            >
              {saving ? 'Saving…' : 'Save revision'}
            </button>
            <button type="button" onClick={() => setOpen(false)}>
              Cancel
            </button>
            {initialsReason ? (
              <span id="revision-save-why" className="why-disabled">
                {initialsReason} are needed to sign the revision.
              </span>
            ) : null}
          </div>
        </div>
      ) : null}
    </>
  );
}

/** An earlier revision beside the current draft: what changed, and its candidates' figures. */
export function BesidePanel(props: {
  scenarioId: string;
  revision: number;
  current: ScenarioInput;
  currentComparison: Comparison | null;
  prices: PriceTable | undefined;
  /** The draft's exchange-rate table (the revision's assets are priced in the same currencies). */
  fx?: PriceTable;
  onClose: () => void;
  onLoad: (document: ScenarioInput) => void;
  locale?: string;
}) {
  const [loaded, setLoaded] = useState<{ summary: RevisionSummary; document: ScenarioInput } | null>(null);
  const [error, setError] = useState<unknown>(null);
  const [comparison, setComparison] = useState<Comparison | null>(null);
  const [runError, setRunError] = useState<string | null>(null);
  const recompute = useRecompute((o) => {
    if (o.kind === 'done') setComparison(o.comparison);
    else if (o.kind === 'failed') setRunError(o.message);
  });
  useEffect(() => {
    let live = true;
    setLoaded(null);
    setComparison(null);
    api['scenarios.revision']({ scenarioId: props.scenarioId, revision: props.revision }).then(
      (r) => live && setLoaded({ summary: r.revision, document: r.document }),
      (e: unknown) => live && setError(e),
    );
    return () => {
      live = false;
    };
  }, [props.scenarioId, props.revision]);
  const parsed = useMemo(() => (loaded ? parseScenario(loaded.document) : null), [loaded]);
  useEffect(() => {
    if (!parsed?.ok) return;
    const scenario: Scenario = parsed.scenario;
    const assets = scenario.assets ?? props.prices?.assets ?? [];
    if (assets.length === 0) return;
    let live = true;
    api['prices.table']({ assets: [...assets] }).then(
      (r) => live && recompute.request(scenario, priceTableFromWire(r.table), true, props.fx),
      (e: unknown) => live && setRunError(errorText(e)),
    );
    return () => {
      live = false;
    };
    // The revision's own assets decide its prices; the draft's do not.
  }, [parsed]);
  const changes = useMemo(() => (loaded ? diffDocuments(loaded.document, props.current) : []), [loaded, props.current]);
  // Every candidate keeps its row; one without weights shows no figures.
  const rows = (c: Comparison | null) =>
    new Map((c?.candidates ?? []).map((x) => [x.id, { metrics: isSolved(x) ? x.metrics : undefined }]));
  const then = rows(comparison);
  const now = rows(props.currentComparison);
  const ids = [...new Set([...then.keys(), ...now.keys()])];
  return (
    <aside
      className="beside sheet"
      aria-label={`Revision ${props.revision} beside the current draft`}
      data-testid="beside-panel"
    >
      <div className="section-head">
        <h2>Revision {props.revision} beside the draft</h2>
        <button type="button" onClick={props.onClose}>
          Close
        </button>
      </div>
      {error ? <p className="note error">{errorText(error)}</p> : null}
      {loaded ? (
        <>
          <p className="faint">
            Saved {formatDateTime(loaded.summary.savedAt, props.locale)} by {loaded.summary.author}
            {loaded.summary.note ? `: “${loaded.summary.note}”` : ''}
          </p>
          <h3>What the draft changes ({changes.length})</h3>
          {changes.length === 0 ? (
            <p className="faint">The draft is the same as this revision.</p>
          ) : (
            <ul className="change-list">
              {changes.slice(0, 40).map((c) => (
                <li key={c.path}>
                  {fieldWords(c.path).label}: {showValue(c.before, c.path)} → {showValue(c.after, c.path)}
                </li>
              ))}
              {changes.length > 40 ? <li className="faint">and {changes.length - 40} more</li> : null}
            </ul>
          )}
          <h3>Candidates then and now</h3>
          {runError ? <p className="note warning">The revision could not be recomputed: {runError}</p> : null}
          {!comparison && !runError ? <p className="faint">Recomputing the revision…</p> : null}
          <table className="grid">
            <thead>
              <tr>
                <th scope="col">Candidate</th>
                <th scope="col" className="num">
                  Volatility, then / now
                </th>
                <th scope="col" className="num">
                  Diversification ratio, then / now
                </th>
              </tr>
            </thead>
            <tbody>
              {ids.map((id) => (
                <tr key={id}>
                  <th scope="row" className="code">
                    {id}
                  </th>
                  <td className="num">
                    {formatPercent(then.get(id)?.metrics?.volatility, props.locale)} /{' '}
                    {formatPercent(now.get(id)?.metrics?.volatility, props.locale)}
                  </td>
                  <td className="num">
                    {formatRatio(then.get(id)?.metrics?.diversificationRatio, props.locale)} /{' '}
                    {formatRatio(now.get(id)?.metrics?.diversificationRatio, props.locale)}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <div className="actions">
            <button type="button" onClick={() => props.onLoad(loaded.document)}>
              Load revision {props.revision} into the editor
            </button>
            <span className="faint">An undoable edit; save it as a revision to make it the newest.</span>
          </div>
        </>
      ) : !error ? (
        <p className="faint">Reading revision {props.revision}…</p>
      ) : null}
    </aside>
  );
}

/** A revision's note for the picker: its first sentence, at most 60 characters, marked when shortened. */
function shortNote(note: string): string {
  const first = note.split(/(?<=\.)\s/)[0].trim();
  if (!first) return 'no note';
  return first.length > 60 ? `${first.slice(0, 59).trimEnd()}…` : first;
}
