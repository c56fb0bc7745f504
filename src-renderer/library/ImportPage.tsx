import { useEffect, useId, useRef, useState, type FormEvent } from 'react';
import type { ImportJob } from '../../shared-core/contract/service-api.js';
import { api } from '../bridge.js';
import { formatInstant } from '../../shared-core/present/format.js';
import { ErrorNote, errorText } from '../app/notes.js';
import { href } from '../app/route.js';
import { useLoad } from '../app/use-load.js';
import { ImportReportView } from './ImportReportView.js';

const RUNNING: ImportJob['state'][] = ['checking', 'applying'];
const POLL_MS = 150;

/**
 * Importing a price file: check it (nothing written), read the report, answer what must be
 * answered (day-first or month-first dates; whether changed closes replace stored ones), then
 * write it in one transaction, or cancel and leave the store as it was.
 */
export function ImportPage() {
  const id = useId();
  const universes = useLoad(() => api['universes.list']({}), []);
  const history = useLoad(() => api['imports.history']({}), []);
  const [file, setFile] = useState<File | null>(null);
  const [path, setPath] = useState('');
  const [universe, setUniverse] = useState('');
  const [currency, setCurrency] = useState('');
  const [job, setJob] = useState<ImportJob>();
  const [failure, setFailure] = useState<string>();
  const [dateOrder, setDateOrder] = useState<'day-first' | 'month-first'>();
  const [applyChanges, setApplyChanges] = useState(false);
  const timer = useRef<number | undefined>(undefined);

  const running = job !== undefined && RUNNING.includes(job.state);

  useEffect(() => {
    if (!job || !RUNNING.includes(job.state)) return;
    timer.current = window.setTimeout(async () => {
      try {
        setJob(await api['imports.status']({ jobId: job.jobId }));
      } catch (error) {
        setFailure(errorText(error));
      }
    }, POLL_MS);
    return () => window.clearTimeout(timer.current);
  }, [job]);

  useEffect(() => {
    if (job?.state === 'applied') {
      history.reload();
      universes.reload();
    }
  }, [job?.state]); // history and universes reload functions are stable

  const universeReason = universe.trim() ? undefined : 'name the universe the assets join';
  const currencyReason = currency === '' || /^[A-Z]{3}$/.test(currency) ? undefined : 'an ISO 4217 code, such as EUR';
  const sourceReason = file || path.trim() ? undefined : 'choose a file, or type its path on this machine';

  const start = async (event: FormEvent) => {
    event.preventDefault();
    if (universeReason || sourceReason || currencyReason) return;
    setFailure(undefined);
    setDateOrder(undefined);
    setApplyChanges(false);
    try {
      const source = file
        ? ({ kind: 'text', fileName: file.name, text: await file.text() } as const)
        : ({ kind: 'path', path: path.trim() } as const);
      setJob(await api['imports.start']({ source, universe: universe.trim(), ...(currency ? { currency } : {}) }));
    } catch (error) {
      setFailure(errorText(error));
    }
  };

  const confirm = async () => {
    if (!job) return;
    setFailure(undefined);
    try {
      setJob(await api['imports.confirm']({ jobId: job.jobId, dateOrder, applyChanges }));
    } catch (error) {
      setFailure(errorText(error));
    }
  };

  const cancel = async () => {
    if (!job) return;
    try {
      setJob(await api['imports.cancel']({ jobId: job.jobId }));
    } catch (error) {
      setFailure(errorText(error));
    }
  };

  const changed = job?.report?.assets.reduce((s, a) => s + a.changedValues, 0) ?? 0;
  const needsOrder = job?.state === 'needs-date-order';
  const canWrite = (job?.state === 'ready' || (needsOrder && dateOrder !== undefined)) && !running;
  const universeRecord = universes.data?.find((u) => u.name === job?.universe);

  return (
    <>
      <div className="page-head">
        <div>
          <h1>Import a price file</h1>
          <p className="muted">
            CSV with a date column and one column per asset, or rows of date, asset and close. Checked first; nothing is
            written until you confirm.
          </p>
        </div>
      </div>

      <form className="sheet section" onSubmit={start} noValidate aria-label="Price file to import">
        <div className="form-grid">
          <div className="field">
            <label htmlFor={`${id}-file`}>Price file</label>
            <input
              id={`${id}-file`}
              type="file"
              accept=".csv,.tsv,.txt,text/csv,text/plain"
              disabled={running}
              onChange={(e) => setFile(e.target.files?.[0] ?? null)}
            />
          </div>
          <div className="field">
            <label htmlFor={`${id}-path`}>or its path on this machine</label>
            <input
              id={`${id}-path`}
              type="text"
              value={path}
              disabled={running || file !== null}
              onChange={(e) => setPath(e.target.value)}
              placeholder="/home/advisor/prices.csv"
              size={32}
            />
          </div>
          <div className="field">
            <label htmlFor={`${id}-universe`}>Add the assets to universe</label>
            <input
              id={`${id}-universe`}
              type="text"
              list={`${id}-universes`}
              value={universe}
              disabled={running}
              onChange={(e) => setUniverse(e.target.value)}
              autoComplete="off"
              size={34}
            />
            <datalist id={`${id}-universes`}>
              {(universes.data ?? []).map((u) => (
                <option key={u.id} value={u.name} />
              ))}
            </datalist>
            <div className="hint">An existing universe, or a new name to create one.</div>
          </div>
          <div className="field">
            <label htmlFor={`${id}-ccy`}>Price currency of new assets</label>
            <input
              id={`${id}-ccy`}
              type="text"
              value={currency}
              maxLength={3}
              size={5}
              disabled={running}
              onChange={(e) => setCurrency(e.target.value.toUpperCase())}
              aria-invalid={currencyReason ? true : undefined}
            />
            {currencyReason ? (
              <div className="reason">{currencyReason}</div>
            ) : (
              <div className="hint">Optional; assets already stored keep theirs.</div>
            )}
          </div>
        </div>
        <div className="actions">
          <button
            type="submit"
            className="primary"
            disabled={running || !!universeReason || !!sourceReason || !!currencyReason}
          >
            Check the file
          </button>
          {sourceReason || universeReason ? (
            <span className="faint">To start: {sourceReason ?? universeReason}.</span>
          ) : null}
        </div>
      </form>

      {failure ? (
        <div className="note error" role="alert">
          {failure}
        </div>
      ) : null}

      {job ? (
        <section className="section" aria-labelledby={`${id}-job`}>
          <div className="section-head">
            <h2 id={`${id}-job`}>
              {job.fileName} <span className="muted">into {job.universe}</span>
            </h2>
            <span className="faint">{stateWords(job)}</span>
          </div>
          <Progress job={job} />
          {job.message ? (
            <div
              className={`note ${job.state === 'applied' ? 'done' : job.state === 'cancelled' ? 'warning' : 'error'}`}
              role="status"
            >
              {job.message}
            </div>
          ) : null}
          {job.state === 'applied' && job.applied ? (
            <div className="note done" role="status">
              Written: {job.applied.pricesAdded.toLocaleString()} closes added,{' '}
              {job.applied.pricesChanged.toLocaleString()} replaced, {job.applied.assetsAdded} new asset
              {job.applied.assetsAdded === 1 ? '' : 's'}.{' '}
              {universeRecord ? (
                <a href={href({ page: 'library', universeId: universeRecord.id })}>See {job.universe}</a>
              ) : null}
            </div>
          ) : null}
          {job.report ? <ImportReportView report={job.report} /> : null}
          {needsOrder ? (
            <fieldset className="sheet" style={{ margin: '0.8rem 0' }}>
              <legend>
                <strong>How are the dates written?</strong>
              </legend>
              <p className="hint">
                Every date in this file reads as a valid day both ways (for example 03/04/2024). Choose; Holdfast does
                not guess.
              </p>
              <label>
                <input
                  type="radio"
                  name={`${id}-order`}
                  checked={dateOrder === 'day-first'}
                  onChange={() => setDateOrder('day-first')}
                />{' '}
                day first (31/12/2024)
              </label>
              <label>
                <input
                  type="radio"
                  name={`${id}-order`}
                  checked={dateOrder === 'month-first'}
                  onChange={() => setDateOrder('month-first')}
                />{' '}
                month first (12/31/2024)
              </label>
            </fieldset>
          ) : null}
          {(job.state === 'ready' || needsOrder) && changed > 0 ? (
            <label style={{ margin: '0.6rem 0' }}>
              <input type="checkbox" checked={applyChanges} onChange={(e) => setApplyChanges(e.target.checked)} /> Also
              replace the {changed.toLocaleString()} stored close{changed === 1 ? '' : 's'} that this file gives
              differently (otherwise only new dates are added)
            </label>
          ) : null}
          <div className="actions" style={{ marginTop: '0.6rem' }}>
            {job.state === 'ready' || needsOrder ? (
              <button type="button" className="primary" onClick={confirm} disabled={!canWrite}>
                Write to the store
              </button>
            ) : null}
            {running || job.state === 'ready' || needsOrder ? (
              <button type="button" onClick={cancel}>
                Cancel the import
              </button>
            ) : null}
          </div>
        </section>
      ) : null}

      <section className="section" aria-labelledby={`${id}-history`}>
        <div className="section-head">
          <h2 id={`${id}-history`}>Earlier imports</h2>
        </div>
        {history.error ? <ErrorNote error={history.error} /> : null}
        {history.data && history.data.length === 0 ? <p className="muted">None yet.</p> : null}
        {history.data && history.data.length > 0 ? (
          <table className="grid">
            <thead>
              <tr>
                <th scope="col">Written</th>
                <th scope="col">File</th>
                <th scope="col" className="num">
                  Assets
                </th>
                <th scope="col" className="num">
                  Closes added
                </th>
                <th scope="col" className="num">
                  Replaced
                </th>
              </tr>
            </thead>
            <tbody>
              {history.data.map((b) => (
                <tr key={b.id}>
                  <td className="tabular">{formatInstant(b.importedAt)}</td>
                  <td className="code">{b.source}</td>
                  <td className="num">{b.assets}</td>
                  <td className="num">{b.added.toLocaleString()}</td>
                  <td className="num">{b.replaced.toLocaleString()}</td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}
      </section>
    </>
  );
}

function stateWords(job: ImportJob): string {
  switch (job.state) {
    case 'checking':
      return 'Checking the file; nothing is written yet';
    case 'ready':
      return 'Checked; nothing written yet';
    case 'needs-date-order':
      return 'Checked; the date order needs your answer';
    case 'invalid':
      return 'Cannot be imported as it is; nothing written';
    case 'applying':
      return 'Writing to the store';
    case 'applied':
      return 'Written to the store';
    case 'cancelled':
      return 'Cancelled; the store is as it was';
    case 'failed':
      return 'Failed; the store is as it was';
  }
}

function Progress({ job }: { job: ImportJob }) {
  const percent = Math.max(0, Math.min(100, job.progress.percent));
  const label = job.state === 'applying' || job.state === 'applied' ? 'Writing' : 'Checking';
  return (
    <div className="progress" style={{ margin: '0.5rem 0 0.9rem' }}>
      <div
        className="progress-track"
        role="progressbar"
        aria-label={`${label} progress`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(percent)}
        aria-valuetext={`${percent.toFixed(0)}%, ${job.progress.rows.toLocaleString()} rows`}
      >
        <div className="progress-fill" style={{ width: `${percent}%` }} />
      </div>
      <span className="tabular muted" data-testid="import-progress">
        {label}: {percent.toFixed(0)}% · {job.progress.rows.toLocaleString()} rows
      </span>
    </div>
  );
}
