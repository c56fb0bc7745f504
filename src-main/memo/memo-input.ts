import type { Matrix } from '../../shared-core/linalg/matrix.js';
import type { CandidateMetrics, CandidateResult } from '../../shared-core/optimise/result.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';

/**
 * Everything the allocation memo prints, and nothing else: `renderMemo` is a pure function of
 * this object (plus the embedded font), so the same input gives the same PDF bytes. The command
 * line, the app's service layer and the tests fill it; `buildMemoInput` does it from a scenario,
 * its prices and the household's holdings.
 *
 * Weights are fractions (0.123 = 12.3 %); amounts are in the household's base currency.
 */
export interface MemoInput {
  household: MemoHousehold;
  /** Name or initials of the person who prepared the memo (the app's settings). */
  preparedBy: string;
  /**
   * The memo's date, ISO `YYYY-MM-DD`. It is an input, never the clock: the PDF's creation and
   * modification dates (and so its file identifier) are set from it, midnight UTC.
   */
  createdOn: string;
  scenario: MemoScenario;
  run: MemoRun;
  /** Id of the candidate the memo recommends (one of `run.candidates`). */
  recommended: string;
  /** The advisor's own reasons for the choice, printed in the summary before the figures. */
  rationale?: string;
  /** Figures of the current holdings under the recommended candidate's estimate; null without holdings. */
  currentMetrics: CandidateMetrics | null;
  walkForward?: MemoWalkForward;
  stability?: MemoStability;
  stress?: MemoStress;
  data: MemoData;
  /** Trades are rounded to multiples of this amount in the base currency (e.g. 1000). */
  lot: number;
}

export interface MemoPosition {
  asset: string;
  /** Market value in the base currency. */
  amount: number;
}

export interface MemoHousehold {
  name: string;
  /** ISO 4217. */
  baseCurrency: string;
  /** Current holdings in the base currency; absent when only weights are known (no trade amounts then). */
  holdings?: { asOf: string | null; positions: MemoPosition[] };
}

export interface MemoScenario {
  name: string;
  revision: number;
  /** SHA-256 of the canonical scenario document (the store's revision hash). */
  hash: string;
  /** The validated document: window, returns, constraints, asset information, current weights. */
  document: Scenario;
}

export interface MemoEstimate {
  /** Asset order of `covariance`. */
  assets: readonly string[];
  /** Annualised covariance of the estimate the recommended candidate used. */
  covariance: Matrix;
  method: string;
  /** Shrinkage intensity and similar figures, printed in the method section where present. */
  shrinkage?: number | null;
  observations?: number;
  conditionNumber?: number;
}

export interface MemoRun {
  /** In the scenario's candidate order (which fixes each candidate's colour). */
  candidates: readonly CandidateResult[];
  /** The estimate of the recommended candidate: the correlation heat map is drawn from it. */
  estimate: MemoEstimate;
  /** The return series the estimates came from. */
  returns: { from: string; to: string; observations: number; warnings: readonly string[] };
}

/** Weight bands from resampling (the stability analysis), in the recommended candidate's terms. */
export interface MemoStability {
  /** How the bands were made, in plain words: "stationary block bootstrap, 200 resamples, blocks of 20 days". */
  method: string;
  /** The band's quantiles, e.g. [0.05, 0.95]. */
  quantiles: [number, number];
  bands: { asset: string; low: number; high: number }[];
}

export interface MemoWalkForward {
  from: string;
  to: string;
  /** Plain words: "monthly rebalancing, 10 bp costs, 250-day trailing window". */
  settings: string;
  rows: {
    candidateId: string;
    annualisedReturn: number;
    volatility: number;
    sharpe: number | null;
    maxDrawdown: number;
    /** Average one-way turnover per year. */
    turnoverPerYear: number;
  }[];
  /** Growth of 1 per candidate on shared dates, for the chart. */
  growth?: { dates: readonly string[]; series: { candidateId: string; values: readonly number[] }[] };
}

export interface MemoStress {
  /** How the shocks were applied, in words (printed before the table). */
  method?: string;
  shocks: { name: string; description: string }[];
  /** Portfolio return under each shock, one row per candidate, in shock order. */
  rows: { candidateId: string; impacts: number[] }[];
}

export interface MemoData {
  /** Where the prices came from, with the dates each covers. */
  sources: { name: string; assets: number; from: string; to: string }[];
  /** Data-quality flags from the import (gaps, stale prices, suspicious jumps), as sentences. */
  flags: readonly string[];
  /** True when prices in other currencies were converted to the base currency before returns were taken. */
  fxConverted?: boolean;
}

/** Bumped whenever the layout changes, so the memo hash changes with it. */
export const MEMO_LAYOUT_VERSION = 'holdfast-memo@3';
