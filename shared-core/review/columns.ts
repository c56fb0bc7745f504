import { DASH, formatFixed, formatPct, formatSignedPct } from '../present/format.js';
import type { ReviewRow } from './review-row.js';

/**
 * The book review's columns, defined once for the command line's table, its CSV and the book
 * screen: each gives its heading, its text and the value it sorts by. Figures are printed by the
 * one formatter (present/format.ts); a figure that cannot be computed prints as "–" and sorts last.
 */
export interface ReviewColumn {
  key: string;
  heading: string;
  /** Right-aligned figures, left-aligned words. */
  numeric: boolean;
  text(row: ReviewRow): string;
  /** What the column sorts by; null sorts last whichever the direction. */
  sortValue(row: ReviewRow): number | string | null;
  /**
   * On the screen, a column printed under another's figure (by key) to keep the table within
   * the page, or 'reasons' when the status column's list of reasons already says it.
   */
  onScreen?: { under: string; before?: string; after?: string } | 'reasons';
}

const pctOr = (v: number | undefined) => (v === undefined ? DASH : formatPct(v));
const ratioOr = (v: number | undefined) => (v === undefined ? DASH : formatFixed(v, 2));
const change = (now: number | undefined, then: number | undefined, points: boolean) =>
  now === undefined || then === undefined
    ? DASH
    : points
      ? formatSignedPct(now - then)
      : `${now - then >= 0 ? '+' : ''}${formatFixed(now - then, 2)}`;

export const STATUS_WORDS: Record<ReviewRow['status'], string> = {
  ok: 'in order',
  attention: 'needs attention',
  'cannot-compute': 'cannot be computed',
};

export const reviewColumns: readonly ReviewColumn[] = [
  {
    key: 'household',
    heading: 'Household',
    numeric: false,
    text: (r) => r.household,
    sortValue: (r) => r.household.toLowerCase(),
  },
  {
    key: 'status',
    heading: 'Status',
    numeric: false,
    text: (r) => STATUS_WORDS[r.status],
    sortValue: (r) => ({ 'cannot-compute': 0, attention: 1, ok: 2 })[r.status],
  },
  {
    key: 'follows',
    heading: 'Follows',
    numeric: false,
    text: (r) => (r.followed ? `${r.followed.scenario} r${r.followed.revision}: ${r.followed.candidate}` : DASH),
    sortValue: (r) => (r.followed ? r.followed.scenario.toLowerCase() : null),
    onScreen: { under: 'household' },
  },
  {
    key: 'drift',
    heading: 'Drift',
    numeric: true,
    text: (r) => (r.figures ? `${formatPct(r.figures.drift.total)} of ${formatPct(r.tolerance)}` : DASH),
    sortValue: (r) => r.figures?.drift.total ?? null,
  },
  {
    key: 'largestGap',
    heading: 'Largest gap',
    numeric: false,
    text: (r) =>
      r.figures?.drift.largest
        ? `${r.figures.drift.largest.asset} ${formatSignedPct(r.figures.drift.largest.gap)}`
        : DASH,
    sortValue: (r) => (r.figures?.drift.largest ? Math.abs(r.figures.drift.largest.gap) : null),
    onScreen: { under: 'drift', before: 'largest ' },
  },
  {
    key: 'volatility',
    heading: 'Volatility, holdings / recommended',
    numeric: true,
    text: (r) =>
      r.figures
        ? `${pctOr(r.figures.currentRisk.now.volatility)} / ${pctOr(r.figures.recommendedRisk.now.volatility)}`
        : DASH,
    sortValue: (r) => r.figures?.currentRisk.now.volatility ?? null,
  },
  {
    key: 'volatilityChange',
    heading: 'Holdings volatility since saved',
    numeric: true,
    text: (r) => change(r.figures?.currentRisk.now.volatility, r.figures?.currentRisk.then.volatility, true),
    sortValue: (r) =>
      r.figures ? Math.abs(r.figures.currentRisk.now.volatility - r.figures.currentRisk.then.volatility) : null,
    onScreen: { under: 'volatility', after: ' since saved' },
  },
  {
    key: 'diversificationRatio',
    heading: 'DR, holdings / recommended',
    numeric: true,
    text: (r) =>
      r.figures
        ? `${ratioOr(r.figures.currentRisk.now.diversificationRatio)} / ${ratioOr(r.figures.recommendedRisk.now.diversificationRatio)}`
        : DASH,
    sortValue: (r) => r.figures?.currentRisk.now.diversificationRatio ?? null,
  },
  {
    key: 'diversificationRatioChange',
    heading: 'Holdings DR since saved',
    numeric: true,
    text: (r) =>
      change(r.figures?.currentRisk.now.diversificationRatio, r.figures?.currentRisk.then.diversificationRatio, false),
    sortValue: (r) =>
      r.figures
        ? Math.abs(r.figures.currentRisk.now.diversificationRatio - r.figures.currentRisk.then.diversificationRatio)
        : null,
    onScreen: { under: 'diversificationRatio', after: ' since saved' },
  },
  {
    key: 'breaches',
    heading: 'Limits broken',
    numeric: false,
    text: (r) =>
      r.figures ? (r.figures.breaches.length ? r.figures.breaches.map((b) => b.text).join('; ') : 'none') : DASH,
    sortValue: (r) => (r.figures ? r.figures.breaches.length : null),
    onScreen: 'reasons',
  },
  {
    key: 'memo',
    heading: 'Last memo',
    numeric: false,
    text: (r) => {
      if (!r.memo) return 'none';
      const changed = Object.entries(r.memo.changedSince)
        .filter(([, yes]) => yes)
        .map(([what]) => what);
      return `${r.memo.printedAt.slice(0, 10)}${changed.length ? `, since then: ${changed.join(', ')}` : ', current'}`;
    },
    sortValue: (r) => r.memo?.printedAt ?? null,
  },
  {
    key: 'reviewed',
    heading: 'Reviewed',
    numeric: false,
    text: (r) => (r.reviewedAt ? r.reviewedAt.slice(0, 10) : 'never'),
    sortValue: (r) => r.reviewedAt,
  },
];

/** The resolve columns, shown only when the review re-solved the recommendations. */
export const resolveColumns: readonly ReviewColumn[] = [
  {
    key: 'optimumMoved',
    heading: 'Optimum moved, sum |Δw|',
    numeric: true,
    text: (r) => {
      const s = r.figures?.resolved;
      if (!s) return DASH;
      return s.status === 'optimal' ? formatPct(s.moved) : 'not solved';
    },
    sortValue: (r) => (r.figures?.resolved?.status === 'optimal' ? r.figures.resolved.moved : null),
  },
  {
    key: 'optimumDrChange',
    heading: 'DR gained by re-solving',
    numeric: true,
    text: (r) => {
      const s = r.figures?.resolved;
      return s && s.status === 'optimal' ? change(s.diversificationRatioChange, 0, false) : DASH;
    },
    sortValue: (r) =>
      r.figures?.resolved?.status === 'optimal' ? r.figures.resolved.diversificationRatioChange : null,
    onScreen: { under: 'optimumMoved', before: 'DR ' },
  },
];

/** Rows sorted by a column; figures that cannot be computed go last in either direction. */
export function sortReviewRows(rows: readonly ReviewRow[], column: ReviewColumn, descending = false): ReviewRow[] {
  return [...rows].sort((a, b) => {
    const x = column.sortValue(a);
    const y = column.sortValue(b);
    if (x === null || y === null) return x === y ? 0 : x === null ? 1 : -1;
    const order = x < y ? -1 : x > y ? 1 : 0;
    return descending ? -order : order;
  });
}
