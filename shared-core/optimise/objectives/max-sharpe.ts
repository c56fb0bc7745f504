import { InputError } from '../../errors.js';
import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import { SAME_FIGURE, pct, pctText } from '../explain.js';
import { homogenisedForm } from '../formulate.js';
import type { ObjectiveComputation } from './computation.js';

/**
 * Maximum Sharpe ratio (Sharpe 1966): (w'mu - rf) / sqrt(w'Sigma w) maximised as the homogenised
 * QP with the excess returns mu - rf as numerator, since the budget keeps sum w = 1. Held assets
 * earn rf + beta_i (mu_P - rf), beta_i = (Sigma w)_i / w'Sigma w (first-order conditions of the
 * tangency portfolio).
 */
export const maxSharpe: ObjectiveComputation<Extract<ObjectiveSpec, { method: 'max-sharpe' }>> = {
  ruleBased: false,
  checkInputs: (_spec, { assets, expectedReturns, path }) => {
    const missing = assets.filter((a) => expectedReturns?.[a] === undefined);
    if (missing.length > 0)
      throw new InputError(`max-sharpe needs expectedReturns for ${missing.join(', ')}`, {
        path: expectedReturns ? 'expectedReturns' : path,
      });
  },
  solve: (spec, { problem: p, mandate, covariance }) => {
    const missing = p.assets.filter((a) => p.expectedReturns?.[a] === undefined);
    if (missing.length > 0)
      return {
        kind: 'failed',
        status: 'error',
        message: `max-sharpe needs expectedReturns for ${missing.join(', ')}`,
        iterations: 0,
      };
    const expected = Float64Array.from(p.assets, (a) => p.expectedReturns![a]);
    const rf = spec.riskFreeRate ?? 0;
    return {
      kind: 'qp',
      form: homogenisedForm(mandate, covariance, rf === 0 ? expected : expected.map((v) => v - rf)),
      figures: { expected },
    };
  },
  noPositiveRatio: ({ riskFreeRate }) =>
    `no portfolio within the limits has ${riskFreeRate ? `an expected return above the risk-free rate of ${pctText(riskFreeRate)}` : 'a positive expected return'}, so the Sharpe ratio cannot be maximised`,
  // The Sharpe ratio is the homogenised form's ratio: dR/dphi = -(2 phi)^(-3/2), as for the DR.
  scale: (phi) => ({ maximise: true, chain: -Math.pow(2 * phi, -1.5) }),
  explainer: (spec, fig, { n, variance }) => {
    const w = fig.weights;
    let muP = 0;
    for (let k = 0; k < n; k++) muP += w[k] * (fig.expected ? fig.expected[k] : 0);
    const rf = spec.riskFreeRate;
    return (i, { reason, capWord, tail, keptOut }) => {
      const mu = fig.expected ? fig.expected[i] : 0;
      const beta = fig.sigmaW[i] / variance;
      const need = rf === undefined ? beta * muP : rf + beta * (muP - rf);
      const c = `expected return ${pct(mu, 2)} against ${pct(need, 2)} asked by its beta to the portfolio`;
      const text =
        reason === 'at-upper-bound'
          ? `held at its ${capWord} of ${pct(w[i])}: ${c}; it would be held more without the ${capWord}`
          : reason === 'excluded'
            ? mu <= need + SAME_FIGURE
              ? `left out: ${c}; it does not pay for the risk it adds`
              : `left out: ${c}; it would pay for its risk${keptOut}`
            : `held at ${pct(w[i])}: ${c}${tail}`;
      return { text, measure: mu, threshold: need };
    };
  },
};
