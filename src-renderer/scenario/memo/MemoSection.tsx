import { memo, useCallback, useEffect, useId, useRef, useState } from 'react';
import type { MemoSummary, RevisionSummary } from '../../../shared-core/contract/service-api.js';
import { CAUTIONS } from '../../app/Cautions.js';
import { formatInstant, todayIso } from '../../../shared-core/present/format.js';
import { useMenuCommands } from '../../app/menu.js';
import { errorText } from '../../app/notes.js';
import { href } from '../../app/route.js';
import { api, ServiceCallError } from '../../bridge.js';
import { base64Bytes, checkLot, checkMemoDate, memoFileName, revisionNumberOf } from './memo-form.js';
import './memo.css';

/**
 * The fourth part of the scenario page: the allocation memo for the file. It is printed by the
 * service from the newest saved revision (never from the draft in the editor), with the stored
 * prices, the household's holdings and the initials in the settings; printed memos are kept
 * byte for byte and can be downloaded again.
 */
interface RevisionCandidates {
  number: number;
  name: string;
  candidates: { id: string; label?: string }[];
  recommended?: string;
}

type PrintState =
  | { kind: 'idle' }
  | { kind: 'printing' }
  | { kind: 'printed'; memo: MemoSummary; reused: boolean; revision: number | null }
  | { kind: 'failed'; error: unknown };

/** Which field of the form a refusal of the service is about (its JSON path), if any. */
const FIELD_OF: Record<string, 'date' | 'lot' | 'recommended' | 'rationale'> = {
  date: 'date',
  lot: 'lot',
  recommended: 'recommended',
  rationale: 'rationale',
};

export const MemoSection = memo(function MemoSection(props: {
  scenarioId: string;
  householdName: string;
  /** The scenario's revisions, newest first. */
  revisions: readonly RevisionSummary[];
  /** The editor holds changes (a draft) that the newest revision does not. */
  unsaved: boolean;
  /** Opens the page's "save as revision" form. */
  onSaveFirst: () => void;
  /** The initials in the settings as the page knows them (read again when they change). */
  preparedBy?: string | null;
}) {
  const id = useId();
  const newest = props.revisions[0];
  const [source, setSource] = useState<RevisionCandidates | { error: unknown } | null>(null);
  useEffect(() => {
    if (!newest) return;
    let live = true;
    api['scenarios.revision']({ scenarioId: props.scenarioId, revision: newest.number }).then(
      (r) => {
        if (!live) return;
        const doc = r.document as {
          name?: string;
          candidates?: { id: string; label?: string }[];
          recommended?: string;
        };
        setSource({
          number: r.revision.number,
          name: doc.name ?? '',
          candidates: (doc.candidates ?? []).map((c) => ({ id: c.id, ...(c.label ? { label: c.label } : {}) })),
          ...(doc.recommended ? { recommended: doc.recommended } : {}),
        });
      },
      (error: unknown) => live && setSource({ error }),
    );
    return () => {
      live = false;
    };
  }, [props.scenarioId, newest?.number, newest?.hash]);

  const [memos, setMemos] = useState<MemoSummary[] | { error: unknown } | null>(null);
  const reloadMemos = useCallback(
    () =>
      api['memos.list']({ scenarioId: props.scenarioId }).then(
        (list) => setMemos(list),
        (error: unknown) => setMemos({ error }),
      ),
    [props.scenarioId],
  );
  useEffect(() => {
    void reloadMemos();
  }, [reloadMemos]);

  // The initials the service will print (read again after each print: they may change meanwhile).
  const [initials, setInitials] = useState<string | null | undefined>(undefined);
  const readInitials = useCallback(
    () =>
      api['settings.get']({}).then(
        (s) => setInitials(s.preparedBy),
        () => setInitials(undefined),
      ),
    [],
  );
  useEffect(() => {
    void readInitials();
  }, [readInitials, props.preparedBy]);

  // ---- the form ----
  const [dateText, setDateText] = useState(() => todayIso());
  const [lotText, setLotText] = useState('1,000');
  const [picked, setPicked] = useState<string | null>(null);
  const [rationale, setRationale] = useState('');
  const [state, setState] = useState<PrintState>({ kind: 'idle' });
  const date = checkMemoDate(dateText);
  const lot = checkLot(lotText);
  const revision = source && !('error' in source) && source.number === newest?.number ? source : null;
  const recommended =
    picked !== null && revision?.candidates.some((c) => c.id === picked) ? picked : revision?.recommended;
  // Why printing cannot run now, said beside the button (it is disabled until then).
  const blocked =
    initials === null
      ? 'no initials in the settings: the memo names who prepared it'
      : !date.ok
        ? `the date: ${date.reason}`
        : !lot.ok
          ? `the lot: ${lot.reason}`
          : revision === null
            ? 'reading the newest revision…'
            : initials === undefined
              ? 'reading the settings…'
              : undefined;
  const ready = blocked === undefined && state.kind !== 'printing';

  const refusal = state.kind === 'failed' && state.error instanceof ServiceCallError ? state.error : null;
  const refusedField = refusal?.where ? FIELD_OF[refusal.where.split(/[.[]/)[0]] : undefined;
  const reasonFor = (field: 'date' | 'lot' | 'recommended' | 'rationale'): string | undefined =>
    refusedField === field ? refusal?.message : undefined;

  const print = () => {
    if (!ready || !date.ok || !lot.ok) return;
    setState({ kind: 'printing' });
    api['memos.print']({
      scenarioId: props.scenarioId,
      date: date.value,
      lot: lot.value,
      ...(recommended ? { recommended } : {}),
      ...(rationale.trim() ? { rationale: rationale.trim() } : {}),
    }).then(
      (r) => {
        setState({
          kind: 'printed',
          memo: r.memo,
          reused: r.reused,
          revision: revisionNumberOf(r.memo.revisionHash, props.revisions),
        });
        void reloadMemos();
        void readInitials();
      },
      (error: unknown) => {
        setState({ kind: 'failed', error });
        void readInitials();
      },
    );
  };

  // The menu's "Print memo" brings the form into view with the focus on its first field.
  const firstField = useRef<HTMLInputElement>(null);
  const sectionRef = useRef<HTMLElement>(null);
  useMenuCommands({
    'print-memo': () => {
      sectionRef.current?.scrollIntoView({ block: 'start' });
      firstField.current?.focus({ preventScroll: true });
    },
  });

  return (
    <section
      className="section memo-section"
      aria-labelledby={`${id}-title`}
      ref={sectionRef}
      data-testid="memo-section"
    >
      <div className="section-head">
        <h2 id={`${id}-title`}>4. The memo for the file</h2>
        <span className="faint">A PDF the household and the reviewing adviser can keep.</span>
      </div>
      {!newest ? (
        <p className="note" data-testid="memo-no-revision">
          No revision is saved yet. The memo is printed from a saved revision, so save one first.{' '}
          <button type="button" onClick={props.onSaveFirst}>
            Save the draft as a revision…
          </button>
        </p>
      ) : (
        <div className="sheet memo-form">
          <p className="memo-source" data-testid="memo-source">
            Printed from <strong>revision {newest.number}</strong>, saved {formatInstant(newest.savedAt)} by{' '}
            {newest.author}, with the prices in the store and the household’s holdings. The draft in the editor is not
            used.
          </p>
          {props.unsaved ? (
            <div className="note warning" role="note" data-testid="memo-unsaved">
              The editor holds changes that are not in revision {newest.number}; this memo will not show them. To
              include them, save them as a revision first.{' '}
              <button type="button" className="quiet" onClick={props.onSaveFirst}>
                Save the draft as a revision…
              </button>
            </div>
          ) : null}
          {source && 'error' in source ? (
            <p className="note error" role="alert">
              Revision {newest.number} could not be read: {errorText(source.error)}
            </p>
          ) : null}
          <div className="memo-fields">
            <div className="field">
              <label htmlFor={`${id}-date`}>Date on the memo</label>
              <input
                id={`${id}-date`}
                ref={firstField}
                type="date"
                value={dateText}
                onChange={(e) => setDateText(e.target.value)}
                aria-invalid={!date.ok || reasonFor('date') ? true : undefined}
                aria-describedby={`${id}-date-reason`}
              />
              <div id={`${id}-date-reason`} className="reason" aria-live="polite">
                {!date.ok ? date.reason : reasonFor('date')}
              </div>
            </div>
            <div className="field">
              <label htmlFor={`${id}-lot`}>Round trades to lots of</label>
              <input
                id={`${id}-lot`}
                type="text"
                inputMode="decimal"
                className="amount memo-lot"
                value={lotText}
                onChange={(e) => setLotText(e.target.value)}
                aria-invalid={!lot.ok || reasonFor('lot') ? true : undefined}
                aria-describedby={`${id}-lot-reason ${id}-lot-hint`}
                autoComplete="off"
              />
              <div id={`${id}-lot-hint`} className="hint">
                In the base currency; each buy or sell is rounded to a multiple of it.
              </div>
              <div id={`${id}-lot-reason`} className="reason" aria-live="polite" data-testid="memo-lot-reason">
                {!lot.ok ? lot.reason : reasonFor('lot')}
              </div>
            </div>
            <div className="field memo-candidate">
              <label htmlFor={`${id}-recommended`}>Candidate the memo recommends</label>
              <select
                id={`${id}-recommended`}
                value={recommended ?? ''}
                disabled={!revision}
                onChange={(e) => setPicked(e.target.value)}
                aria-invalid={reasonFor('recommended') ? true : undefined}
                aria-describedby={`${id}-recommended-reason`}
              >
                {!revision ? <option value="">reading the revision…</option> : null}
                {revision && !revision.recommended && picked === null ? (
                  <option value="">none marked in the revision</option>
                ) : null}
                {revision?.candidates.map((c) => (
                  <option key={c.id} value={c.id}>
                    {c.label ? `${c.id} (${c.label})` : c.id}
                    {c.id === revision.recommended ? ' · marked in the revision' : ''}
                  </option>
                ))}
              </select>
              <div id={`${id}-recommended-reason`} className="reason" aria-live="polite">
                {reasonFor('recommended')}
              </div>
            </div>
          </div>
          <div className="field">
            <label htmlFor={`${id}-rationale`}>Your reasons, printed before the figures (optional)</label>
            <textarea
              id={`${id}-rationale`}
              value={rationale}
              maxLength={4000}
              onChange={(e) => setRationale(e.target.value)}
              aria-describedby={`${id}-rationale-count`}
            />
            <div id={`${id}-rationale-count`} className="hint">
              {rationale.length > 3500 ? `${4000 - rationale.length} characters left` : 'Up to 4,000 characters.'}
              {reasonFor('rationale') ? <span className="reason"> {reasonFor('rationale')}</span> : null}
            </div>
          </div>
          <div className="actions memo-actions">
            <button
              type="button"
              className="primary"
              onClick={print}
              disabled={!ready}
              aria-describedby={`${id}-why ${id}-caution`}
              data-testid="memo-print"
            >
              {state.kind === 'printing' ? 'Printing the memo…' : 'Print memo'}
            </button>
            <span id={`${id}-why`} className={blocked ? 'why-disabled' : 'faint'} data-testid="memo-print-why">
              {blocked ? (
                <>
                  Cannot print yet: {blocked}
                  {initials === null ? (
                    <>
                      {' '}
                      (<a href={href({ page: 'settings' })}>set them in the settings</a>, or save a revision, which asks
                      for them once)
                    </>
                  ) : null}
                  .
                </>
              ) : initials ? (
                `Prepared by ${initials} (from the settings).`
              ) : null}
            </span>
          </div>
          <p className="faint" data-testid="memo-walkforward-note">
            The walk-forward test and its stresses are printed when the revision has walk-forward settings: running the
            test above keeps them in the draft, and saving puts them in the revision.
          </p>
          <p id={`${id}-caution`} className="memo-caution" data-testid="memo-caution">
            <strong>The memo carries these cautions:</strong> {CAUTIONS.join(' ')}
          </p>
          <div aria-live="polite" data-testid="memo-outcome">
            {state.kind === 'printing' ? (
              <p className="muted" role="status">
                <span className="spinner" aria-hidden="true" /> Computing revision {newest.number} and writing the PDF…
              </p>
            ) : state.kind === 'printed' ? (
              <p className="note done" role="status">
                {state.reused
                  ? `This memo was already printed with the same revision, data and options on ${formatInstant(state.memo.printedAt)}; the copy on file is listed below.`
                  : `Printed the memo of revision ${state.revision ?? '?'}; it is listed below.`}
              </p>
            ) : state.kind === 'failed' && !refusedField ? (
              <PrintRefusal error={state.error} />
            ) : null}
          </div>
        </div>
      )}
      <MemoList
        memos={memos}
        revisions={props.revisions}
        householdName={props.householdName}
        scenarioName={revision?.name ?? ''}
        titleId={`${id}-list`}
      />
    </section>
  );
});

/** A refusal of the service, in plain words, with the way out where there is one. */
function PrintRefusal({ error }: { error: unknown }) {
  const refusal = error instanceof ServiceCallError ? error : null;
  if (refusal?.where === 'preparedBy')
    return (
      <div className="note error" role="alert">
        The memo was not printed: it names the person who prepared it, and no initials are set.{' '}
        <a href={href({ page: 'settings' })}>Set your initials in the settings</a>, then print again.
      </div>
    );
  return (
    <div className="note error" role="alert">
      The memo was not printed: {refusal ? refusal.message : errorText(error)}.
    </div>
  );
}

function MemoList(props: {
  memos: MemoSummary[] | { error: unknown } | null;
  revisions: readonly RevisionSummary[];
  householdName: string;
  scenarioName: string;
  titleId: string;
}) {
  const [opening, setOpening] = useState<string | null>(null);
  const [failure, setFailure] = useState<{ memoId: string; error: unknown } | null>(null);
  const [saved, setSaved] = useState<{ memoId: string; text: string } | null>(null);
  const urls = useRef(new Set<string>());
  useEffect(() => {
    const live = urls.current;
    return () => {
      live.forEach((u) => URL.revokeObjectURL(u));
      live.clear();
    };
  }, []);

  const download = async (item: MemoSummary, revision: number | null) => {
    setOpening(item.id);
    setFailure(null);
    setSaved(null);
    try {
      const got = await api['memos.get']({ memoId: item.id });
      const blob = new Blob([base64Bytes(got.pdfBase64)], { type: 'application/pdf' });
      const url = URL.createObjectURL(blob);
      urls.current.add(url);
      const fileName = memoFileName({
        household: props.householdName,
        scenario: props.scenarioName,
        date: got.memo.printedAt.slice(0, 10),
        revision,
      });
      const link = document.createElement('a');
      link.href = url;
      link.download = fileName;
      link.rel = 'noopener';
      link.style.display = 'none';
      document.body.appendChild(link);
      link.click();
      link.remove();
      // The browser has taken the bytes once the download has started; free them soon after.
      setTimeout(() => {
        URL.revokeObjectURL(url);
        urls.current.delete(url);
      }, 30_000);
      setSaved({ memoId: item.id, text: `Offered as ${fileName}.` });
    } catch (error) {
      setFailure({ memoId: item.id, error });
    } finally {
      setOpening(null);
    }
  };

  // In the desktop window the memo opens in the system's PDF viewer, which also prints it.
  const viewer = window.holdfast?.openMemo;
  const openInViewer = async (item: MemoSummary) => {
    if (!viewer) return;
    setOpening(item.id);
    setFailure(null);
    setSaved(null);
    try {
      const answer = await viewer(item.id);
      if (answer.ok) setSaved({ memoId: item.id, text: `Opened in the PDF viewer from ${answer.path}.` });
      else setFailure({ memoId: item.id, error: new Error(answer.error.message) });
    } catch (error) {
      setFailure({ memoId: item.id, error });
    } finally {
      setOpening(null);
    }
  };

  const list = props.memos;
  return (
    <div className="memo-list">
      <h3 id={props.titleId}>Memos printed for this scenario</h3>
      {list === null ? (
        <p className="muted" role="status">
          Reading the printed memos…
        </p>
      ) : 'error' in list ? (
        <p className="note error" role="alert">
          The printed memos could not be listed: {errorText(list.error)}
        </p>
      ) : list.length === 0 ? (
        <p className="muted" data-testid="memo-list-empty">
          No memo printed yet for this scenario.
        </p>
      ) : (
        <table className="grid" aria-labelledby={props.titleId} data-testid="memo-list">
          <caption>
            Newest first. Each is kept exactly as printed; the memo hash is the one its footer prints, and the PDF
            file&apos;s own SHA-256 shows on pointing at it.
          </caption>
          <thead>
            <tr>
              <th scope="col">Printed</th>
              <th scope="col" className="num">
                Revision
              </th>
              <th scope="col">Prepared by</th>
              <th scope="col">Memo hash</th>
              <th scope="col" className="num">
                Size
              </th>
              <th scope="col">
                <span className="faint">Action</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {list.map((m) => {
              const rev = props.revisions.find((r) => r.hash === m.revisionHash);
              const number = rev?.number ?? null;
              return (
                <tr key={m.id} data-memo-id={m.id}>
                  <td className="tabular printed">{formatInstant(m.printedAt)}</td>
                  <td className="num">{number ?? <span className="faint">not found</span>}</td>
                  <td>
                    {m.preparedBy ??
                      (rev?.author ? (
                        <span title="printed before the preparer was kept: the initials that saved the revision">
                          {rev.author} (revision)
                        </span>
                      ) : (
                        <span className="faint">unknown</span>
                      ))}
                  </td>
                  <td className="code" title={`memo hash ${m.memoHash ?? 'not kept'}; PDF SHA-256 ${m.hash}`}>
                    {m.memoHash ? m.memoHash.slice(0, 12) : <span className="faint">PDF {m.hash.slice(0, 12)}</span>}
                  </td>
                  <td className="num tabular">{formatKilobytes(m.bytes)}</td>
                  <td>
                    <button
                      type="button"
                      className="quiet"
                      disabled={opening !== null}
                      onClick={() => void download(m, number)}
                      aria-label={`Download the PDF of the memo printed ${formatInstant(m.printedAt)}${number !== null ? ` from revision ${number}` : ''}`}
                    >
                      {opening === m.id ? 'Fetching…' : 'Download PDF'}
                    </button>
                    {viewer ? (
                      <button
                        type="button"
                        className="quiet"
                        disabled={opening !== null}
                        onClick={() => void openInViewer(m)}
                        aria-label={`Open the memo printed ${formatInstant(m.printedAt)} in the PDF viewer to read or print it`}
                      >
                        Open to print
                      </button>
                    ) : null}
                    {failure?.memoId === m.id ? (
                      <div className="reason" role="alert">
                        Not downloaded: {errorText(failure.error)}
                      </div>
                    ) : null}
                    {saved?.memoId === m.id ? (
                      <div className="hint" role="status">
                        {saved.text}
                      </div>
                    ) : null}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
    </div>
  );
}

function formatKilobytes(bytes: number): string {
  return `${new Intl.NumberFormat(undefined, { maximumFractionDigits: 0 }).format(Math.max(1, Math.round(bytes / 1024)))} KB`;
}
