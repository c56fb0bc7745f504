import { correlationMatrix } from '../../shared-core/analytics/risk.js';
import type { CandidateResult } from '../../shared-core/optimise/result.js';
import { clusterOrder } from '../../shared-core/analytics/cluster-order.js';
import {
  bandsOption,
  candidatesScatterOption,
  growthOption,
  heatmapOption,
  pairedBarsOption,
  renderChartSvg,
} from './charts.js';
import {
  formatAmount,
  formatWeightChange,
  formatFixed,
  formatMoney,
  formatPct,
  formatPercent1,
  formatRatio2,
  formatTrade,
  listInWords,
  ordinal,
} from '../../shared-core/present/format.js';
import { memoHash } from './memo-hash.js';
import type { MemoInput } from './memo-input.js';
import { buildView, type MemoView } from './memo-view.js';
import { AMBER, candidateColour, INK, INK_SOFT, RULE } from '../../shared-core/present/palette.js';
import { CONTENT_WIDTH, MARGIN, PageWriter, SIZE, type BulletItem, type Column, type TableRow } from './page-writer.js';
import { FONT_BOLD, FONT_REGULAR } from './fonts.js';
import {
  constraintSentences,
  effectiveConstraints,
  estimatorShort,
  estimatorWords,
  objectiveWords,
} from './plain-words.js';

/** The cautions every memo carries, word for word (the brief's rule; tests look for them). */
export const CAUTIONS = [
  'Estimates come from past data.',
  'Past performance does not guarantee future results.',
  'This memo is not a recommendation until it has been reviewed by a licensed adviser under the local rules that apply.',
] as const;

/** Section titles, in order; tests check each is present. */
export const SECTION_TITLES = {
  summary: 'Summary',
  allocation: 'Allocation and trades',
  risk: 'Where the risk comes from',
  reasons: 'Why each position is held or left out',
  candidates: 'Candidates considered',
  walkForward: 'Walk-forward and stress',
  method: 'Method and data',
  cautions: 'Assumptions, limitations and cautions',
} as const;

/**
 * Writes the allocation memo. A pure function of `input` (and the embedded font): the PDF's
 * dates and file identifier come from `input.createdOn`, so the same input gives the same bytes.
 * Throws an InputError (with its JSON path) when the input is inconsistent.
 */
export async function renderMemo(input: MemoInput): Promise<Buffer> {
  const view = buildView(input);
  const hash = memoHash(input);
  const date = new Date(`${input.createdOn}T00:00:00Z`);
  const w = new PageWriter({
    title: `Allocation memo: ${input.household.name}`,
    author: input.preparedBy,
    subject: `${input.scenario.name}, revision ${input.scenario.revision}`,
    keywords: `scenario ${input.scenario.hash}; memo ${hash}`,
    date,
  });
  let n = 0;
  const next = (title: string) => `${++n}  ${title}`;

  cover(w, view);
  w.newPage();
  summary(w, view, next(SECTION_TITLES.summary));
  allocation(w, view, next(SECTION_TITLES.allocation));
  risk(w, view, next(SECTION_TITLES.risk));
  reasons(w, view, next(SECTION_TITLES.reasons));
  candidates(w, view, next(SECTION_TITLES.candidates));
  if (input.walkForward || input.stress) walkForward(w, view, next(SECTION_TITLES.walkForward));
  method(w, view, next(SECTION_TITLES.method), hash);
  cautions(w, view, next(SECTION_TITLES.cautions));

  // Hashes first, so a long household or scenario name is what gets shortened, never the audit trail.
  const short = (h: string) => h.slice(0, 12);
  w.footers(
    () =>
      `revision ${short(input.scenario.hash)} \u00b7 memo ${short(hash)} \u00b7 ${input.household.name}, ${input.scenario.name}, rev. ${input.scenario.revision}`,
    (page, pages) => `page ${page} of ${pages}`,
  );
  return w.finish();
}

// ---------------------------------------------------------------------------------------------

function cover(w: PageWriter, v: MemoView): void {
  const { input } = v;
  const doc = w.doc;
  doc.y = 150;
  doc.font(FONT_REGULAR).fontSize(10).fillColor(INK_SOFT).text('ALLOCATION MEMO', MARGIN.left, doc.y, {
    characterSpacing: 1.6,
  });
  w.space(10);
  doc.font(FONT_BOLD).fontSize(SIZE.title).fillColor(INK).text(input.household.name, MARGIN.left, doc.y, {
    width: CONTENT_WIDTH,
  });
  w.space(4);
  doc
    .font(FONT_REGULAR)
    .fontSize(13)
    .fillColor(INK)
    .text(`${input.scenario.name}, revision ${input.scenario.revision}`, { width: CONTENT_WIDTH });
  w.space(26);
  w.rule(doc.y, RULE, 0.6);
  w.space(12);
  w.facts([
    ['Date', input.createdOn],
    ['Prepared by', input.preparedBy],
    ['Scenario', input.scenario.name],
    ['Revision', `${input.scenario.revision} (hash ${input.scenario.hash.slice(0, 16)})`],
    ['Base currency', input.household.baseCurrency],
    ['Recommended', v.candidateLabel(v.recommended)],
    ...(v.trades
      ? [
          [
            'Holdings',
            `${formatMoney(v.trades.total, input.household.baseCurrency, v.trades.decimals)}${input.household.holdings?.asOf ? ` as of ${input.household.holdings.asOf}` : ''}`,
          ] as const,
        ]
      : []),
  ]);
  w.space(8);
  w.rule(doc.y, RULE, 0.6);
  doc.y = 640;
  w.paragraph('For discussion with the household and for review by a licensed adviser. ' + CAUTIONS.join(' ') + '', {
    muted: true,
    size: SIZE.small,
  });
}

function metricRow(label: string, current: string | null, target: string, currentAvailable: boolean): TableRow {
  return { cells: currentAvailable ? [label, current ?? '\u2013', target] : [label, target] };
}

function largest(weights: Record<string, number>, v: MemoView, k = 3): string {
  return Object.entries(weights)
    .filter(([, x]) => Math.abs(x) >= 0.0005)
    .sort(([a, x], [b, y]) => y - x || (a < b ? -1 : 1))
    .slice(0, k)
    .map(([a, x]) => `${v.name(a)} ${formatPct(x)}`)
    .join(', ');
}

function rank(values: number[], value: number, descending: boolean): number {
  return values.filter((x) => (descending ? x > value + 1e-12 : x < value - 1e-12)).length + 1;
}

function summary(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc } = v;
  const m = rc.metrics!;
  const spec = input.scenario.document.candidates.find((c) => c.id === rc.id);
  w.heading(title);
  if (input.rationale) w.paragraph(input.rationale);
  const solved = input.run.candidates.filter((c) => c.status === 'optimal' && c.metrics);
  const drs = solved.map((c) => c.metrics!.diversificationRatio);
  const vols = solved.map((c) => c.metrics!.volatility);
  const how = spec ? ` (${objectiveWords(spec.objective)}, ${estimatorWords(spec.estimator)})` : '';
  const sentences = [
    `The recommended allocation is ${v.candidateLabel(rc)}${how}.`,
    solved.length > 1
      ? `Of the ${solved.length} candidates solved, its diversification ratio of ${formatRatio2(m.diversificationRatio)} ranks ${ordinal(rank(drs, m.diversificationRatio, true))} highest and its volatility of ${formatPct(m.volatility)} a year ranks ${ordinal(rank(vols, m.volatility, false))} lowest.`
      : `It is the only candidate solved; its diversification ratio is ${formatRatio2(m.diversificationRatio)} and its volatility ${formatPct(m.volatility)} a year.`,
  ];
  const cm = input.currentMetrics;
  if (cm)
    sentences.push(
      `Against the current holdings, volatility moves from ${formatPct(cm.volatility)} to ${formatPct(m.volatility)} and the diversification ratio from ${formatRatio2(cm.diversificationRatio)} to ${formatRatio2(m.diversificationRatio)}, for a turnover of ${formatPct(m.turnover)} of the portfolio.`,
    );
  w.paragraph(sentences.join(' '));
  w.space(4);
  const has = cm !== null;
  const cols: Column[] = has
    ? [
        { header: 'Figure', width: 2.2 },
        { header: 'Current holdings', width: 2.4, align: 'right' },
        { header: `Recommended: ${v.candidateLabel(rc)}`, width: 2.4, align: 'right' },
      ]
    : [
        { header: 'Figure', width: 2.2 },
        { header: `Recommended: ${v.candidateLabel(rc)}`, width: 2.4, align: 'right' },
      ];
  w.table(cols, [
    metricRow('Volatility, annualised', cm ? formatPct(cm.volatility) : null, formatPct(m.volatility), has),
    metricRow(
      'Diversification ratio',
      cm ? formatRatio2(cm.diversificationRatio) : null,
      formatRatio2(m.diversificationRatio),
      has,
    ),
    metricRow(
      'Effective number of bets',
      cm ? formatRatio2(cm.effectiveBets) : null,
      formatRatio2(m.effectiveBets),
      has,
    ),
    metricRow(
      'Effective number of holdings',
      cm ? formatRatio2(cm.effectiveHoldings) : null,
      formatRatio2(m.effectiveHoldings),
      has,
    ),
    metricRow('Turnover from current', cm ? '\u2013' : null, formatPct(m.turnover), has),
    metricRow('Largest positions', v.current ? largest(v.current, v) : null, largest(rc.weights, v), has),
  ]);
  w.paragraph(
    `Volatility and the diversification ratio are measured with the recommended candidate's estimate (${input.run.estimate.method}) over ${input.run.returns.from} to ${input.run.returns.to}, annualised. Effective number of bets after Meucci (2009); effective number of holdings is 1 / sum of squared weights.`,
    { muted: true, size: SIZE.small },
  );
}

function allocation(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc, trades, current } = v;
  const ccy = input.household.baseCurrency;
  const info = input.scenario.document.assetInfo ?? {};
  w.heading(title, 140);
  const intro: string[] = [];
  if (trades) {
    intro.push(
      `Holdings valued at ${formatMoney(trades.total, ccy, trades.decimals)}${input.household.holdings?.asOf ? ` on ${input.household.holdings.asOf}` : ''}. Trades are rounded to lots of ${formatMoney(trades.lot, ccy, trades.decimals)}; a position sold in full is sold to the last unit. Buys total ${formatMoney(trades.buys, ccy, trades.decimals)} and sales ${formatMoney(trades.sells, ccy, trades.decimals)}.`,
    );
  } else if (current) {
    intro.push('No holding amounts were given, so changes are shown as weights only, without trade amounts.');
  } else {
    intro.push('The scenario gives no current holdings: the table shows the target weights only.');
  }
  w.paragraph(intro.join(' '));
  const hasTrades = trades !== null;
  const cols: Column[] = [
    { header: 'Asset', width: 3.1 },
    { header: 'Class', width: 1.6 },
    { header: 'Ccy', width: 0.7 },
    ...(current
      ? [
          { header: 'Current %', width: 1.15, align: 'right' as const },
          { header: 'Target %', width: 1.15, align: 'right' as const },
          { header: 'Change pp', width: 1.15, align: 'right' as const },
        ]
      : [{ header: 'Target %', width: 1.15, align: 'right' as const }]),
    ...(hasTrades ? [{ header: `Trade ${ccy}`, width: 1.7, align: 'right' as const }] : []),
  ];
  const tradeOf = new Map(trades?.rows.map((r) => [r.asset, r]) ?? []);
  const rows: TableRow[] = v.shown.map((a) => {
    const target = rc.weights[a] ?? 0;
    const cells = [v.name(a), (info[a]?.assetClass ?? '\u2013').replace(/-/g, ' '), info[a]?.currency ?? ccy];
    if (current)
      cells.push(formatPercent1(current[a] ?? 0), formatPercent1(target), formatWeightChange(current[a] ?? 0, target));
    else cells.push(formatPercent1(target));
    if (trades) cells.push(formatTrade(tradeOf.get(a)!.trade, trades.decimals));
    return { cells };
  });
  const sumTarget = Object.values(rc.weights).reduce((s, x) => s + x, 0);
  if (trades) {
    const blanks = current ? ['', '', ''] : [''];
    rows.push({
      cells: [`Cash left from rounding to lots`, '', '', ...blanks, formatTrade(trades.residual, trades.decimals)],
      muted: true,
    });
  }
  const totalCells = ['Total', '', ''];
  if (current) {
    const sumCurrent = Object.values(current).reduce((s, x) => s + x, 0);
    totalCells.push(formatPercent1(sumCurrent), formatPercent1(sumTarget), formatWeightChange(sumCurrent, sumTarget));
  } else totalCells.push(formatPercent1(sumTarget));
  if (trades) {
    const net = trades.rows.reduce((s, r) => s + r.trade, 0) + trades.residual;
    totalCells.push(formatTrade(net, trades.decimals));
  }
  rows.push({ cells: totalCells, total: true });
  w.table(cols, rows);
  const notes = [
    'Each percentage is the weight rounded on its own to one decimal, so a column may not add to exactly 100.0; the change is the difference of the printed weights, in percentage points.',
  ];
  if (v.unused.length > 0) notes.push(`Neither held nor proposed: ${listInWords(v.unused.map(v.name))}.`);
  w.paragraph(notes.join(' '), { muted: true, size: SIZE.small });

  const order = v.shown;
  const svg = renderChartSvg(
    pairedBarsOption(
      order.map((a) => ({ label: v.name(a), current: current ? (current[a] ?? 0) : null, target: rc.weights[a] ?? 0 })),
      candidateColour(v.recommendedIndex),
    ),
    CONTENT_WIDTH,
    Math.max(110, 22 + order.length * 17),
  );
  let finding = 'Target weights of the recommended allocation';
  if (current) {
    const deltas = order.map((a) => [a, (rc.weights[a] ?? 0) - (current[a] ?? 0)] as const);
    const up = [...deltas].sort((x, y) => y[1] - x[1])[0];
    const down = [...deltas].sort((x, y) => x[1] - y[1])[0];
    if (up && down && up[1] > 0.0005 && down[1] < -0.0005)
      finding = `The largest increase is ${v.name(up[0])} (${formatWeightChange(current[up[0]] ?? 0, rc.weights[up[0]] ?? 0)} pp), the largest reduction ${v.name(down[0])} (${formatWeightChange(current[down[0]] ?? 0, rc.weights[down[0]] ?? 0)} pp)`;
  }
  w.chart(
    svg,
    Math.max(110, 22 + order.length * 17),
    finding,
    `Weights in % of the portfolio. Solid bars: target; outlined bars: current holdings. Sorted by target weight.`,
  );
}

function correlationRows(input: MemoInput): number[][] {
  const c = correlationMatrix(input.run.estimate.covariance);
  return Array.from({ length: c.rows }, (_, i) => Array.from(c.data.subarray(i * c.cols, (i + 1) * c.cols)));
}

function risk(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc } = v;
  const m = rc.metrics!;
  const cm = input.currentMetrics;
  w.heading(title, 200);
  const order = v.shown;
  const top = [...order].sort((a, b) => (m.riskContributions[b] ?? 0) - (m.riskContributions[a] ?? 0))[0];
  const finding = top
    ? `${v.name(top)} carries the most risk: ${formatPct(m.riskContributions[top] ?? 0)} of the total for ${formatPct(rc.weights[top] ?? 0)} of the weight`
    : 'Risk contributions';
  const height = Math.max(110, 22 + order.length * 17);
  w.chart(
    renderChartSvg(
      pairedBarsOption(
        order.map((a) => ({
          label: v.name(a),
          current: cm ? (cm.riskContributions[a] ?? 0) : null,
          target: m.riskContributions[a] ?? 0,
        })),
        candidateColour(v.recommendedIndex),
      ),
      CONTENT_WIDTH,
      height,
    ),
    height,
    finding,
    'Share of portfolio variance from each asset (Euler risk contributions w_i (Sigma w)_i / w\u2019Sigma w, summing to 100%). Solid: target; outlined: current holdings. Same order as the weights.',
  );

  const corr = correlationRows(input);
  const assets = input.run.estimate.assets;
  const order2 = clusterOrder(corr.flat(), assets.length);
  // Rows carry a number and the name; columns the number only, so long names never collide.
  const labels = order2.map((i, k) => `${v.name(assets[i])}  ${k + 1}`);
  const columns = order2.map((_, k) => String(k + 1));
  const ordered = order2.map((i) => order2.map((j) => corr[i][j]));
  let hi: [number, number, number] = [0, 0, -Infinity];
  let lo: [number, number, number] = [0, 0, Infinity];
  for (let i = 0; i < assets.length; i++)
    for (let j = i + 1; j < assets.length; j++) {
      if (corr[i][j] > hi[2]) hi = [i, j, corr[i][j]];
      if (corr[i][j] < lo[2]) lo = [i, j, corr[i][j]];
    }
  const fmtCorr = (x: number) => formatFixed(x, 2);
  const corrFinding =
    assets.length > 1
      ? `Most correlated: ${v.name(assets[hi[0]])} and ${v.name(assets[hi[1]])} (${fmtCorr(hi[2])}); least: ${v.name(assets[lo[0]])} and ${v.name(assets[lo[1]])} (${fmtCorr(lo[2])})`
      : 'Correlations of the estimate used';
  // Square cells: the chart is as wide as its labels plus the cells plus the colour scale.
  const cells = Math.min(300, 24 * assets.length);
  const side = cells + 95;
  const width = Math.min(CONTENT_WIDTH, cells + 170);
  w.chart(
    renderChartSvg(heatmapOption(labels, ordered, columns), width, side),
    side,
    corrFinding,
    `Correlations of the estimate the recommended allocation used (${input.run.estimate.method}). Blue negative, white zero, red positive; assets ordered by average-linkage clustering on sqrt((1 \u2212 rho) / 2) so that correlated groups sit together.`,
    width,
  );
}

/** Asset ids in the solver's sentences become the names the memo prints. */
function withNames(v: MemoView, text: string): string {
  const ids = [...v.assets].sort((a, b) => b.length - a.length);
  let out = text;
  for (const id of ids) {
    const name = v.name(id);
    if (name === id) continue;
    const escaped = id.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    out = out.replace(new RegExp(`(?<![A-Za-z0-9._-])${escaped}(?![A-Za-z0-9_-]|\\.[A-Za-z0-9])`, 'g'), name);
  }
  return out;
}

/** A capital first letter and a closing full stop. */
function sentence(text: string): string {
  const t = text.trim();
  if (t === '') return t;
  const capital = t[0].toUpperCase() + t.slice(1);
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}

function byWeight<T extends { weight: number; asset: string }>(items: readonly T[]): T[] {
  return [...items].sort((a, b) => b.weight - a.weight || (a.asset < b.asset ? -1 : 1));
}

/** The solver's sentence for one asset, led by the asset's name unless it already names it. */
function explained(v: MemoView, a: { asset: string; text: string }): BulletItem {
  const text = withNames(v, a.text);
  const name = v.name(a.asset);
  if (text.includes(name)) return { text: sentence(text) };
  const t = sentence(text);
  return { lead: name, text: `\u2014 ${t[0].toLowerCase()}${t.slice(1)}` };
}

function reasons(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc } = v;
  w.heading(title);
  const ex = rc.explanations;
  if (!ex || ex.assets.length === 0) {
    w.paragraph('The solver gave no per-asset explanation for this candidate.', { muted: true });
  } else {
    const held = ex.assets.filter((a) => Math.abs(a.weight) >= 0.0005);
    const out = ex.assets.filter((a) => Math.abs(a.weight) < 0.0005);
    if (held.length) {
      w.subheading('Held');
      w.bullets(byWeight(held).map((a) => explained(v, a)));
    }
    if (out.length) {
      w.subheading('Left out');
      w.bullets(out.map((a) => explained(v, a)));
    }
  }
  w.subheading('What the binding limits cost');
  if (!ex || ex.binding.length === 0) w.paragraph('No limit was binding at the solution.');
  else w.bullets(ex.binding.map((b) => sentence(withNames(v, b.text))));
  if (ex && ex.flags.length > 0) {
    w.subheading('Solver notes');
    w.bullets(ex.flags.map((f) => sentence(withNames(v, f))));
  }

  w.subheading('How stable the weights are', 150);
  const st = input.stability;
  if (!st) {
    w.paragraph('No stability analysis was run for this scenario revision, so no bands are shown.', { muted: true });
    return;
  }
  const bands = new Map(st.bands.map((b) => [b.asset, b]));
  const order = v.shown.filter((a) => bands.has(a));
  const widest = [...st.bands].sort((a, b) => b.high - b.low - (a.high - a.low))[0];
  const q = `${formatFixed(st.quantiles[0] * 100, 0)}th to ${formatFixed(st.quantiles[1] * 100, 0)}th percentile`;
  const sentences = [
    `Bands show the ${q} of each weight when the recommended allocation is re-solved on resampled data (${st.method}).`,
  ];
  if (widest)
    sentences.push(
      `The widest band is ${v.name(widest.asset)}, from ${formatPct(widest.low)} to ${formatPct(widest.high)} around a target of ${formatPct(rc.weights[widest.asset] ?? 0)}.`,
    );
  const narrow = st.bands.filter((b) => b.high - b.low < 0.02 && (rc.weights[b.asset] ?? 0) >= 0.0005);
  if (narrow.length)
    sentences.push(
      `Within two percentage points in every resample: ${listInWords(narrow.map((b) => v.name(b.asset)))}.`,
    );
  w.paragraph(sentences.join(' '));
  const height = Math.max(110, 22 + order.length * 17);
  w.chart(
    renderChartSvg(
      bandsOption(
        order.map((a) => ({
          label: v.name(a),
          low: bands.get(a)!.low,
          high: bands.get(a)!.high,
          target: rc.weights[a] ?? 0,
        })),
      ),
      CONTENT_WIDTH,
      height,
    ),
    height,
    `Weight bands of the recommended allocation (${q})`,
    'Weights in % of the portfolio. Shaded bar: band across resamples; dark tick: the target weight. Same order as the allocation table.',
  );
}

function candidateFigures(c: CandidateResult): { vol: string; dr: string; bets: string; turnover: string } {
  if (c.status !== 'optimal' || !c.metrics) return { vol: '\u2013', dr: '\u2013', bets: '\u2013', turnover: '\u2013' };
  return {
    vol: formatPct(c.metrics.volatility),
    dr: formatRatio2(c.metrics.diversificationRatio),
    bets: formatRatio2(c.metrics.effectiveBets),
    turnover: formatPct(c.metrics.turnover),
  };
}

/** The allocation table's assets, then any other asset some solved candidate holds. */
function candidateRows(v: MemoView): string[] {
  const shown = new Set(v.shown);
  const others = v.unused.filter((a) =>
    v.input.run.candidates.some((c) => c.status === 'optimal' && Math.abs(c.weights[a] ?? 0) >= 0.0005),
  );
  return [...shown, ...others];
}

function candidates(w: PageWriter, v: MemoView, title: string): void {
  const { input } = v;
  const all = input.run.candidates;
  w.heading(title, 160);
  const infeasible = all.filter((c) => c.status !== 'optimal');
  const lead = [
    `${all.length} candidate${all.length === 1 ? ' was' : 's were'} solved on the same data, one column each below; the recommended one is marked.`,
  ];
  if (infeasible.length)
    lead.push(
      `Not solved: ${listInWords(infeasible.map((c) => `${v.candidateLabel(c)} (${c.status}${c.message ? `: ${c.message}` : ''})`))}.`,
    );
  w.paragraph(lead.join(' '));
  const perTable = 5;
  for (let start = 0; start < all.length; start += perTable) {
    const chunk = all.slice(start, start + perTable);
    const cols: Column[] = [
      { header: 'Figure', width: 3.0 },
      ...chunk.map((c) => ({
        header: `${v.candidateLabel(c)}${c.id === v.recommended.id ? ' (recommended)' : ''}`,
        width: 1.5,
        align: 'right' as const,
      })),
    ];
    const specOf = (c: CandidateResult) => input.scenario.document.candidates.find((s) => s.id === c.id);
    const figs = chunk.map(candidateFigures);
    const rows: TableRow[] = [
      { cells: ['Objective', ...chunk.map((c) => (specOf(c) ? objectiveWords(specOf(c)!.objective) : '\u2013'))] },
      { cells: ['Estimator', ...chunk.map((c) => (specOf(c) ? estimatorShort(specOf(c)!.estimator) : '\u2013'))] },
      { cells: ['Status', ...chunk.map((c) => (c.status === 'optimal' ? 'solved' : `\u25b2 ${c.status}`))] },
      { cells: ['Volatility, annualised', ...figs.map((f) => f.vol)] },
      { cells: ['Diversification ratio', ...figs.map((f) => f.dr)] },
      { cells: ['Effective number of bets', ...figs.map((f) => f.bets)] },
      { cells: ['Turnover from current', ...figs.map((f) => f.turnover)] },
      { cells: ['Weights, %', ...chunk.map(() => '')], muted: true },
      ...candidateRows(v).map((a) => ({
        cells: [
          v.name(a),
          ...chunk.map((c) => (c.status === 'optimal' ? formatPercent1(c.weights[a] ?? 0) : '\u2013')),
        ],
      })),
    ];
    w.table(cols, rows);
    // A colour key under the table: the swatch each candidate has on the charts.
    w.keep(14);
    let x = MARGIN.left;
    const y = w.doc.y;
    chunk.forEach((c, i) => {
      const colour = candidateColour(start + i);
      w.doc.rect(x, y + 2, 7, 7).fill(colour);
      const label = v.candidateLabel(c) + (c.status !== 'optimal' ? ` (${c.status})` : '');
      w.doc
        .font(FONT_REGULAR)
        .fontSize(SIZE.small)
        .fillColor(c.status !== 'optimal' ? AMBER : INK);
      w.doc.text(label, x + 10, y, { lineBreak: false });
      x += 16 + w.doc.widthOfString(label);
    });
    w.doc.fillColor(INK);
    w.doc.y = y + 16;
  }
  const points = all
    .map((c, i) => ({ c, i }))
    .filter(({ c }) => c.status === 'optimal' && c.metrics)
    .map(({ c, i }) => ({
      label: v.candidateLabel(c),
      volatility: c.metrics!.volatility,
      diversificationRatio: c.metrics!.diversificationRatio,
      colour: candidateColour(i),
      recommended: c.id === v.recommended.id,
    }));
  if (points.length > 1) {
    const best = [...points].sort((a, b) => b.diversificationRatio - a.diversificationRatio)[0];
    const calm = [...points].sort((a, b) => a.volatility - b.volatility)[0];
    w.chart(
      renderChartSvg(candidatesScatterOption(points), CONTENT_WIDTH, 210),
      210,
      best.label === calm.label
        ? `${best.label} has both the highest diversification ratio and the lowest volatility`
        : `${best.label} diversifies most (${formatRatio2(best.diversificationRatio)}); ${calm.label} has the lowest volatility (${formatPct(calm.volatility)})`,
      'Each point is a solved candidate in its colour; the diamond is the recommended one. Volatility annualised, in %.',
    );
  }
}

function walkForward(w: PageWriter, v: MemoView, title: string): void {
  const { input } = v;
  const label = (id: string) => {
    const c = input.run.candidates.find((x) => x.id === id);
    return c ? v.candidateLabel(c) : id;
  };
  const colourOf = (id: string) =>
    candidateColour(
      Math.max(
        0,
        input.run.candidates.findIndex((x) => x.id === id),
      ),
    );
  w.heading(title, 160);
  const wf = input.walkForward;
  if (wf) {
    w.paragraph(
      `Each candidate was re-estimated and rebalanced through time using only the prices known on each date, from ${wf.from} to ${wf.to}: ${wf.settings}. Figures are after costs.`,
    );
    w.table(
      [
        { header: 'Candidate', width: 2.4 },
        { header: 'Return a year', width: 1.2, align: 'right' },
        { header: 'Volatility', width: 1.2, align: 'right' },
        { header: 'Sharpe ratio', width: 1.1, align: 'right' },
        { header: 'Max drawdown', width: 1.2, align: 'right' },
        { header: 'Turnover a year', width: 1.3, align: 'right' },
      ],
      wf.rows.map((r) => ({
        cells: [
          label(r.candidateId),
          formatPct(r.annualisedReturn),
          formatPct(r.volatility),
          r.sharpe === null ? '\u2013' : formatRatio2(r.sharpe),
          formatPct(-Math.abs(r.maxDrawdown)),
          formatPct(r.turnoverPerYear),
        ],
      })),
    );
    if (wf.growth && wf.growth.dates.length > 1) {
      const series = wf.growth.series.map((s) => ({
        label: label(s.candidateId),
        colour: colourOf(s.candidateId),
        values: s.values,
      }));
      const ends = series.map((s) => [s.label, s.values[s.values.length - 1]] as const).sort((a, b) => b[1] - a[1]);
      w.chart(
        renderChartSvg(growthOption(wf.growth.dates, series), CONTENT_WIDTH, 200),
        200,
        `Growth of 1 after costs: ${ends[0][0]} ends highest at ${formatFixed(ends[0][1], 2)}`,
        `Log scale. ${series.map((s) => s.label).join(', ')}, each in its candidate colour. Past performance does not guarantee future results.`,
      );
    }
  }
  const st = input.stress;
  if (st) {
    w.subheading('Stress tests');
    w.paragraph(`Portfolio return of each candidate's weights under each stress${st.method ? `: ${st.method}` : ''}.`);
    // One column per candidate, as everywhere in the memo; one row per stress.
    const ids = st.rows.map((r) => r.candidateId);
    w.table(
      [
        { header: 'Stress', width: 2.2 },
        ...ids.map((id) => ({
          header: `${label(id)}${id === v.recommended.id ? ' (recommended)' : ''}`,
          width: 1.3,
          align: 'right' as const,
        })),
      ],
      st.shocks.map((s, k) => ({
        cells: [`${s.name}\n${s.description}`, ...st.rows.map((r) => formatPct(r.impacts[k]))],
      })),
    );
  }
}

function method(w: PageWriter, v: MemoView, title: string, hash: string): void {
  const { input, recommended: rc } = v;
  const doc = input.scenario.document;
  const spec = doc.candidates.find((c) => c.id === rc.id);
  w.heading(title);
  const est = input.run.estimate;
  const estimateFacts: string[] = [];
  if (est.shrinkage !== undefined && est.shrinkage !== null)
    estimateFacts.push(`shrinkage intensity ${formatRatio2(est.shrinkage)}`);
  if (est.observations !== undefined) estimateFacts.push(`${est.observations} observations`);
  if (est.conditionNumber !== undefined && Number.isFinite(est.conditionNumber))
    estimateFacts.push(`condition number ${formatAmount(est.conditionNumber, 0)}`);
  const window = doc.window
    ? [
        doc.window.from ? `from ${doc.window.from}` : '',
        doc.window.years ? `the last ${doc.window.years} years` : '',
        doc.window.to ? `to ${doc.window.to}` : '',
      ]
        .filter(Boolean)
        .join(' ')
    : 'all common history';
  const ppy = doc.periodsPerYear ?? { daily: 252, weekly: 52, monthly: 12 }[doc.returns.frequency];
  w.facts([
    [
      'Estimator',
      `${spec ? estimatorWords(spec.estimator) : est.method}${estimateFacts.length ? `; ${estimateFacts.join(', ')}` : ''}`,
    ],
    ['Objective', spec ? objectiveWords(spec.objective) : '\u2013'],
    ['Returns', `${doc.returns.frequency} ${doc.returns.method} returns, annualised with ${ppy} periods a year`],
    [
      'Window',
      `${window}; used ${input.run.returns.from} to ${input.run.returns.to} (${input.run.returns.observations} returns)`,
    ],
    ['Gaps', `a missing price is carried forward over at most ${doc.returns.maxFillDays} days, never longer`],
  ]);
  w.subheading('Limits of the recommended allocation');
  w.bullets(constraintSentences(effectiveConstraints(doc, rc.id), doc.current, v.name));
  w.subheading('Data sources');
  w.table(
    [
      { header: 'Source', width: 3 },
      { header: 'Assets', width: 0.8, align: 'right' },
      { header: 'From', width: 1.2, align: 'right' },
      { header: 'To', width: 1.2, align: 'right' },
    ],
    input.data.sources.map((s) => ({ cells: [s.name, String(s.assets), s.from, s.to] })),
  );
  w.subheading('Data notes and quality flags');
  const flags = [...input.data.flags, ...input.run.returns.warnings];
  if (flags.length === 0) w.paragraph('The import and the returns step raised no data-quality flags.');
  else w.bullets(flags);
  w.subheading('Audit trail');
  w.facts(
    [
      ['Scenario revision hash', input.scenario.hash],
      ['Memo hash', hash],
    ],
    120,
  );
  w.paragraph(
    'The revision hash is the SHA-256 of the canonical scenario document. The memo hash is the SHA-256 of the canonical JSON of everything this memo prints from (household, holdings, scenario revision, results, estimate, data notes, date, lot) together with the layout version; the same memo hash gives the same PDF bytes, so a reprint can be checked against the filed copy.',
    { muted: true, size: SIZE.small },
  );
}

function cautions(w: PageWriter, v: MemoView, title: string): void {
  const { input } = v;
  // Cautions and sign-off belong on one page: start a fresh one unless most of this one is free.
  w.heading(title, 520);
  const n = input.run.estimate.assets.length;
  const t = input.run.returns.observations;
  w.subheading('Assumptions');
  w.bullets([
    'Risk is measured by the covariance of past returns; the estimate is taken to describe the coming period.',
    input.data.fxConverted
      ? `Prices quoted in another currency were converted to ${input.household.baseCurrency} with exchange-rate series before returns were taken; amounts are market values, not units.`
      : `Returns are measured in each asset's price currency: no exchange-rate conversion was applied. Amounts are market values in ${input.household.baseCurrency}, not units.`,
    'Trades are sized from the holdings on the valuation date at those prices; costs and taxes of trading are not deducted from the trade amounts.',
  ]);
  w.subheading('Limitations');
  w.bullets([
    `The estimate rests on ${t} returns for ${n} assets (${formatFixed(t / Math.max(1, n), 1)} returns per asset); correlations move, most in market stress, when diversification is needed most.`,
    'The optimiser takes the estimate as exact: small changes in the data can move the weights (see the stability bands).',
    'Series with smoothed or appraisal-based prices understate volatility and correlation.',
    'Taxes, tax lots, liquidity of the household and its wider wealth are outside this memo unless the limits above include them.',
  ]);
  w.subheading('Cautions');
  w.keep(60);
  const y0 = w.doc.y;
  w.doc.rect(MARGIN.left, y0, 2.5, 44).fill(AMBER);
  w.doc.fillColor(INK).font(FONT_BOLD).fontSize(SIZE.body);
  w.doc.text(CAUTIONS.join(' '), MARGIN.left + 12, y0 + 2, { width: CONTENT_WIDTH - 12, lineGap: 2.2 });
  w.doc.y = Math.max(w.doc.y, y0 + 44) + 14;
  w.doc.font(FONT_REGULAR);

  w.subheading('Sign-off', 170);
  const colW = (CONTENT_WIDTH - 24) / 2;
  const top = w.doc.y;
  const block = (x: number, heading: string, lines: string[]) => {
    w.doc.font(FONT_BOLD).fontSize(SIZE.body).fillColor(INK).text(heading, x, top, { width: colW });
    let y = top + 22;
    for (const line of lines) {
      w.rule(y + 16, INK_SOFT, 0.5, x, x + colW);
      w.doc
        .font(FONT_REGULAR)
        .fontSize(SIZE.small)
        .fillColor(INK_SOFT)
        .text(line, x, y + 19, { width: colW });
      y += 38;
    }
    return y;
  };
  const y1 = block(MARGIN.left, `Prepared by ${input.preparedBy}`, ['Signature', 'Date']);
  const y2 = block(MARGIN.left + colW + 24, 'Reviewed by a licensed adviser', [
    'Name and licence or registration number',
    'Signature',
    'Date',
  ]);
  w.doc.y = Math.max(y1, y2) + 4;
  w.doc.x = MARGIN.left;
  w.doc.fillColor(INK);
}
