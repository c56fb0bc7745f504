import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import { MOVED_THRESHOLD, SAME_FIGURE, num, pct } from '../explain.js';
import { homogenisedForm, ratioThresholds } from '../formulate.js';
import { screeningScore } from '../screening.js';
import type { ObjectiveComputation } from './computation.js';

/**
 * Maximum diversification (Choueifaty and Coignard 2008): the diversification ratio
 * w'sigma / sqrt(w'Sigma w) maximised as the homogenised QP (formulate.ts). At the optimum every
 * held asset not at a limit has correlation exactly 1/DR with the portfolio, every asset left out
 * at least 1/DR, an asset at its cap at most 1/DR (Choueifaty, Froidure and Reynier 2013); binding
 * caps, bands or turnover move each asset's threshold (formulate.ts ratioThresholds).
 */
export const maxDiversification: ObjectiveComputation<Extract<ObjectiveSpec, { method: 'max-diversification' }>> = {
  ruleBased: false,
  solve: (_spec, { mandate, covariance, vols }) => ({
    kind: 'qp',
    form: homogenisedForm(mandate, covariance, vols),
    screen: screeningScore(covariance, vols, true),
  }),
  noPositiveRatio: () => 'no portfolio within the limits has a positive diversification ratio',
  thresholds: ratioThresholds,
  // R = 1 / sqrt(2 phi) (formulate.ts), so dR/dphi = -(2 phi)^(-3/2).
  scale: (phi) => ({ maximise: true, chain: -Math.pow(2 * phi, -1.5) }),
  explainer: (_spec, fig, { dr, withoutDr: without }) => {
    const w = fig.weights;
    const t = 1 / dr;
    return (i, { reason, rho, capWord, band, tail, keptOut }) => {
      const own = fig.ownThresholds?.[i];
      if (own !== undefined && Number.isFinite(own) && Math.abs(own - t) > MOVED_THRESHOLD) {
        // Binding limits move this asset's threshold away from 1/DR (formulate.ts ratioThresholds):
        // say its own, which its correlation meets exactly as the optimality conditions require.
        const c = `correlation ${num(rho)} with the portfolio`;
        const text =
          reason === 'at-upper-bound'
            ? `held at its ${capWord} of ${pct(w[i])}: ${c}, at or below its threshold of ${num(own)} once the binding limits are counted (${without}); it would be held more without the ${capWord}`
            : reason === 'excluded'
              ? own < -1
                ? `left out: ${c}; once the binding limits are counted, an asset of its volatility (${pct(fig.vols[i])}) would need a correlation below ${num(own)}, which no asset can have (${without})`
                : `left out: ${c}, at or above its threshold of ${num(own)} once the binding limits are counted (${without})${band ? `; ${band}` : ''}; under these limits an asset this correlated and this volatile adds less diversification than it costs`
              : reason === 'at-lower-bound'
                ? `held at its floor of ${pct(w[i])}: ${c}, at or above its threshold of ${num(own)} once the binding limits are counted (${without}); it would be held less without the floor`
                : `held at ${pct(w[i])}: ${c}, equal to its threshold once the binding limits are counted (${without})${tail}`;
        return { text, measure: rho, threshold: own };
      }
      const c = `correlation ${num(rho)} with the portfolio, threshold 1/DR = ${num(t)}`;
      const text =
        reason === 'at-upper-bound'
          ? `held at its ${capWord} of ${pct(w[i])}: ${c}; below the threshold, it would be held more without the ${capWord}`
          : reason === 'excluded'
            ? rho >= t - SAME_FIGURE
              ? `left out: ${c}; an asset this correlated with the portfolio adds less diversification than it costs`
              : `left out: ${c}; below the threshold it would be held${keptOut}`
            : reason === 'at-lower-bound'
              ? `held at its floor of ${pct(w[i])}: ${c}; above the threshold, it would be held less without the floor`
              : `held at ${pct(w[i])}: ${c}${tail}`;
      return { text, measure: rho, threshold: t };
    };
  },
};
