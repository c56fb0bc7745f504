import type { Matrix } from '../../../shared-core/linalg/matrix.js';
import type { CandidateMetrics, CandidateResult } from '../../../shared-core/optimise/result.js';
import { parseScenario, type Scenario } from '../../../shared-core/scenario/schema.js';
import { metricsFor } from '../../../src-main/memo/build-memo-input.js';
import type { MemoInput } from '../../../src-main/memo/memo-input.js';

/**
 * An invented household and universe for the memo's layout tests: a seeded two-factor
 * correlation structure, four hand-set candidate weight vectors, and their figures from
 * shared-core/analytics/risk (the functions the app and the command line use). The CLI tests
 * use the real scenario run instead.
 */
export const ASSETS = ['ALD-EQ', 'BRK-EQ', 'COR-EM', 'DUN-GOV', 'ELS-CR', 'SON-CR', 'GOR-AU', 'HED-RE', 'ILK-CASH'];

const INFO: Scenario['assetInfo'] = {
  'ALD-EQ': { name: 'Alder Global Equity', assetClass: 'Equity', currency: 'EUR' },
  'BRK-EQ': { name: 'Bracken Europe Equity', assetClass: 'Equity', currency: 'EUR' },
  'COR-EM': { name: 'Corrie Emerging Equity', assetClass: 'Equity', currency: 'USD' },
  'DUN-GOV': { name: 'Dunmore Government Bond', assetClass: 'Bonds', currency: 'EUR' },
  'ELS-CR': { name: 'Elsworth Credit', assetClass: 'Bonds', currency: 'EUR' },
  'SON-CR': { name: 'Søndre Crédit Côtier', assetClass: 'Bonds', currency: 'NOK' },
  'GOR-AU': { name: 'Gorse Gold', assetClass: 'Commodity', currency: 'USD' },
  'HED-RE': { name: 'Heddle Real Estate', assetClass: 'Real estate', currency: 'EUR', liquidity: 'monthly' },
  'ILK-CASH': { name: 'Ilkley Cash', assetClass: 'Cash', currency: 'EUR' },
};

/** Seeded linear congruential generator (Park and Miller 1988 constants), for repeatable data. */
function lcg(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 48271) % 2147483647;
    return s / 2147483647;
  };
}

export function covariance(n: number, seed = 11): Matrix {
  const rnd = lcg(seed);
  const vols = [0.16, 0.18, 0.22, 0.05, 0.07, 0.08, 0.15, 0.14, 0.01, 0.12, 0.2, 0.09];
  const equity = [0.85, 0.8, 0.75, -0.2, 0.3, 0.25, 0.1, 0.55, 0, 0.6, 0.7, 0.2];
  const rates = [-0.1, -0.1, 0, 0.9, 0.7, 0.65, 0.2, 0.3, 0.2, 0.1, -0.05, 0.5];
  const data = new Float64Array(n * n);
  const corr = (i: number, j: number) =>
    i === j ? 1 : (equity[i % 12] * equity[j % 12] + rates[i % 12] * rates[j % 12]) * 0.92 + (rnd() - 0.5) * 0.02;
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      const c = Math.max(-0.95, Math.min(0.95, corr(i, j)));
      const v = (i === j ? 1 : c) * vols[i % 12] * vols[j % 12];
      data[i * n + j] = v;
      data[j * n + i] = v;
    }
  return { rows: n, cols: n, data };
}

export function metricsOf(
  weights: Record<string, number>,
  assets: readonly string[],
  cov: Matrix,
  current?: Record<string, number>,
): CandidateMetrics {
  const turnover = current ? assets.reduce((s, a) => s + Math.abs((weights[a] ?? 0) - (current[a] ?? 0)), 0) : 0;
  return { ...metricsFor(weights, assets, cov), turnover };
}

const CURRENT = {
  'ALD-EQ': 0.3,
  'BRK-EQ': 0.22,
  'COR-EM': 0.08,
  'DUN-GOV': 0.15,
  'ELS-CR': 0.1,
  'SON-CR': 0,
  'GOR-AU': 0.02,
  'HED-RE': 0.08,
  'ILK-CASH': 0.05,
};

const WEIGHTS: Record<string, Record<string, number>> = {
  maxdiv: {
    'ALD-EQ': 0.1834,
    'BRK-EQ': 0.0421,
    'COR-EM': 0.0765,
    'DUN-GOV': 0.2512,
    'ELS-CR': 0.0,
    'SON-CR': 0.1123,
    'GOR-AU': 0.1488,
    'HED-RE': 0.1357,
    'ILK-CASH': 0.05,
  },
  minvar: {
    'ALD-EQ': 0.0412,
    'BRK-EQ': 0,
    'COR-EM': 0,
    'DUN-GOV': 0.25,
    'ELS-CR': 0.1288,
    'SON-CR': 0.0735,
    'GOR-AU': 0.0617,
    'HED-RE': 0.0448,
    'ILK-CASH': 0.4,
  },
  erc: {
    'ALD-EQ': 0.0871,
    'BRK-EQ': 0.0774,
    'COR-EM': 0.0633,
    'DUN-GOV': 0.2035,
    'ELS-CR': 0.1476,
    'SON-CR': 0.1302,
    'GOR-AU': 0.0955,
    'HED-RE': 0.0995,
    'ILK-CASH': 0.0959,
  },
  equal: Object.fromEntries(ASSETS.map((a) => [a, 1 / ASSETS.length])),
};

export function scenarioDocument(): Scenario {
  const parsed = parseScenario({
    format: 'holdfast-scenario@1',
    name: 'Core review 2026',
    baseCurrency: 'EUR',
    assets: ASSETS,
    window: { years: 5 },
    returns: { frequency: 'daily', method: 'log', maxFillDays: 5 },
    constraints: {
      longOnly: true,
      weightBounds: { default: [0, 0.25], 'ILK-CASH': [0.05, 0.4] },
      groups: [{ name: 'Equity', members: ['ALD-EQ', 'BRK-EQ', 'COR-EM'], min: 0.2, max: 0.6 }],
      maxTurnover: 0.8,
    },
    current: CURRENT,
    assetInfo: INFO,
    candidates: [
      {
        id: 'maxdiv',
        label: 'Most diversified',
        estimator: { method: 'ledoit-wolf' },
        objective: { method: 'max-diversification' },
      },
      {
        id: 'minvar',
        label: 'Lowest variance',
        estimator: { method: 'ledoit-wolf' },
        objective: { method: 'min-variance' },
      },
      {
        id: 'erc',
        label: 'Equal risk',
        estimator: { method: 'ewma', lambda: 0.97 },
        objective: { method: 'equal-risk-contribution' },
      },
      { id: 'equal', label: 'Equal weights', estimator: { method: 'sample' }, objective: { method: 'equal-weight' } },
      {
        id: 'tight',
        label: 'Low turnover',
        estimator: { method: 'sample' },
        objective: { method: 'max-diversification' },
        constraints: { maxTurnover: 0.01 },
      },
    ],
    recommended: 'maxdiv',
  });
  if (!parsed.ok) throw new Error(parsed.errors.map((e) => e.message).join('; '));
  return parsed.scenario;
}

function correlationWithPortfolio(weights: Record<string, number>, cov: Matrix, i: number): number {
  const n = ASSETS.length;
  const w = ASSETS.map((a) => weights[a] ?? 0);
  const sw = (k: number) => w.reduce((s, x, j) => s + cov.data[k * n + j] * x, 0);
  const variance = w.reduce((s, x, k) => s + x * sw(k), 0);
  return sw(i) / Math.sqrt(cov.data[i * n + i] * variance);
}

function candidate(id: string, label: string, cov: Matrix): CandidateResult {
  const weights = { ...WEIGHTS[id] };
  return {
    id,
    label,
    status: 'optimal',
    weights,
    metrics: metricsOf(weights, ASSETS, cov, CURRENT),
    solver: { iterations: 14, kktResidual: 3e-10, ms: 4 },
    explanations:
      id === 'maxdiv'
        ? {
            assets: ASSETS.map((a, i) => ({
              asset: a,
              weight: weights[a],
              reason: weights[a] > 0 ? 'held' : 'excluded',
              // Correlation with the portfolio, (Sigma w)_i / (sigma_i sigma_p), and 1/DR: the
              // figures explain.ts gives for maximum diversification (hand-set weights, so the
              // held ones need not meet the threshold exactly).
              measure: correlationWithPortfolio(weights, cov, i),
              threshold: 1 / metricsOf(weights, ASSETS, cov).diversificationRatio,
              text:
                weights[a] > 0
                  ? `${INFO![a]!.name} is held at ${(weights[a] * 100).toFixed(1)}%: its correlation with the portfolio equals 1/DR.`
                  : `${INFO![a]!.name} is left out: its correlation with the portfolio, 0.71, is above 1/DR = 0.58, so adding it would lower diversification.`,
            })),
            binding: [
              {
                constraint: 'weightBounds.DUN-GOV.upper',
                shadowPrice: 0.21,
                objectiveUnit: 'DR',
                text: 'The 25.0% cap on Dunmore Government Bond binds: one percentage point more would raise the diversification ratio by 0.0021.',
              },
              {
                constraint: 'weightBounds.ILK-CASH.lower',
                shadowPrice: -0.05,
                objectiveUnit: 'DR',
                text: 'The 5.0% floor on Ilkley Cash binds: one percentage point less would raise the diversification ratio by 0.0005.',
              },
            ],
            flags: [],
          }
        : undefined,
  };
}

export interface FixtureOptions {
  holdings?: boolean;
  extras?: boolean;
  createdOn?: string;
}

/** A complete memo input; `extras` adds stability bands, walk-forward and stress. */
export function memoFixture(options: FixtureOptions = {}): MemoInput {
  const cov = covariance(ASSETS.length);
  const annual = cov;
  const total = 4_837_250;
  const input: MemoInput = {
    household: {
      name: 'Famille Lefèvre-Østergård',
      baseCurrency: 'EUR',
      holdings:
        options.holdings === false
          ? undefined
          : {
              asOf: '2026-11-30',
              positions: ASSETS.filter((a) => CURRENT[a as keyof typeof CURRENT] > 0).map((a) => ({
                asset: a,
                amount: CURRENT[a as keyof typeof CURRENT] * total,
              })),
            },
    },
    preparedBy: 'Ana Ibáñez',
    createdOn: options.createdOn ?? '2026-12-01',
    scenario: { name: 'Core review 2026', revision: 3, hash: 'c0ffee'.padEnd(64, '7'), document: scenarioDocument() },
    run: {
      candidates: [
        candidate('maxdiv', 'Most diversified', cov),
        candidate('minvar', 'Lowest variance', cov),
        candidate('erc', 'Equal risk', cov),
        candidate('equal', 'Equal weights', cov),
        {
          id: 'tight',
          label: 'Low turnover',
          status: 'infeasible',
          message: 'turnover cap 1.0% cannot reach the cash floor',
          solver: { iterations: 40, kktResidual: 1, ms: 9 },
        },
      ],
      estimate: {
        assets: ASSETS,
        covariance: annual,
        method: 'Ledoit-Wolf, scaled identity',
        shrinkage: 0.1834,
        observations: 1259,
        conditionNumber: 412.7,
      },
      returns: { from: '2021-11-30', to: '2026-11-30', observations: 1259, warnings: [] },
    },
    recommended: 'maxdiv',
    rationale:
      'The household asked for a portfolio that does not depend on one market. The most diversified candidate spreads risk across rates, equity and real assets while keeping the cash floor the family set.',
    currentMetrics: metricsOf(CURRENT, ASSETS, cov),
    data: {
      sources: [
        { name: 'custodian-export-2026-11.csv', assets: 8, from: '2016-11-30', to: '2026-11-30' },
        { name: 'real-estate-nav-monthly.csv', assets: 1, from: '2018-01-31', to: '2026-10-31' },
      ],
      flags: ['Heddle Real Estate: monthly NAVs; 3 gaps longer than 5 days were left unfilled.'],
    },
    lot: 1000,
  };
  if (options.extras) {
    input.stability = {
      method: 'stationary block bootstrap, 200 resamples, mean block 20 days',
      quantiles: [0.05, 0.95],
      bands: ASSETS.map((a, i) => {
        const x = WEIGHTS.maxdiv[a];
        const half = 0.01 + 0.006 * (i % 4);
        return { asset: a, low: Math.max(0, x - half), high: x + half * 1.3 };
      }),
    };
    const dates: string[] = [];
    for (let y = 2022; y <= 2026; y++)
      for (let m = 1; m <= 12; m++) dates.push(`${y}-${String(m).padStart(2, '0')}-28`);
    const path = (drift: number, wobble: number) => dates.map((_, t) => Math.exp(drift * t + wobble * Math.sin(t / 3)));
    input.walkForward = {
      from: '2022-01-28',
      to: '2026-12-28',
      settings: 'monthly rebalancing, 10 bp costs, 250-day trailing window',
      rows: [
        {
          candidateId: 'maxdiv',
          annualisedReturn: 0.0512,
          volatility: 0.0821,
          sharpe: 0.41,
          maxDrawdown: 0.112,
          turnoverPerYear: 0.84,
        },
        {
          candidateId: 'minvar',
          annualisedReturn: 0.0288,
          volatility: 0.0409,
          sharpe: 0.27,
          maxDrawdown: 0.061,
          turnoverPerYear: 0.52,
        },
        {
          candidateId: 'erc',
          annualisedReturn: 0.0431,
          volatility: 0.0677,
          sharpe: 0.37,
          maxDrawdown: 0.097,
          turnoverPerYear: 0.33,
        },
        {
          candidateId: 'equal',
          annualisedReturn: 0.0466,
          volatility: 0.0902,
          sharpe: 0.31,
          maxDrawdown: 0.148,
          turnoverPerYear: 0.21,
        },
      ],
      growth: {
        dates,
        series: [
          { candidateId: 'maxdiv', values: path(0.0042, 0.02) },
          { candidateId: 'minvar', values: path(0.0024, 0.008) },
          { candidateId: 'erc', values: path(0.0036, 0.015) },
          { candidateId: 'equal', values: path(0.0039, 0.03) },
        ],
      },
    };
    input.stress = {
      shocks: [
        { name: 'Equity −30%', description: 'Equity group falls 30%' },
        { name: 'Rates +2 pp', description: 'Dunmore Government Bond falls 12%' },
        { name: 'Gold −20%', description: 'Gorse Gold falls 20%' },
      ],
      rows: [
        { candidateId: 'maxdiv', impacts: [-0.0906, -0.0301, -0.0298] },
        { candidateId: 'minvar', impacts: [-0.0124, -0.03, -0.0123] },
        { candidateId: 'erc', impacts: [-0.0683, -0.0244, -0.0191] },
        { candidateId: 'equal', impacts: [-0.1, -0.0133, -0.0222] },
      ],
    };
  }
  return input;
}
