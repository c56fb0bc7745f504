import { formatPct, formatSignedPct } from '../present/format.js';
import type { Breach } from './breaches.js';
import type { Drift } from './drift.js';

/**
 * Whether a household needs the advisor's attention after a price refresh, and why, in words.
 * The rules (common practice, no single source; domain notes): holdings drifted beyond the
 * household's tolerance; a mandate limit broken by the holdings; the risk of the holdings moved
 * markedly since the recommendation was saved; a memo printed before its prices,
 * holdings or scenario last changed; and a household whose figures cannot be computed.
 */

/** Default drift tolerance: 5 percentage points of sum |current - target| (common practice). */
export const DEFAULT_DRIFT_TOLERANCE = 0.05;

/**
 * A change in the holdings' volatility of at least this share of its earlier value is "risk moved"
 * (the project's own threshold, printed beside the figures so the advisor can judge it).
 */
export const RISK_MOVE_SHARE = 0.1;

export interface RiskPair {
  volatility: number;
  diversificationRatio: number;
}

export interface MemoFreshness {
  printedAt: string;
  /** What changed after the memo was printed. */
  changedSince: { prices: boolean; holdings: boolean; scenario: boolean };
}

export interface AttentionInput {
  tolerance: number;
  drift: Drift | null;
  breaches: readonly Breach[];
  /** The holdings' risk at the revision's date and on the latest prices. */
  currentRisk: { then: RiskPair; now: RiskPair } | null;
  memo: MemoFreshness | null;
  /** Why the figures cannot be computed, when they cannot. */
  problem: string | null;
  hasHoldings: boolean;
}

export function attentionReasons(input: AttentionInput): string[] {
  if (input.problem !== null) return [input.problem];
  const reasons: string[] = [];
  if (!input.hasHoldings) reasons.push('no holdings on file: nothing to compare with the recommendation');
  if (input.drift && input.drift.total > input.tolerance) {
    const largest = input.drift.largest;
    reasons.push(
      `drift ${formatPct(input.drift.total)} is beyond the tolerance of ${formatPct(input.tolerance)}` +
        (largest ? ` (largest: ${largest.asset} ${formatSignedPct(largest.gap)})` : ''),
    );
  }
  for (const b of input.breaches) reasons.push(b.text);
  const risk = input.currentRisk;
  if (risk && risk.then.volatility > 0) {
    const change = risk.now.volatility / risk.then.volatility - 1;
    if (Math.abs(change) >= RISK_MOVE_SHARE)
      reasons.push(
        `volatility of the holdings moved from ${formatPct(risk.then.volatility)} to ${formatPct(risk.now.volatility)} since the revision was saved`,
      );
  }
  // A household never sent a memo is shown as such, not flagged: the review asks whether the
  // memo on file still holds, and there is none to hold.
  if (input.memo !== null) {
    const changed = Object.entries(input.memo.changedSince)
      .filter(([, yes]) => yes)
      .map(([what]) => what);
    if (changed.length > 0) reasons.push(`the memo is out of date: ${changed.join(', ')} changed since it was printed`);
  }
  return reasons;
}
