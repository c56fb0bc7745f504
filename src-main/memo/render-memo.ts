import { correlationMatrix } from '../../shared-core/analytics/risk.js';
import type { CandidateResult, OptimalCandidate } from '../../shared-core/optimise/result.js';
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
  countOf,
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
import { CONTENT_WIDTH, MARGIN, PageWriter, SIZE, type Column, type TableRow } from './page-writer.js';
import { FONT_BOLD, FONT_REGULAR } from './fonts.js';
import {
  constraintSentences,
  effectiveConstraints,
  estimatorShort,
  estimatorWords,
  objectiveWords,
} from './plain-words.js';
import { reasonsTable } from './reasons-table.js';
import { assetClassWords } from '../../shared-core/scenario/asset-class.js';

/** The cautions every memo carries, word for word (the brief's rule; tests look for them). */
export const CAUTIONS = [
  'Estimates come from past data.',
  'Past performance does not guarantee future results.',
  'This memo is not a recommendation until it has been reviewed by a licensed adviser under the local rules that apply.',
] as const;

/**
 * Section titles. The body, numbered, is what a client reads: the recommendation with its
 * figures and the total of the trades, the trades, the risk, and how the candidates would have
 * fared (the walk-forward test) when the revision has one. The appendix, lettered from A, carries
 * the evidence: the reasons, the stability bands when the revision has them, the candidates, the
 * method and data, the cautions and sign-off.
 */
export const SECTION_TITLES = {
  recommendation: 'The recommendation',
  trades: 'The trades',
  risk: 'Where the risk comes from',
  reasons: 'Why each position is held or left out',
  stability: 'How stable the weights are',
  candidates: 'Candidates considered',
  walkForward: 'Walk-forward test',
  method: 'Method and data',
  cautions: 'Cautions and sign-off',
} as const;

/** The headings the memo prints for `input`, in order, with their numbers and letters. */
export function memoHeadings(input: MemoInput): string[] {
  const t = SECTION_TITLES;
  const body = [t.recommendation, t.trades, t.risk, ...(input.walkForward ? [t.walkForward] : [])].map(
    (title, i) => `${i + 1}  ${title}`,
  );
  const appendix = [t.reasons, ...(input.stability ? [t.stability] : []), t.candidates, t.method, t.cautions].map(
    (title, i) => `${String.fromCharCode(65 + i)}  ${title}`,
  );
  return [...body, ...appendix];
}

/** Height of a bar chart with one bar per asset. */
const barsHeight = (n: number) => Math.max(100, 18 + n * 12);

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
  const headings = memoHeadings(input);
  const next = () => headings.shift()!;

  masthead(w, view);
  recommendation(w, view, next());
  trades(w, view, next());
  risk(w, view, next());
  if (input.walkForward) walkForward(w, view, next());
  w.pageBreak();
  reasons(w, view, next());
  if (input.stability) stability(w, view, next());
  candidates(w, view, next());
  method(w, view, next(), hash);
  cautions(w, view, next());

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

/** The top of page 1: who the memo is for, which scenario and revision, when and by whom. */
function masthead(w: PageWriter, v: MemoView): void {
  const { input } = v;
  const doc = w.doc;
  doc.font(FONT_REGULAR).fontSize(8.5).fillColor(INK_SOFT).text('ALLOCATION MEMO', MARGIN.left, doc.y, {
    characterSpacing: 1.4,
  });
  w.space(4);
  doc.font(FONT_BOLD).fontSize(SIZE.title).fillColor(INK).text(input.household.name, MARGIN.left, doc.y, {
    width: CONTENT_WIDTH,
  });
  w.space(2);
  doc
    .font(FONT_REGULAR)
    .fontSize(11.5)
    .fillColor(INK)
    .text(`${input.scenario.name}, revision ${input.scenario.revision}`, MARGIN.left, doc.y, { width: CONTENT_WIDTH });
  w.space(3);
  doc
    .font(FONT_REGULAR)
    .fontSize(SIZE.small)
    .fillColor(INK_SOFT)
    .text(
      [
        input.createdOn,
        `prepared by ${input.preparedBy}`,
        `base currency ${input.household.baseCurrency}`,
        `revision hash ${input.scenario.hash.slice(0, 16)}`,
      ].join('  \u00b7  '),
      MARGIN.left,
      doc.y,
      { width: CONTENT_WIDTH },
    );
  w.space(8);
  w.rule(doc.y, RULE, 0.6);
  w.space(14);
  doc.fillColor(INK).font(FONT_REGULAR).fontSize(SIZE.body);
}

function rank(values: number[], value: number, descending: boolean): number {
  return values.filter((x) => (descending ? x > value + 1e-12 : x < value - 1e-12)).length + 1;
}

/** Page 1: the recommendation, its figures against the current holdings, the trades in total. */
function recommendation(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc, trades: plan } = v;
  const m = rc.metrics;
  const spec = input.scenario.document.candidates.find((c) => c.id === rc.id);
  w.heading(title);
  if (input.rationale) w.paragraph(input.rationale);
  const solved = input.run.candidates.filter((c): c is OptimalCandidate => c.status === 'optimal');
  const drs = solved.map((c) => c.metrics.diversificationRatio);
  const vols = solved.map((c) => c.metrics.volatility);
  const how = spec ? ` (${objectiveWords(spec.objective)}, ${estimatorWords(spec.estimator)})` : '';
  const sentences = [
    `The recommended allocation is ${v.candidateLabel(rc)}${how}.`,
    solved.length > 1
      ? `Of the ${countOf(solved.length, 'candidate')} solved, its diversification ratio of ${formatRatio2(m.diversificationRatio)} ranks ${ordinal(rank(drs, m.diversificationRatio, true))} highest and its volatility of ${formatPct(m.volatility)} a year ranks ${ordinal(rank(vols, m.volatility, false))} lowest.`
      : `It is the only candidate solved; its diversification ratio is ${formatRatio2(m.diversificationRatio)} and its volatility ${formatPct(m.volatility)} a year.`,
  ];
  const cm = input.currentMetrics;
  if (cm)
    sentences.push(
      `Against the current holdings, volatility moves from ${formatPct(cm.volatility)} to ${formatPct(m.volatility)} and the diversification ratio from ${formatRatio2(cm.diversificationRatio)} to ${formatRatio2(m.diversificationRatio)}, for a turnover of ${formatPct(m.turnover)} of the portfolio.`,
    );
  w.paragraph(sentences.join(' '));
  w.space(2);
  const has = cm !== null;
  const cols: Column[] = [
    { header: 'Figure', width: 2.4 },
    ...(has ? [{ header: 'Current holdings', width: 1.6, align: 'right' as const }] : []),
    { header: `Recommended: ${v.candidateLabel(rc)}`, width: 2.2, align: 'right' },
  ];
  const row = (label: string, current: string | null, target: string): TableRow => ({
    cells: has ? [label, current ?? '\u2013', target] : [label, target],
  });
  w.table(cols, [
    row('Volatility, annualised', cm ? formatPct(cm.volatility) : null, formatPct(m.volatility)),
    row(
      'Diversification ratio',
      cm ? formatRatio2(cm.diversificationRatio) : null,
      formatRatio2(m.diversificationRatio),
    ),
    row('Effective number of bets', cm ? formatRatio2(cm.effectiveBets) : null, formatRatio2(m.effectiveBets)),
    row(
      'Effective number of holdings',
      cm ? formatRatio2(cm.effectiveHoldings) : null,
      formatRatio2(m.effectiveHoldings),
    ),
    row('Turnover from current', cm ? '\u2013' : null, formatPct(m.turnover)),
  ]);
  w.paragraph(
    `Volatility and the diversification ratio are measured with the recommended candidate's estimate (${input.run.estimate.method}) over ${input.run.returns.from} to ${input.run.returns.to}, annualised. Effective number of bets after Meucci (2009); effective number of holdings is 1 / sum of squared weights.`,
    { muted: true, size: SIZE.small },
  );

  w.subheading('The trades in total');
  const ccy = input.household.baseCurrency;
  if (plan) {
    const buys = plan.rows.filter((r) => r.trade > 0);
    const sells = plan.rows.filter((r) => r.trade < 0);
    const full = sells.filter((r) => r.after === 0).length;
    w.facts([
      [
        'Holdings valued at',
        `${formatMoney(plan.total, ccy, plan.decimals)}${input.household.holdings?.asOf ? ` on ${input.household.holdings.asOf}` : ''}`,
      ],
      ['Buys', `${formatMoney(plan.buys, ccy, plan.decimals)} in ${countOf(buys.length, 'trade')}`],
      [
        'Sales',
        `${formatMoney(plan.sells, ccy, plan.decimals)} in ${countOf(sells.length, 'trade')}${full > 0 ? `, ${countOf(full, 'position')} sold in full` : ''}`,
      ],
      ['Cash left from rounding', formatMoney(plan.residual, ccy, plan.decimals)],
      ['Turnover', `${formatPct(m.turnover)} of the portfolio (sum of the absolute weight changes)`],
    ]);
  } else if (v.current) {
    w.facts([
      ['Turnover', `${formatPct(m.turnover)} of the portfolio (sum of the absolute weight changes)`],
      ['Trade amounts', 'none: the household\u2019s holding amounts were not given'],
    ]);
  } else {
    w.paragraph('The scenario gives no current holdings: the memo shows the target weights only.');
  }
  w.space(4);
  w.paragraph(`For discussion with the household and for review by a licensed adviser. ${CAUTIONS.join(' ')}`, {
    muted: true,
    size: SIZE.small,
  });
}

/** The trades, asset by asset, and the weights before and after. */
function trades(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc, trades: plan, current } = v;
  const ccy = input.household.baseCurrency;
  const info = input.scenario.document.assetInfo ?? {};
  w.heading(title);
  if (plan) {
    w.paragraph(
      `Each trade takes a position to its target weight, rounded to a lot of ${formatMoney(plan.lot, ccy, plan.decimals)}; a position sold in full is sold to the last unit. Amounts are market values in ${ccy}, by target weight.`,
    );
  } else if (current) {
    w.paragraph('No holding amounts were given, so changes are shown as weights only, without trade amounts.');
  } else {
    w.paragraph('The scenario gives no current holdings: the table shows the target weights only.');
  }
  const cols: Column[] = [
    { header: 'Asset', width: 3.3 },
    { header: 'Class', width: 1.5 },
    { header: 'Ccy', width: 0.6 },
    ...(current
      ? [
          { header: 'Current %', width: 1.05, align: 'right' as const },
          { header: 'Target %', width: 1.05, align: 'right' as const },
          { header: 'Change pp', width: 1.05, align: 'right' as const },
        ]
      : [{ header: 'Target %', width: 1.05, align: 'right' as const }]),
    ...(plan ? [{ header: `Trade ${ccy}`, width: 1.5, align: 'right' as const }] : []),
  ];
  const tradeOf = new Map(plan?.rows.map((r) => [r.asset, r]) ?? []);
  const rows: TableRow[] = v.shown.map((a) => {
    const target = rc.weights[a] ?? 0;
    const cells = [
      v.name(a),
      info[a]?.assetClass ? assetClassWords(info[a].assetClass) : '\u2013',
      info[a]?.currency ?? ccy,
    ];
    if (current)
      cells.push(formatPercent1(current[a] ?? 0), formatPercent1(target), formatWeightChange(current[a] ?? 0, target));
    else cells.push(formatPercent1(target));
    if (plan) cells.push(formatTrade(tradeOf.get(a)!.trade, plan.decimals));
    return { cells };
  });
  const sumTarget = Object.values(rc.weights).reduce((s, x) => s + x, 0);
  if (plan) {
    const blanks = current ? ['', '', ''] : [''];
    rows.push({
      cells: [`Cash left from rounding to lots`, '', '', ...blanks, formatTrade(plan.residual, plan.decimals)],
      muted: true,
    });
  }
  const totalCells = ['Total', '', ''];
  if (current) {
    const sumCurrent = Object.values(current).reduce((s, x) => s + x, 0);
    totalCells.push(formatPercent1(sumCurrent), formatPercent1(sumTarget), formatWeightChange(sumCurrent, sumTarget));
  } else totalCells.push(formatPercent1(sumTarget));
  if (plan) {
    const net = plan.rows.reduce((s, r) => s + r.trade, 0) + plan.residual;
    totalCells.push(formatTrade(net, plan.decimals));
  }
  rows.push({ cells: totalCells, total: true });
  w.table(cols, rows);
  const notes = [
    'Each percentage is the weight rounded on its own to one decimal, so a column may not add to exactly 100.0; the change is the difference of the printed weights, in percentage points.',
  ];
  if (v.unused.length > 0) notes.push(`Neither held nor proposed: ${listInWords(v.unused.map(v.name))}.`);
  w.paragraph(notes.join(' '), { muted: true, size: SIZE.small });

  const order = v.shown;
  const height = barsHeight(order.length);
  let finding = 'Target weights of the recommended allocation';
  if (current) {
    const deltas = order.map((a) => [a, (rc.weights[a] ?? 0) - (current[a] ?? 0)] as const);
    const up = [...deltas].sort((x, y) => y[1] - x[1])[0];
    const down = [...deltas].sort((x, y) => x[1] - y[1])[0];
    if (up && down && up[1] > 0.0005 && down[1] < -0.0005)
      finding = `The largest increase is ${v.name(up[0])} (${formatWeightChange(current[up[0]] ?? 0, rc.weights[up[0]] ?? 0)} pp), the largest reduction ${v.name(down[0])} (${formatWeightChange(current[down[0]] ?? 0, rc.weights[down[0]] ?? 0)} pp)`;
  }
  w.chart(
    renderChartSvg(
      pairedBarsOption(
        order.map((a) => ({
          label: v.name(a),
          current: current ? (current[a] ?? 0) : null,
          target: rc.weights[a] ?? 0,
        })),
        candidateColour(v.recommendedIndex),
      ),
      CONTENT_WIDTH,
      height,
    ),
    height,
    finding,
    `Weights in % of the portfolio. Solid bars: target; outlined bars: current holdings. Sorted by target weight.`,
  );
}

/** Where the risk comes from: contributions, correlations and, when the revision has them, stresses. */
function risk(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc } = v;
  const m = rc.metrics;
  const cm = input.currentMetrics;
  w.heading(title);
  const order = v.shown;
  const top = [...order].sort((a, b) => (m.riskContributions[b] ?? 0) - (m.riskContributions[a] ?? 0))[0];
  const finding = top
    ? `${v.name(top)} carries the most risk: ${formatPct(m.riskContributions[top] ?? 0)} of the total for ${formatPct(rc.weights[top] ?? 0)} of the weight`
    : 'Risk contributions';
  const height = barsHeight(order.length);
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
  const cells = Math.min(300, 20 * assets.length);
  const side = cells + 95;
  const width = Math.min(CONTENT_WIDTH, cells + 170);
  w.chart(
    renderChartSvg(heatmapOption(labels, ordered, columns), width, side),
    side,
    corrFinding,
    `Correlations of the estimate the recommended allocation used (${input.run.estimate.method}). Blue negative, white zero, red positive; assets ordered by average-linkage clustering on sqrt((1 \u2212 rho) / 2) so that correlated groups sit together.`,
    width,
  );

  const st = input.stress;
  if (st) {
    w.subheading('Stress tests');
    const own = st.rows.find((r) => r.candidateId === rc.id);
    const others = st.rows.filter((r) => r.candidateId !== rc.id);
    w.paragraph(
      `Portfolio return of the recommended weights under each stress${st.method ? `: ${st.method}` : ''}.${others.length ? ` The last column gives the range over the other ${countOf(others.length, 'candidate')}.` : ''}`,
    );
    const range = (k: number) => {
      const xs = others.map((r) => r.impacts[k]).filter((x) => Number.isFinite(x));
      if (xs.length === 0) return '\u2013';
      const lo = Math.min(...xs);
      const hi = Math.max(...xs);
      return formatPct(lo) === formatPct(hi) ? formatPct(lo) : `${formatPct(lo)} to ${formatPct(hi)}`;
    };
    w.table(
      [
        { header: 'Stress', width: 2.7 },
        { header: 'Period or shock', width: 3.4 },
        { header: 'Recommended', width: 1.15, align: 'right' },
        ...(others.length ? [{ header: 'Other candidates', width: 1.4, align: 'right' as const }] : []),
      ],
      st.shocks.map((s, k) => ({
        cells: [
          s.name,
          s.description,
          own ? formatPct(own.impacts[k]) : '\u2013',
          ...(others.length ? [range(k)] : []),
        ],
      })),
      { fontSize: 7.5 },
    );
  }
}

function labelOf(v: MemoView, id: string): string {
  const c = v.input.run.candidates.find((x) => x.id === id);
  return c ? v.candidateLabel(c) : id;
}

function colourOf(v: MemoView, id: string): string {
  return candidateColour(
    Math.max(
      0,
      v.input.run.candidates.findIndex((x) => x.id === id),
    ),
  );
}

function correlationRows(input: MemoInput): number[][] {
  const c = correlationMatrix(input.run.estimate.covariance);
  return Array.from({ length: c.rows }, (_, i) => Array.from(c.data.subarray(i * c.cols, (i + 1) * c.cols)));
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

/** Appendix: the solver's reasons for the recommended allocation as a table, one row per asset. */
function reasons(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc, current } = v;
  const spec = input.scenario.document.candidates.find((c) => c.id === rc.id);
  const table = reasonsTable(rc, spec?.objective);
  w.heading(title);
  const ex = rc.explanations;
  if (!table) {
    w.paragraph('The solver gave no per-asset explanation for this candidate.', { muted: true });
  } else {
    const lead = `${table.rule ? `${table.rule} ` : ''}Figures of the recommended allocation, ${v.candidateLabel(rc)}, from the solver\u2019s optimality conditions; share of risk as in section 3.`;
    w.keep(w.paragraphHeight(lead) + 90);
    w.paragraph(lead);
    const riskColumn = spec?.objective.method !== 'equal-risk-contribution';
    const cols: Column[] = [
      { header: 'Asset', width: 3.4 },
      ...(current ? [{ header: 'Current %', width: 0.8, align: 'right' as const }] : []),
      { header: 'Target %', width: 0.8, align: 'right' },
      ...(riskColumn ? [{ header: 'Share of risk %', width: 0.85, align: 'right' as const }] : []),
      { header: 'Position', width: 2.2 },
      ...(table.measureHeader
        ? [
            { header: table.measureHeader, width: 1.05, align: 'right' as const },
            { header: table.thresholdHeader ?? 'Threshold', width: 0.85, align: 'right' as const },
          ]
        : []),
    ];
    const risks = rc.metrics.riskContributions;
    w.table(
      cols,
      table.rows.map((r) => ({
        cells: [
          v.name(r.asset),
          ...(current ? [formatPercent1(current[r.asset] ?? 0)] : []),
          formatPercent1(r.weight),
          ...(riskColumn ? [formatPercent1(risks[r.asset] ?? 0)] : []),
          r.position,
          ...(table.measureHeader ? [r.measure, r.threshold] : []),
        ],
      })),
      { fontSize: SIZE.small },
    );
  }
  w.subheading('What the binding limits cost');
  if (!ex || ex.binding.length === 0) w.paragraph('No limit was binding at the solution.');
  else w.bullets(ex.binding.map((b) => sentence(withNames(v, b.text))));
  if (ex && ex.flags.length > 0) {
    w.subheading('Solver notes');
    w.bullets(ex.flags.map((f) => sentence(withNames(v, f))));
  }
}

/** Appendix, when the revision has a stability analysis: the weight bands across resamples. */
function stability(w: PageWriter, v: MemoView, title: string): void {
  const { input, recommended: rc } = v;
  const st = input.stability!;
  w.heading(title);
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
  const height = barsHeight(order.length);
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
    'Weights in % of the portfolio. Shaded bar: band across resamples; dark tick: the target weight. Same order as the trades table.',
  );
}

function candidateFigures(c: CandidateResult): { vol: string; dr: string; bets: string; turnover: string } {
  if (c.status !== 'optimal') return { vol: '\u2013', dr: '\u2013', bets: '\u2013', turnover: '\u2013' };
  return {
    vol: formatPct(c.metrics.volatility),
    dr: formatRatio2(c.metrics.diversificationRatio),
    bets: formatRatio2(c.metrics.effectiveBets),
    turnover: formatPct(c.metrics.turnover),
  };
}

/** Assets some solved candidate holds: the trades table's order, then the others. */
function candidateRows(v: MemoView): string[] {
  const held = (a: string) =>
    v.input.run.candidates.some((c) => c.status === 'optimal' && Math.abs(c.weights[a] ?? 0) >= 0.0005);
  return [...v.shown, ...v.unused].filter(held);
}

/** At most this many candidate columns in one table; more are split into even groups. */
const CANDIDATES_PER_TABLE = 7;

function candidates(w: PageWriter, v: MemoView, title: string): void {
  const { input } = v;
  const all = input.run.candidates;
  w.heading(title);
  const infeasible = all.filter((c) => c.status !== 'optimal');
  const lead = [
    all.length === 1
      ? 'One candidate was solved, the recommended one. Assets it does not hold are left out.'
      : `${countOf(all.length, 'candidate')} were solved on the same data, one column each; the recommended one is marked. Assets no candidate holds are left out.`,
  ];
  if (infeasible.length)
    lead.push(
      `Not solved: ${listInWords(infeasible.map((c) => `${v.candidateLabel(c)} (${c.status}${c.message ? `: ${c.message}` : ''})`))}.`,
    );
  w.paragraph(lead.join(' '));
  // The scatter first: it sums the table up, and the table may then flow over a page break.
  const points = all
    .map((c, i) => ({ c, i }))
    .flatMap(({ c, i }) =>
      c.status === 'optimal'
        ? [
            {
              label: v.candidateLabel(c),
              volatility: c.metrics.volatility,
              diversificationRatio: c.metrics.diversificationRatio,
              colour: candidateColour(i),
              recommended: c.id === v.recommended.id,
            },
          ]
        : [],
    );
  if (points.length > 1) {
    const best = [...points].sort((a, b) => b.diversificationRatio - a.diversificationRatio)[0];
    const calm = [...points].sort((a, b) => a.volatility - b.volatility)[0];
    w.chart(
      renderChartSvg(candidatesScatterOption(points, CONTENT_WIDTH, 170), CONTENT_WIDTH, 170),
      170,
      best.label === calm.label
        ? `${best.label} has both the highest diversification ratio and the lowest volatility`
        : `${best.label} diversifies most (${formatRatio2(best.diversificationRatio)}); ${calm.label} has the lowest volatility (${formatPct(calm.volatility)})`,
      'Each point is a solved candidate in its colour; the diamond is the recommended one. Volatility annualised, in %.',
    );
  }
  const groups = Math.ceil(all.length / CANDIDATES_PER_TABLE);
  const per = Math.ceil(all.length / Math.max(1, groups));
  const specOf = (c: CandidateResult) => input.scenario.document.candidates.find((s) => s.id === c.id);
  const assets = candidateRows(v);
  for (let start = 0; start < all.length; start += per) {
    const chunk = all.slice(start, start + per);
    const cols: Column[] = [
      { header: 'Figure', width: 2.4 },
      ...chunk.map((c) => ({
        header: `${v.candidateLabel(c)}${c.id === v.recommended.id ? ' (recommended)' : ''}`,
        width: 1.15,
        align: 'right' as const,
      })),
    ];
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
      ...assets.map((a) => ({
        cells: [
          v.name(a),
          ...chunk.map((c) => (c.status === 'optimal' ? formatPercent1(c.weights[a] ?? 0) : '\u2013')),
        ],
      })),
    ];
    w.table(cols, rows, { fontSize: chunk.length > 4 ? 7.5 : SIZE.table });
  }
}

/** Body, when the revision has one: the walk-forward test of every candidate. */
function walkForward(w: PageWriter, v: MemoView, title: string): void {
  const wf = v.input.walkForward!;
  w.heading(title);
  w.paragraph(
    `Each candidate was re-estimated and rebalanced through time using only the prices known on each date, from ${wf.from} to ${wf.to}: ${wf.settings}. Figures are after costs.`,
  );
  const lines = wf.growth && wf.growth.dates.length > 1;
  w.table(
    [
      { header: 'Candidate', width: 3.2 },
      { header: 'Return a year', width: 1.05, align: 'right' },
      { header: 'Volatility', width: 1.0, align: 'right' },
      { header: 'Sharpe ratio', width: 0.95, align: 'right' },
      { header: 'Max drawdown', width: 1.05, align: 'right' },
      { header: 'Turnover a year', width: 1.1, align: 'right' },
    ],
    wf.rows.map((r) => ({
      cells: [
        `${labelOf(v, r.candidateId)}${r.candidateId === v.recommended.id ? ' (recommended)' : ''}`,
        formatPct(r.annualisedReturn),
        formatPct(r.volatility),
        r.sharpe === null ? '\u2013' : formatRatio2(r.sharpe),
        formatPct(-Math.abs(r.maxDrawdown)),
        formatPct(r.turnoverPerYear),
      ],
      // The swatches are the growth chart's key.
      ...(lines ? { swatch: colourOf(v, r.candidateId) } : {}),
    })),
  );
  if (wf.growth && lines) {
    const series = wf.growth.series.map((s) => ({
      label: labelOf(v, s.candidateId),
      colour: colourOf(v, s.candidateId),
      values: s.values,
    }));
    const ends = series.map((s) => [s.label, s.values[s.values.length - 1]] as const).sort((a, b) => b[1] - a[1]);
    w.chart(
      renderChartSvg(growthOption(wf.growth.dates, series), CONTENT_WIDTH, 150),
      150,
      `Growth of 1 after costs: ${ends[0][0]} ends ${series.length > 1 ? 'highest ' : ''}at ${formatFixed(ends[0][1], 2)}`,
      'Log scale; each line in the colour of its candidate\u2019s swatch in the table above. Past performance does not guarantee future results.',
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
  if (est.observations !== undefined) estimateFacts.push(countOf(est.observations, 'observation'));
  if (est.conditionNumber !== undefined && Number.isFinite(est.conditionNumber))
    estimateFacts.push(`condition number ${formatAmount(est.conditionNumber, 0)}`);
  const window = doc.window
    ? [
        doc.window.from ? `from ${doc.window.from}` : '',
        doc.window.years ? `the last ${countOf(doc.window.years, 'year')}` : '',
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
      `${window}; used ${input.run.returns.from} to ${input.run.returns.to} (${countOf(input.run.returns.observations, 'return')})`,
    ],
    [
      'Gaps',
      `a missing price is carried forward over at most ${countOf(doc.returns.maxFillDays, 'day')}, never longer`,
    ],
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
  else w.bullets(flags.map((f) => sentence(withNames(v, f))));
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
  w.heading(title);
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
    `The estimate rests on ${countOf(t, 'return')} for ${countOf(n, 'asset')} (${formatFixed(t / Math.max(1, n), 1)} returns per asset); correlations move, most in market stress, when diversification is needed most.`,
    input.stability
      ? 'The optimiser takes the estimate as exact: small changes in the data can move the weights, as the stability bands in this appendix show.'
      : 'The optimiser takes the estimate as exact: small changes in the data can move the weights. No stability analysis was run for this revision.',
    'Series with smoothed or appraisal-based prices understate volatility and correlation.',
    'Taxes, tax lots, liquidity of the household and its wider wealth are outside this memo unless the limits above include them.',
  ]);
  w.subheading('Cautions');
  w.doc.font(FONT_BOLD).fontSize(SIZE.body);
  const text = CAUTIONS.join(' ');
  const boxH = Math.max(30, w.doc.heightOfString(text, { width: CONTENT_WIDTH - 12, lineGap: 2.2 }) + 6);
  w.keep(boxH + 8);
  const y0 = w.doc.y;
  w.doc.rect(MARGIN.left, y0, 2.5, boxH).fill(AMBER);
  w.doc.fillColor(INK).font(FONT_BOLD).fontSize(SIZE.body);
  w.doc.text(text, MARGIN.left + 12, y0 + 2, { width: CONTENT_WIDTH - 12, lineGap: 2.2 });
  w.doc.y = Math.max(w.doc.y, y0 + boxH) + 12;
  w.doc.font(FONT_REGULAR);

  w.subheading('Sign-off');
  const colW = (CONTENT_WIDTH - 24) / 2;
  // The two signature blocks stay together on one page.
  w.keep(22 + 3 * 34 + 8);
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
      y += 34;
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
