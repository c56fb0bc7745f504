import type { MemoFreshness, RiskPair } from './attention.js';
import type { Breach } from './breaches.js';
import type { Drift } from './drift.js';

/** One household in the book review: what `holdfast review`, the service and the book screen show. */
export interface ReviewRow {
  householdId: string;
  household: string;
  baseCurrency: string;
  tolerance: number;
  note: string | null;
  reviewedAt: string | null;
  /** The scenario the household follows and its recommended candidate; null when none recommends one. */
  followed: {
    scenarioId: string;
    scenario: string;
    revision: number;
    revisionHash: string;
    savedAt: string;
    candidate: string;
    /** The scenario's base currency (the figures' currency). */
    baseCurrency: string;
  } | null;
  holdings: number;
  /** Figures, when they can be computed. */
  figures: {
    /** The recommended candidate's weights, solved on the prices up to the revision's day. */
    target: Record<string, number>;
    /** The holdings as weights of their value in the scenario's base currency. */
    current: Record<string, number>;
    drift: Drift;
    currentRisk: { then: RiskPair; now: RiskPair };
    recommendedRisk: { then: RiskPair; now: RiskPair };
    breaches: Breach[];
    /** With `resolve`: the recommended candidate re-solved on the latest prices. */
    resolved?:
      | { status: 'optimal'; moved: number; diversificationRatioChange: number }
      | { status: 'not-solved'; message: string };
  } | null;
  memo: MemoFreshness | null;
  status: 'ok' | 'attention' | 'cannot-compute';
  /** Why the household needs attention (or cannot be computed), in words. */
  reasons: string[];
}
