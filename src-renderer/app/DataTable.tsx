import { useState, type ReactNode } from 'react';
import { formatPercent } from '../scenario/format.js';

/**
 * One table for the screens: every row at the page's height (no inner scroll box, which would hide
 * rows and stop the header from sticking), the header sticking to the top of the window as the
 * page scrolls, figures right-aligned in tabular numerals, a sentence in place of an empty table,
 * and columns that sort on a click of their header where a sort key is given.
 */
export interface Column<R> {
  key: string;
  head: ReactNode;
  cell: (row: R) => ReactNode;
  /** A figure column: right-aligned, tabular numerals. */
  num?: boolean;
  /** The cell that names the row (a row header for screen readers). */
  rowHead?: boolean;
  /** The value the column sorts by; without it the column does not sort. */
  sortBy?: (row: R) => number | string;
  className?: string;
}

type Sort = { key: string; descending: boolean } | null;

export function DataTable<R>(props: {
  caption?: ReactNode;
  columns: readonly (Column<R> | false | null | undefined)[];
  rows: readonly R[];
  rowKey: (row: R, index: number) => string;
  /** Said instead of the table when there is no row. */
  empty: ReactNode;
  /** Rows under the body (totals). */
  foot?: ReactNode;
  className?: string;
  testId?: string;
  /** Extra attributes of a row (a selected row, a test id). */
  rowProps?: (row: R) => React.HTMLAttributes<HTMLTableRowElement> & Record<`data-${string}`, string>;
}) {
  const [sort, setSort] = useState<Sort>(null);
  const columns = props.columns.filter((c): c is Column<R> => !!c);
  if (props.rows.length === 0) return <p className="faint empty-table">{props.empty}</p>;
  const by = sort ? columns.find((c) => c.key === sort.key)?.sortBy : undefined;
  const rows = by && sort ? sortedRows(props.rows, by, sort.descending) : props.rows;
  const cls = (c: Column<R>) => [c.num ? 'num' : '', c.className ?? ''].join(' ').trim() || undefined;
  return (
    <table className={`grid data-table${props.className ? ` ${props.className}` : ''}`} data-testid={props.testId}>
      {props.caption ? <caption>{props.caption}</caption> : null}
      <thead>
        <tr>
          {columns.map((c) => {
            const sorted = sort?.key === c.key ? (sort.descending ? 'descending' : 'ascending') : undefined;
            return (
              <th
                key={c.key}
                scope="col"
                className={c.num ? 'num' : undefined}
                aria-sort={c.sortBy ? (sorted ?? 'none') : undefined}
              >
                {c.sortBy ? (
                  <button
                    type="button"
                    className="sort-head"
                    onClick={() =>
                      setSort(
                        sort?.key === c.key
                          ? { key: c.key, descending: !sort.descending }
                          : { key: c.key, descending: !!c.num },
                      )
                    }
                  >
                    {c.head}
                    <span aria-hidden="true" className="sort-mark">
                      {sorted === 'ascending' ? ' ▲' : sorted === 'descending' ? ' ▼' : ''}
                    </span>
                  </button>
                ) : (
                  c.head
                )}
              </th>
            );
          })}
        </tr>
      </thead>
      <tbody>
        {rows.map((row, i) => (
          <tr key={props.rowKey(row, i)} {...props.rowProps?.(row)}>
            {columns.map((c) =>
              c.rowHead ? (
                <th key={c.key} scope="row" className={cls(c)}>
                  {c.cell(row)}
                </th>
              ) : (
                <td key={c.key} className={cls(c)}>
                  {c.cell(row)}
                </td>
              ),
            )}
          </tr>
        ))}
      </tbody>
      {props.foot ? <tfoot>{props.foot}</tfoot> : null}
    </table>
  );
}

/** Rows in the order of a column's values (a stable sort; text in the user's collation). */
export function sortedRows<R>(rows: readonly R[], by: (row: R) => number | string, descending: boolean): R[] {
  const sign = descending ? -1 : 1;
  return rows
    .map((row, i) => ({ row, i, v: by(row) }))
    .sort((a, b) => {
      const d = typeof a.v === 'number' && typeof b.v === 'number' ? a.v - b.v : String(a.v).localeCompare(String(b.v));
      return d !== 0 ? sign * d : a.i - b.i;
    })
    .map((x) => x.row);
}

/** A column of weights or shares in per cent with one decimal, sortable. */
export function percentColumn<R>(
  key: string,
  head: ReactNode,
  value: (row: R) => number,
  locale: string | undefined,
): Column<R> {
  return { key, head, num: true, sortBy: value, cell: (row) => formatPercent(value(row), locale) };
}
