import { correlationMatrix } from '../../analytics/risk.js';
import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import { directForm, directThresholds } from '../formulate.js';
import type { ObjectiveComputation } from './computation.js';
import { betaExplainer } from './beta-words.js';

/**
 * Maximum decorrelation (Christoffersen, Errunza, Jacobs and Langlois 2012): minimum variance on
 * the correlation matrix C, w'Cw / 2 minimised as the direct QP. The first-order conditions are
 * minimum variance's, with betas taken on C.
 */
export const maxDecorrelation: ObjectiveComputation<Extract<ObjectiveSpec, { method: 'max-decorrelation' }>> = {
  ruleBased: false,
  solve: (_spec, { mandate, covariance }) => {
    const correlation = correlationMatrix(covariance);
    return { kind: 'qp', form: directForm(mandate, correlation), figures: { correlation } };
  },
  thresholds: directThresholds,
  // phi = w'Cw / 2 with C the correlation matrix; sqrt(w'Cw) is the volatility the portfolio
  // would have if every asset had the same volatility, as a share of it: d sqrt(2 phi)/dphi = 1 / sqrt(2 phi).
  scale: (phi) => ({ maximise: false, chain: 1 / Math.sqrt(2 * phi), points: true }),
  explainer: (_spec, fig, { n, variance }) => {
    const corrW = fig.corrW;
    if (!corrW) return betaExplainer(fig, 'beta to the portfolio', (i) => fig.sigmaW[i] / variance);
    let wcw = 0;
    for (let k = 0; k < n; k++) wcw += fig.weights[k] * corrW[k];
    return betaExplainer(fig, 'beta to the portfolio on the correlation matrix', (i) => corrW[i] / wcw);
  },
};
