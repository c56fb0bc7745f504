import { useMemo, useState } from 'react';
import {
  resolveColumns,
  reviewColumns,
  sortReviewRows,
  STATUS_WORDS,
  type ReviewColumn,
} from '../../shared-core/review/columns.js';
import type { ReviewRow } from '../../shared-core/review/review-row.js';
import { DASH } from '../../shared-core/present/format.js';
import { api } from '../bridge.js';
import { ErrorNote, Loading } from '../app/notes.js';
import { href } from '../app/route.js';
import { useLoad } from '../app/use-load.js';
import { formatDate, formatDateTime, parsePercentInput, percentInputText } from '../scenario/format.js';
import './book.css';

/**
 * The book at a glance: every household against the recommendation it follows, on the latest
 * prices, from the one review use case (the same rows as `holdfast review`). Sorted by any
 * column, filtered to those needing attention; each row opens its household, and its review
 * line keeps the advisor's tolerance and note and marks it reviewed.
 */
export function BookPage() {
  const [resolve, setResolve] = useState(false);
  const review = useLoad(() => api['book.review']({ resolve }), [resolve]);
  const [onlyAttention, setOnlyAttention] = useState(false);
  const [sort, setSort] = useState<{ key: string; descending: boolean }>({ key: 'status', descending: false });
  const [open, setOpen] = useState<string | null>(null);
  const columns = useMemo(() => [...reviewColumns, ...(resolve ? resolveColumns : [])], [resolve]);
  const primaries = useMemo(() => columns.filter((c) => c.onScreen === undefined), [columns]);
  const rows = useMemo(() => {
    const all = review.data?.rows ?? [];
    const shown = onlyAttention ? all.filter((r) => r.status !== 'ok') : all;
    const column = columns.find((c) => c.key === sort.key) ?? columns[0];
    return sortReviewRows(shown, column, sort.descending);
  }, [review.data, onlyAttention, sort, columns]);
  const attention = review.data?.rows.filter((r) => r.status !== 'ok').length ?? 0;

  return (
    <>
      <div className="page-head">
        <div>
          <h1>Book review</h1>
          <p className="muted">
            Every household against the recommendation it follows, on the latest prices: drift, risk, mandate limits and
            whether its memo still holds. Reading this page changes nothing in the store.
          </p>
        </div>
      </div>
      <div className="book-controls" role="group" aria-label="What the table shows">
        <label>
          Sort by{' '}
          <select value={sort.key} onChange={(e) => setSort({ key: e.target.value, descending: sort.descending })}>
            {columns.map((c) => (
              <option key={c.key} value={c.key}>
                {c.heading}
              </option>
            ))}
          </select>
        </label>
        <button type="button" className="quiet" onClick={() => setSort({ ...sort, descending: !sort.descending })}>
          {sort.descending ? 'Descending' : 'Ascending'}
        </button>
        <label>
          <input type="checkbox" checked={onlyAttention} onChange={(e) => setOnlyAttention(e.target.checked)} /> Only
          households that need attention
        </label>
        <label>
          <input type="checkbox" checked={resolve} onChange={(e) => setResolve(e.target.checked)} /> Re-solve each
          recommendation on the latest prices
        </label>
      </div>
      {review.error ? <ErrorNote error={review.error} /> : null}
      {review.loading && !review.data ? <Loading what="the book review" /> : null}
      {review.data && review.data.rows.length === 0 ? (
        <div className="sheet">
          <p>
            No household yet. <a href={href({ page: 'household-new' })}>Create one</a>, record its holdings and save a
            scenario that recommends a candidate; it then appears here.
          </p>
        </div>
      ) : null}
      {review.data && review.data.rows.length > 0 ? (
        <table className="grid book-table">
          <caption>
            {attention === 0
              ? `All ${review.data.rows.length} households are in order.`
              : `${attention} of ${review.data.rows.length} households need attention.`}{' '}
            Figures in each scenario's base currency; volatility annualised; drift is the sum of |current − target|
            against the household's tolerance.
            {review.loading ? ' Updating…' : ''}
          </caption>
          <thead>
            <tr>
              {primaries.map((c) => (
                <SortHeading key={c.key} column={c} sort={sort} onSort={setSort} />
              ))}
              <th scope="col">Review</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <BookRow
                key={r.householdId}
                row={r}
                columns={columns}
                primaries={primaries}
                open={open === r.householdId}
                onToggle={() => setOpen(open === r.householdId ? null : r.householdId)}
                onSaved={review.reload}
              />
            ))}
          </tbody>
        </table>
      ) : null}
    </>
  );
}

function SortHeading({
  column,
  sort,
  onSort,
}: {
  column: ReviewColumn;
  sort: { key: string; descending: boolean };
  onSort: (s: { key: string; descending: boolean }) => void;
}) {
  const active = sort.key === column.key;
  return (
    <th
      scope="col"
      className={column.numeric ? 'num' : undefined}
      aria-sort={active ? (sort.descending ? 'descending' : 'ascending') : 'none'}
    >
      <button
        type="button"
        className="sort-button"
        onClick={() => onSort({ key: column.key, descending: active ? !sort.descending : false })}
      >
        {column.heading}
        <span aria-hidden="true">{active ? (sort.descending ? ' ▼' : ' ▲') : ''}</span>
      </button>
    </th>
  );
}

function BookRow({
  row,
  columns,
  primaries,
  open,
  onToggle,
  onSaved,
}: {
  row: ReviewRow;
  columns: readonly ReviewColumn[];
  primaries: readonly ReviewColumn[];
  open: boolean;
  onToggle: () => void;
  onSaved: () => void;
}) {
  return (
    <>
      <tr className={`book-${row.status}`}>
        {primaries.map((c) => {
          const under = columns.filter((u) => typeof u.onScreen === 'object' && u.onScreen.under === c.key);
          // A figure that cannot be computed is said once, in its column, not again under it.
          const below = under
            .filter((u) => u.text(row) !== DASH)
            .map((u) => {
              const place = u.onScreen as { before?: string; after?: string };
              return (
                <span key={u.key} className="book-below" title={u.heading}>
                  {place.before ?? ''}
                  {u.text(row)}
                  {place.after ?? ''}
                </span>
              );
            });
          if (c.key === 'household')
            return (
              <th key={c.key} scope="row">
                <a href={href({ page: 'household', householdId: row.householdId })}>{row.household}</a>
                {below}
              </th>
            );
          if (c.key === 'status')
            return (
              <td key={c.key}>
                <span className={row.status === 'ok' ? 'status-ok' : 'flag'}>{STATUS_WORDS[row.status]}</span>
                {row.reasons.length > 0 ? (
                  <ul className="book-reasons">
                    {row.reasons.map((reason) => (
                      <li key={reason}>{reason}</li>
                    ))}
                  </ul>
                ) : null}
              </td>
            );
          return (
            <td key={c.key} className={c.numeric ? 'num' : undefined}>
              {onScreenText(c, row)}
              {below}
            </td>
          );
        })}
        <td>
          <button type="button" className="quiet" aria-expanded={open} onClick={onToggle}>
            {open ? 'Close' : 'Review…'}
          </button>
        </td>
      </tr>
      {open ? (
        <tr className="book-review-line">
          <td colSpan={primaries.length + 1}>
            <ReviewForm row={row} onSaved={onSaved} />
          </td>
        </tr>
      ) : null}
    </>
  );
}

/** The advisor's tolerance and note for one household, and "mark as reviewed". */
function ReviewForm({ row, onSaved }: { row: ReviewRow; onSaved: () => void }) {
  const [tolerance, setTolerance] = useState(percentInputText(row.tolerance));
  const [note, setNote] = useState(row.note ?? '');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const parsed = parsePercentInput(tolerance);
  const toleranceProblem =
    parsed === null
      ? 'the drift tolerance must be a number of per cent, such as 5'
      : parsed <= 0
        ? 'the drift tolerance must be above 0 %'
        : parsed > 2
          ? 'the drift tolerance must be at most 200 %'
          : null;
  const save = async (reviewed: boolean) => {
    if (toleranceProblem) return;
    setBusy(true);
    setError(null);
    try {
      await api['book.setReview']({
        householdId: row.householdId,
        driftTolerance: parsed,
        note: note.trim() === '' ? null : note.trim(),
        ...(reviewed ? { reviewed: true } : {}),
      });
      onSaved();
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(false);
    }
  };
  return (
    <form className="book-review-form" onSubmit={(e) => (e.preventDefault(), void save(false))}>
      <label>
        Drift tolerance, %
        <input
          inputMode="decimal"
          size={6}
          value={tolerance}
          aria-invalid={toleranceProblem !== null}
          onChange={(e) => setTolerance(e.target.value)}
        />
      </label>
      <label className="book-note">
        Review note
        <input value={note} maxLength={2000} onChange={(e) => setNote(e.target.value)} />
      </label>
      <button type="submit" disabled={busy || toleranceProblem !== null}>
        Save
      </button>
      <button
        type="button"
        className="primary"
        disabled={busy || toleranceProblem !== null}
        onClick={() => void save(true)}
      >
        Mark as reviewed
      </button>
      <span className="muted">
        {row.reviewedAt ? `Last reviewed ${formatDateTime(row.reviewedAt)}` : 'Not reviewed yet'}
      </span>
      {toleranceProblem ? <p className="field-error">{toleranceProblem}</p> : null}
      {error ? <p className="field-error">{error}</p> : null}
    </form>
  );
}

/** Dates in the reader's locale on screen; the command line and the CSV keep ISO 8601. */
function onScreenText(column: ReviewColumn, row: ReviewRow): string {
  if (column.key === 'reviewed') return row.reviewedAt ? formatDate(row.reviewedAt.slice(0, 10)) : column.text(row);
  if (column.key === 'memo' && row.memo) {
    const day = row.memo.printedAt.slice(0, 10);
    return column.text(row).replace(day, formatDate(day));
  }
  return column.text(row);
}
