import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { optimal } from '../../support/candidate-status.js';
import { InputError } from '../../../shared-core/errors.js';
import { formatPct, formatPercent1, formatRatio2, MINUS } from '../../../shared-core/present/format.js';
import { memoHash } from '../../../src-main/memo/memo-hash.js';
import type { MemoInput } from '../../../src-main/memo/memo-input.js';
import { CAUTIONS, memoHeadings, renderMemo, SECTION_TITLES } from '../../../src-main/memo/render-memo.js';
import { memoFixture } from './memo-fixture.js';
import { flatText, pageTexts, pdfInfo, renderPngs } from './poppler.js';

const artifacts = fileURLToPath(new URL('../../artifacts/memo/', import.meta.url));
mkdirSync(artifacts, { recursive: true });

/** "−564,000" -> -564000; "+12.3" -> 12.3. */
function parseFigure(text: string): number {
  return Number(text.replace(MINUS, '-').replace(/,/g, '').replace(/^\+/, ''));
}

/** The lines of the pages from the one holding `from` up to the one holding `to` (exclusive). */
function between(pages: string[], from: string, to: string | null): string[] {
  const text = pages.join('\n');
  const start = text.indexOf(from);
  const end = to === null ? text.length : text.indexOf(to, start + from.length);
  expect(start, `section '${from}' present`).toBeGreaterThanOrEqual(0);
  return text.slice(start, end === -1 ? undefined : end).split('\n');
}

function rowOf(lines: string[], label: string): string[] {
  // The first cell must be exactly `label`: cells are separated by two or more spaces.
  const line = lines.find((l) => l.trimStart().startsWith(label) && /^\s{2,}/.test(l.trimStart().slice(label.length)));
  expect(line, `a row for '${label}'`).toBeDefined();
  return line!
    .trim()
    .slice(label.length)
    .trim()
    .split(/\s{2,}/);
}

describe('the allocation memo (text read back with poppler pdftotext, Debian poppler-utils)', () => {
  let input: MemoInput;
  let pdf: Buffer;
  let pages: string[];
  let flat: string;

  beforeAll(async () => {
    input = memoFixture({ extras: true });
    pdf = await renderMemo(input);
    pages = pageTexts(pdf);
    flat = flatText(pdf);
  });

  it('reads as a client reads it: the body numbered, then the appendix lettered, walk-forward and stability included when the input has them', () => {
    const expected = [
      '1 The recommendation',
      '2 The trades',
      '3 Where the risk comes from',
      '4 Walk-forward test',
      'A Why each position is held or left out',
      'B How stable the weights are',
      'C Candidates considered',
      'D Method and data',
      'E Cautions and sign-off',
    ];
    expect(memoHeadings(input).map((h) => h.replace(/\s+/g, ' '))).toEqual(expected);
    let last = -1;
    for (const heading of expected) {
      const at = flat.indexOf(heading);
      expect(at, heading).toBeGreaterThan(last);
      last = at;
    }
    // Page 1 holds the recommendation, its figures and the trades in total.
    expect(pages[0]).toContain('The recommendation');
    expect(pages[0]).toMatch(/Volatility, annualised/);
    expect(pages[0]).toMatch(/Buys\s+[\d,]+ EUR in \d+ trades?/);
    expect(pages[0]).toMatch(/Sales\s+[\d,]+ EUR in \d+ trades?/);
    // The appendix starts on a page of its own.
    const appendix = pages.findIndex((p) => /A\s+Why each position/.test(p));
    expect(appendix).toBeGreaterThan(0);
    expect(pages[appendix].trimStart()).toMatch(/^A\s+Why each position is held or left out/);
  });

  it('keeps every heading with what follows it: no heading is the last line of its page', () => {
    const headings = memoHeadings(input).map((h) => h.replace(/\s+/g, ' '));
    const subheadings = [
      'The trades in total',
      'Stress tests',
      'What the binding limits cost',
      'Limits of the recommended allocation',
      'Data sources',
      'Audit trail',
      'Cautions',
      'Sign-off',
    ];
    for (const page of pages) {
      const lines = page
        .split('\n')
        .map((l) => l.trim().replace(/\s+/g, ' '))
        .filter((l) => l !== '');
      // The last line is the footer; the one before it is the page's last line of content.
      const lastContent = lines[lines.length - 2] ?? '';
      for (const h of [...headings, ...subheadings]) expect(lastContent, `'${h}' stranded`).not.toBe(h);
    }
  });

  it('prints the reasons as a table, one row per asset with its weight, correlation and threshold, not sentences', () => {
    const lines = between(pages, SECTION_TITLES.reasons, 'What the binding limits cost');
    const rc = optimal(input.run.candidates.find((c) => c.id === input.recommended)!);
    const info = input.scenario.document.assetInfo!;
    for (const a of rc.explanations!.assets) {
      const cells = rowOf(lines, info[a.asset]!.name!);
      expect(cells.at(-2)).toBe(formatRatio2(a.measure!));
      expect(cells.at(-1)).toBe(formatRatio2(a.threshold!));
      expect(cells).toContain(formatPercent1(a.weight));
    }
    // The solver's sentences are not repeated row after row.
    expect(flat).not.toContain('once the binding limits are counted');
  });

  it("stress tests sit with the risk: the recommended weights' return under each stress, and the range over the other candidates", () => {
    const lines = between(pages, 'Stress tests', SECTION_TITLES.reasons);
    const st = input.stress!;
    const own = st.rows.find((r) => r.candidateId === input.recommended)!;
    const others = st.rows.filter((r) => r.candidateId !== input.recommended);
    st.shocks.forEach((shock, k) => {
      const xs = others.map((r) => r.impacts[k]);
      expect(rowOf(lines, shock.name)).toEqual([
        shock.description,
        formatPct(own.impacts[k]),
        `${formatPct(Math.min(...xs))} to ${formatPct(Math.max(...xs))}`,
      ]);
    });
    const body = pages
      .slice(
        0,
        pages.findIndex((p) => /A\s+Why each position/.test(p)),
      )
      .join('\n');
    expect(body).toContain('Stress tests');
  });

  it('carries the three cautions word for word and a sign-off block for the licensed adviser', () => {
    for (const caution of CAUTIONS) expect(flat).toContain(caution);
    expect(flat).toContain('Reviewed by a licensed adviser');
    expect(flat).toContain('Name and licence or registration number');
    expect(flat).toContain(`Prepared by ${input.preparedBy}`);
  });

  it('prints accented names as typed, with every font embedded (pdffonts, poppler-utils)', () => {
    for (const name of ['Famille Lefèvre-Østergård', 'Søndre Crédit Côtier', 'Ana Ibáñez'])
      expect(flat).toContain(name);
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-fonts-'));
    try {
      writeFileSync(join(dir, 'm.pdf'), pdf);
      const fonts = execFileSync('pdffonts', [join(dir, 'm.pdf')], { encoding: 'utf8' })
        .split('\n')
        .slice(2);
      const rows = fonts.filter((l) => l.trim() !== '');
      expect(rows.length).toBeGreaterThan(0);
      for (const row of rows) {
        expect(row).toMatch(/SourceSans3/);
        // Columns: name type encoding emb sub uni object ID; 'yes yes yes' = embedded, subset, ToUnicode map.
        expect(row).toMatch(/yes\s+yes\s+yes/);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('allocation table: current and target weights equal the holdings and the solve rounded by formatPercent1, changes are the printed difference', () => {
    const lines = between(pages, SECTION_TITLES.trades, 'Each percentage is the weight');
    const rc = optimal(input.run.candidates.find((c) => c.id === input.recommended)!);
    const positions = input.household.holdings!.positions;
    const total = positions.reduce((s, p) => s + p.amount, 0);
    const info = input.scenario.document.assetInfo!;
    for (const asset of input.run.estimate.assets) {
      const held = positions.find((p) => p.asset === asset)?.amount ?? 0;
      const w = rc.weights[asset] ?? 0;
      if (Math.abs(w) < 0.0005 && held === 0) continue;
      const cells = rowOf(lines, info[asset]!.name!);
      const [current, target, change] = cells.slice(-4, -1);
      expect(current).toBe(formatPercent1(held / total));
      expect(target).toBe(formatPercent1(w));
      expect(parseFigure(change)).toBeCloseTo(parseFigure(target) - parseFigure(current), 10);
    }
  });

  it('trades: each is the gap to target rounded to the lot (a full sale unrounded), and the column adds up to zero with the rounding cash', () => {
    const lines = between(pages, SECTION_TITLES.trades, 'Each percentage is the weight');
    const rc = optimal(input.run.candidates.find((c) => c.id === input.recommended)!);
    const positions = input.household.holdings!.positions;
    const info = input.scenario.document.assetInfo!;
    const rounded = (x: number) => Math.sign(x) * Math.round(Math.abs(x));
    const amounts = Object.fromEntries(positions.map((p) => [p.asset, rounded(p.amount)]));
    const total = Object.values(amounts).reduce((s, v) => s + v, 0);
    let sum = 0;
    for (const asset of input.run.estimate.assets) {
      const held = amounts[asset] ?? 0;
      const w = rc.weights[asset] ?? 0;
      if (Math.abs(w) < 0.0005 && held === 0) continue;
      const trade = parseFigure(rowOf(lines, info[asset]!.name!).at(-1)!);
      const exactHeld = positions.find((p) => p.asset === asset)?.amount ?? 0;
      const exactTotal = positions.reduce((s, p) => s + p.amount, 0);
      const expected = w === 0 ? -held : rounded((w * exactTotal - exactHeld) / input.lot) * input.lot;
      expect(trade, asset).toBe(expected === 0 ? 0 : expected);
      sum += trade;
    }
    const residual = parseFigure(rowOf(lines, 'Cash left from rounding to lots').at(-1)!);
    expect(sum + residual).toBe(0);
    const totalRow = rowOf(lines, 'Total');
    expect(totalRow).toEqual(['100.0', '100.0', '0.0', '0']);
    expect(flat).toContain(`Holdings valued at ${total.toLocaleString('en-US')} EUR`);
  });

  it('candidates considered: one column per candidate, every weight equal to its solve weight by formatPercent1, the infeasible one marked in words', () => {
    const lines = between(pages, SECTION_TITLES.candidates, SECTION_TITLES.method);
    const info = input.scenario.document.assetInfo!;
    const header = lines.find((l) => l.includes('Most diversified') && l.includes('Lowest variance'))!;
    for (const c of input.run.candidates) expect(header).toContain(c.label!);
    for (const asset of input.run.estimate.assets) {
      const name = info[asset]!.name!;
      if (!lines.some((l) => l.trimStart().startsWith(name + '  '))) continue;
      const cells = rowOf(lines, name);
      expect(cells).toEqual(
        input.run.candidates.map((c) => (c.status === 'optimal' ? formatPercent1(c.weights[asset] ?? 0) : '\u2013')),
      );
    }
    expect(rowOf(lines, 'Status')).toEqual(['solved', 'solved', 'solved', 'solved', '\u25b2 infeasible']);
    expect(flat).toContain('Not solved: Low turnover (infeasible: turnover cap 1.0% cannot reach the cash floor).');
  });

  it('summary figures are the candidate metrics, rounded as the design notes say (one decimal percent, two-decimal ratios)', () => {
    const lines = between(pages, SECTION_TITLES.recommendation, SECTION_TITLES.trades);
    const m = optimal(input.run.candidates[0]).metrics;
    const cm = input.currentMetrics!;
    expect(rowOf(lines, 'Volatility, annualised')).toEqual([
      `${formatPercent1(cm.volatility)}%`,
      `${formatPercent1(m.volatility)}%`,
    ]);
    expect(rowOf(lines, 'Diversification ratio')).toEqual([
      cm.diversificationRatio.toFixed(2),
      m.diversificationRatio.toFixed(2),
    ]);
    expect(rowOf(lines, 'Effective number of bets')).toEqual([cm.effectiveBets.toFixed(2), m.effectiveBets.toFixed(2)]);
    expect(rowOf(lines, 'Turnover from current')).toEqual(['\u2013', `${formatPercent1(m.turnover)}%`]);
  });

  it('every page has its number and the footer with the revision hash and the memo hash', () => {
    const hash = memoHash(input);
    pages.forEach((text, i) => {
      expect(text).toContain(`page ${i + 1} of ${pages.length}`);
      expect(text).toContain(`revision ${input.scenario.hash.slice(0, 12)}`);
      expect(text).toContain(`memo ${hash.slice(0, 12)}`);
    });
    expect(flat).toContain(`Memo hash ${hash}`);
    expect(flat).toContain(`Scenario revision hash ${input.scenario.hash}`);
  });

  it('takes its PDF dates from the input, and poppler renders every page to PNG (written to test/artifacts/memo/ for review)', () => {
    const info = pdfInfo(pdf);
    expect(info.CreationDate).toMatch(/^2026-12-01T00:00:00/);
    expect(info.ModDate).toMatch(/^2026-12-01T00:00:00/);
    expect(info.Title).toBe('Allocation memo: Famille Lefèvre-Østergård');
    writeFileSync(join(artifacts, 'memo-full.pdf'), pdf);
    const pngs = renderPngs(pdf, artifacts, 'memo-full');
    expect(pngs.length).toBe(Number(info.Pages));
    expect(Number(info.Pages)).toBe(pages.length);
  });
});

describe('determinism and the memo hash', () => {
  it('the same input gives the same bytes; another date gives other bytes and another memo hash', async () => {
    const a = await renderMemo(memoFixture({ extras: true }));
    const b = await renderMemo(memoFixture({ extras: true }));
    expect(a.equals(b)).toBe(true);
    const later = memoFixture({ extras: true, createdOn: '2026-12-02' });
    const c = await renderMemo(later);
    expect(c.equals(a)).toBe(false);
    expect(memoHash(later)).not.toBe(memoHash(memoFixture({ extras: true })));
  });
});

describe('a memo without holding amounts or walk-forward', () => {
  it('shows weights from the scenario, no trade column, and letters the appendix without walk-forward or stability', async () => {
    const input = memoFixture({ holdings: false });
    const pdf = await renderMemo(input);
    const flat = flatText(pdf);
    expect(flat).toContain('No holding amounts were given, so changes are shown as weights only');
    expect(flat).not.toContain('Trade EUR');
    expect(flat).not.toContain(SECTION_TITLES.walkForward);
    expect(flat).not.toContain(SECTION_TITLES.stability);
    expect(flat).not.toContain('stability bands');
    expect(flat).toContain(`B ${SECTION_TITLES.candidates}`);
    expect(flat).toContain(`C ${SECTION_TITLES.method}`);
    expect(flat).toContain(`D ${SECTION_TITLES.cautions}`);
    expect(flat).toContain('No stability analysis was run for this revision');
    const pages = pageTexts(pdf);
    const lines = between(pages, SECTION_TITLES.trades, 'Each percentage is the weight');
    const current = input.scenario.document.current!;
    expect(rowOf(lines, 'Alder Global Equity').slice(-3)).toEqual([
      formatPercent1(current['ALD-EQ']),
      '18.3',
      `${MINUS}11.7`,
    ]);
    writeFileSync(join(artifacts, 'memo-weights-only.pdf'), pdf);
    renderPngs(pdf, artifacts, 'memo-weights-only');
  });
});

describe('bad memo input is refused with the JSON path of the problem', () => {
  const cases: [string, (i: MemoInput) => void, string][] = [
    ['an unknown recommended candidate', (i) => (i.recommended = 'nope'), 'recommended'],
    ['an infeasible recommended candidate', (i) => (i.recommended = 'tight'), 'recommended'],
    ['a lot of zero', (i) => (i.lot = 0), 'lot'],
    ['a date that is not YYYY-MM-DD', (i) => (i.createdOn = '01/12/2026'), 'createdOn'],
    [
      'a holding outside the scenario',
      (i) => i.household.holdings!.positions.push({ asset: 'ZZZ', amount: 5 }),
      'household.holdings.positions[8].asset',
    ],
    [
      'a negative holding',
      (i) => (i.household.holdings!.positions[0].amount = -1),
      'household.holdings.positions[0].amount',
    ],
  ];
  for (const [what, change, path] of cases)
    it(`${what} -> ${path}`, async () => {
      const input = memoFixture();
      change(input);
      const error = await renderMemo(input).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(InputError);
      expect((error as InputError).location.path).toBe(path);
    });
});
