import { MOVED_THRESHOLD, SAME_FIGURE, num, pct, type AssetFigures } from '../explain.js';
import type { AssetAt, AssetWords } from './computation.js';

/**
 * The sentences of the objectives whose first-order condition is a beta of 1 to the portfolio
 * (minimum variance, and maximum decorrelation on the correlation matrix): `what` names the beta,
 * `betaOf` gives it.
 */
export function betaExplainer(
  fig: AssetFigures,
  what: string,
  betaOf: (i: number) => number,
): (i: number, at: AssetAt) => AssetWords {
  const w = fig.weights;
  return (i, { reason, capWord, band, tail, keptOut }) => {
    const beta = betaOf(i);
    const own = fig.ownThresholds?.[i];
    if (own !== undefined && Number.isFinite(own) && Math.abs(own - 1) > MOVED_THRESHOLD) {
      // Binding limits move this asset's threshold away from 1 (formulate.ts directThresholds).
      const b = `${what} ${num(beta)}`;
      const without = '1 without them';
      const text =
        reason === 'at-upper-bound'
          ? `held at its ${capWord} of ${pct(w[i])}: ${b}, at or below its threshold of ${num(own)} once the binding limits are counted (${without}); it would be held more without the ${capWord}`
          : reason === 'excluded'
            ? `left out: ${b}, at or above its threshold of ${num(own)} once the binding limits are counted (${without})${band ? `; ${band}` : ''}; under these limits adding it would not lower risk`
            : reason === 'at-lower-bound'
              ? `held at its floor of ${pct(w[i])}: ${b}, at or above its threshold of ${num(own)} once the binding limits are counted (${without}); it would be held less without the floor`
              : `held at ${pct(w[i])}: ${b}, equal to its threshold once the binding limits are counted (${without})${tail}`;
      return { text, measure: beta, threshold: own };
    }
    const text =
      reason === 'at-upper-bound'
        ? `held at its ${capWord} of ${pct(w[i])}: ${what} ${num(beta)}, below 1, so it would be held more without the ${capWord}`
        : reason === 'excluded'
          ? beta >= 1 - SAME_FIGURE
            ? `left out: ${what} ${num(beta)}, at least 1, so adding it would not lower risk`
            : `left out: ${what} ${num(beta)}, below 1, so it would lower risk${keptOut}`
          : reason === 'at-lower-bound'
            ? `held at its floor of ${pct(w[i])}: ${what} ${num(beta)}, above 1`
            : `held at ${pct(w[i])}: ${what} ${num(beta)}; at the minimum every freely held asset has beta 1${tail}`;
    return { text, measure: beta, threshold: 1 };
  };
}
