import Database from 'better-sqlite3';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { generateBook } from '../../../shared-core/demo/book.js';
import { reviewColumns, sortReviewRows } from '../../../shared-core/review/columns.js';
import type { ReviewRow } from '../../../shared-core/review/review-row.js';
import { reviewBook } from '../../../src-main/app/review-book.js';
import { createBookStore } from '../../../src-main/demo/create-book-store.js';
import { createService } from '../../../src-main/service/create-service.js';
import { migrate } from '../../../src-main/store/migrations.js';
import { openStore, type Store } from '../../../src-main/store/store.js';
import { runCliInProcess } from '../../support/run-cli-in-process.js';
import { useTempDir } from '../store/temp-dir.js';

const tempDir = useTempDir();
const fixtures = join(import.meta.dirname, '../../reference/fixtures/review');

/** numpy + cvxopt figures from the same book (test/reference/review/review_reference.py). */
const reference = JSON.parse(readFileSync(join(fixtures, 'book-review.json'), 'utf8')) as {
  households: {
    household: string;
    target: Record<string, number>;
    current: Record<string, number>;
    drift: { total: number; largest: { asset: string; gap: number } };
    currentRisk: Record<'then' | 'now', { volatility: number; diversificationRatio: number }>;
    recommendedRisk: Record<'then' | 'now', { volatility: number; diversificationRatio: number }>;
  }[];
};

function bookStore(): { store: Store; path: string } {
  const path = join(tempDir(), 'book.hfstore');
  const { store } = createBookStore(path);
  return { store, path };
}

const fileHash = (path: string) => createHash('sha256').update(readFileSync(path)).digest('hex');

describe('the book review on an invented book of 12 households (seeded)', () => {
  let rows: ReviewRow[];
  const book = generateBook();
  beforeAll(() => {
    const dir = join(process.env.TMPDIR ?? '/tmp', `holdfast-book-${process.pid}`);
    const { store } = createBookStore(`${dir}.hfstore`);
    rows = reviewBook(store).rows;
    store.close();
  });

  it('the seed gives the book the reference script read (the committed input)', () => {
    const committed = JSON.parse(readFileSync(join(fixtures, 'book-input.json'), 'utf8'));
    expect(JSON.parse(JSON.stringify(book))).toEqual(committed);
  });

  it('has mixed base currencies and every kind of row', () => {
    expect(rows).toHaveLength(12);
    expect(new Set(rows.map((r) => r.followed?.baseCurrency))).toEqual(new Set(['EUR', 'USD', 'GBP']));
    const byKind = (kind: string) => book.households.filter((h) => h.kind === kind).map((h) => h.name);
    const row = (name: string) => rows.find((r) => r.household === name)!;
    for (const name of byKind('on-target')) {
      expect(row(name).status).toBe('ok');
      expect(row(name).figures!.drift.total).toBeLessThan(1e-6);
    }
    for (const name of byKind('breach')) {
      expect(row(name).status).toBe('attention');
      expect(row(name).figures!.breaches.some((b) => b.kind === 'cap')).toBe(true);
    }
    for (const name of byKind('drifted')) expect(row(name).reasons.some((r) => r.startsWith('drift '))).toBe(true);
  });

  it('a household with no holdings says so, with no figures', () => {
    const none = rows.find((r) => r.holdings === 0)!;
    expect(none.figures).toBeNull();
    expect(none.status).toBe('attention');
    expect(none.reasons).toEqual(['no holdings on file: nothing to compare with the recommendation']);
  });

  it('a recommendation that cannot be computed is shown as such, never as zero', () => {
    const bad = rows.find((r) => r.status === 'cannot-compute')!;
    expect(bad.figures).toBeNull();
    expect(bad.reasons[0]).toMatch(/^cannot be computed: the recommended candidate 'sample-maxdiv' ends infeasible/);
    for (const column of reviewColumns.filter((c) => c.numeric)) expect(column.text(bad)).toBe('\u2013');
  });

  it('drift, targets and risk agree with numpy + cvxopt on the same holdings and prices (1e-6)', () => {
    expect(reference.households.length).toBeGreaterThanOrEqual(6);
    for (const ref of reference.households) {
      const f = rows.find((r) => r.household === ref.household)!.figures!;
      for (const [asset, w] of Object.entries(ref.target)) expect(f.target[asset] ?? 0).toBeCloseTo(w, 6);
      for (const [asset, w] of Object.entries(ref.current)) expect(f.current[asset]).toBeCloseTo(w, 12);
      expect(f.drift.total).toBeCloseTo(ref.drift.total, 6);
      expect(f.drift.largest!.asset).toBe(ref.drift.largest.asset);
      expect(f.drift.largest!.gap).toBeCloseTo(ref.drift.largest.gap, 6);
      for (const when of ['then', 'now'] as const) {
        expect(f.currentRisk[when].volatility).toBeCloseTo(ref.currentRisk[when].volatility, 12);
        expect(f.currentRisk[when].diversificationRatio).toBeCloseTo(ref.currentRisk[when].diversificationRatio, 11);
        expect(f.recommendedRisk[when].volatility).toBeCloseTo(ref.recommendedRisk[when].volatility, 7);
        expect(f.recommendedRisk[when].diversificationRatio).toBeCloseTo(
          ref.recommendedRisk[when].diversificationRatio,
          7,
        );
      }
    }
  });

  it('sorts by any column, figures that cannot be computed last in both directions', () => {
    const drift = reviewColumns.find((c) => c.key === 'drift')!;
    for (const descending of [false, true]) {
      const sorted = sortReviewRows(rows, drift, descending);
      const values = sorted.map((r) => r.figures?.drift.total ?? null);
      const known = values.filter((v): v is number => v !== null);
      expect(values.slice(known.length).every((v) => v === null)).toBe(true);
      expect(known).toEqual([...known].sort((a, b) => (descending ? b - a : a - b)));
    }
  });
});

describe('holdfast review', () => {
  it('prints the table, exits 4 when a household needs attention, and writes nothing to the store', async () => {
    const { store, path } = bookStore();
    store.close();
    const before = fileHash(path);
    const dir = join(path, '..');
    const out = await runCliInProcess(['review', '--store', 'book.hfstore', '--csv', 'book.csv'], dir);
    expect(out.code).toBe(4);
    expect(out.stdout).toMatch(/^Household +Status +Follows/);
    expect(out.stdout).toContain('needs attention');
    expect(out.stdout).toContain('cannot be computed');
    expect(out.stderr).toContain('holdfast review: 12 of 12 households');
    const csv = readFileSync(join(dir, 'book.csv'), 'utf8').split('\r\n');
    expect(csv[0].split(',').slice(0, 3)).toEqual(['Household', 'Status', 'Follows']);
    expect(csv).toHaveLength(12 + 2);
    expect(fileHash(path)).toBe(before);
  });

  it('exits 0 when every household is in order, and --json gives the rows', async () => {
    const { store, path } = bookStore();
    const book = generateBook();
    for (const h of book.households) if (h.kind !== 'on-target') store.deleteHousehold(store.getHousehold(h.name)!.id);
    store.close();
    const out = await runCliInProcess(['review', '--store', 'book.hfstore', '--json'], join(path, '..'));
    expect(out.code).toBe(0);
    const parsed = JSON.parse(out.stdout) as { rows: ReviewRow[] };
    expect(parsed.rows.map((r) => r.status)).toEqual(parsed.rows.map(() => 'ok'));
  });

  it('--resolve re-solves each recommendation on the latest prices and reports how far it moved', async () => {
    const { store, path } = bookStore();
    store.close();
    const out = await runCliInProcess(['review', '--store', 'book.hfstore', '--json', '--resolve'], join(path, '..'));
    const rows = (JSON.parse(out.stdout) as { rows: ReviewRow[] }).rows.filter((r) => r.figures);
    for (const r of rows) {
      const resolved = r.figures!.resolved!;
      expect(resolved.status).toBe('optimal');
      if (resolved.status !== 'optimal') continue;
      // The new optimum is at least as diversified on the latest prices as the stored one.
      expect(resolved.diversificationRatioChange).toBeGreaterThanOrEqual(-1e-9);
      // Saved before the latest prices, the optimum moves; saved on the last month-end, it stays.
      if (r.followed!.savedAt.slice(0, 10) < '2025-12-31') expect(resolved.moved).toBeGreaterThan(1e-4);
      else expect(resolved.moved).toBe(0);
    }
  });
});

describe('the review state per household', () => {
  it('a tolerance, a note and the review date are kept; the tolerance changes what needs attention', async () => {
    const { store } = bookStore();
    const service = createService(store);
    const drifted = generateBook().households.find((h) => h.kind === 'drifted')!.name;
    const id = String(store.getHousehold(drifted)!.id);
    const row = () => reviewBook(store).rows.find((r) => r.household === drifted)!;
    expect(row().reasons.some((r) => r.startsWith('drift '))).toBe(true);
    const saved = await service['book.setReview']({ householdId: id, driftTolerance: 2, note: 'wide band agreed' });
    expect(saved).toMatchObject({ driftTolerance: 2, note: 'wide band agreed', reviewedAt: null });
    expect(row().reasons.some((r) => r.startsWith('drift '))).toBe(false);
    const marked = await service['book.setReview']({ householdId: id, reviewed: true });
    expect(marked.reviewedAt).not.toBeNull();
    expect(row()).toMatchObject({ tolerance: 2, note: 'wide band agreed', reviewedAt: marked.reviewedAt });
    expect(store.auditLog({ entity: 'review' }).map((e) => e.action)).toEqual(['review', 'update']);
    service.dispose();
    store.close();
  });

  it('a store of the schema before the review state migrates, and its households start from the defaults', () => {
    const path = join(tempDir(), 'v5.hfstore');
    const db = new Database(path);
    migrate(db, 5);
    db.prepare("INSERT INTO households (name, base_currency) VALUES ('H', 'EUR')").run();
    db.close();
    const store = openStore(path);
    expect(store.householdReview(1)).toEqual({ driftTolerance: null, note: null, reviewedAt: null });
    expect(store.setHouseholdReview(1, { driftTolerance: 0.03 }).driftTolerance).toBe(0.03);
    expect(() => store.setHouseholdReview(1, { driftTolerance: 0 })).toThrow(/above 0 %/);
    store.close();
  });
});
