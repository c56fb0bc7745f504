import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import { directForm, directThresholds } from '../formulate.js';
import { screeningScore } from '../screening.js';
import type { ObjectiveComputation } from './computation.js';
import { betaExplainer } from './beta-words.js';

/**
 * Minimum variance: w'Sigma w / 2 minimised as the direct QP (formulate.ts). First-order
 * conditions (common practice): every held asset has beta 1 to the portfolio, an excluded asset
 * at least 1, a capped one at most 1; binding limits move each asset's threshold
 * (formulate.ts directThresholds).
 */
export const minVariance: ObjectiveComputation<Extract<ObjectiveSpec, { method: 'min-variance' }>> = {
  ruleBased: false,
  solve: (_spec, { mandate, covariance, vols }) => ({
    kind: 'qp',
    form: directForm(mandate, covariance),
    screen: screeningScore(covariance, vols, false),
  }),
  thresholds: directThresholds,
  // sigma_p = sqrt(2 phi): dsigma/dphi = 1 / sigma.
  scale: (phi) => ({ maximise: false, chain: 1 / Math.sqrt(2 * phi), points: true }),
  explainer: (_spec, fig, { variance }) => betaExplainer(fig, 'beta to the portfolio', (i) => fig.sigmaW[i] / variance),
};
