import { identity } from '../../linalg/matrix.js';
import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import { AT_LIMIT, pct, type AssetFigures } from '../explain.js';
import { directForm } from '../formulate.js';
import { mandateViolation, RULE_FEASIBILITY } from '../mandate.js';
import type { ObjectiveComputation } from './computation.js';

/**
 * Weights from a rule (equal weight, inverse volatility): the rule's weights when they meet the
 * mandate, else the nearest weights that do, |w - r|^2 / 2 minimised as the direct QP.
 * `raw` gives the rule's unnormalised weights from the volatilities; `rule` names them in a
 * sentence; `aside` adds an asset's own figure to its sentence.
 */
export function ruleObjective<S extends ObjectiveSpec>(
  raw: (vols: Float64Array) => Float64Array,
  rule: string,
  aside?: (fig: AssetFigures, i: number) => string,
): ObjectiveComputation<S> {
  return {
    ruleBased: true,
    solve: (spec, { mandate: m, vols }) => {
      const n = vols.length;
      const unscaled = raw(vols);
      const total = unscaled.reduce((a, b) => a + b, 0);
      const ruleWeights = unscaled.map((v) => v / total);
      if (mandateViolation(m, ruleWeights) <= RULE_FEASIBILITY)
        return { kind: 'weights', weights: ruleWeights, iterations: 0, residual: 0, figures: { ruleWeights } };
      return {
        kind: 'qp',
        form: directForm(
          m,
          identity(n),
          ruleWeights.map((v) => -v),
        ),
        flags: [`the limits cut the ${spec.method} rule: the weights are the nearest ones that meet every limit`],
        figures: { ruleWeights },
      };
    },
    // phi = |w - r|^2 / 2 - |r|^2 / 2; the distance |w - r| has d|w - r|/dphi = 1 / |w - r|.
    scale: (_phi, { w, ruleWeights: r }) => {
      let d2 = 0;
      if (r) for (let i = 0; i < r.length; i++) d2 += (w[i] - r[i]) ** 2;
      return { maximise: false, chain: 1 / Math.sqrt(d2), points: true };
    },
    explainer: (_spec, fig) => {
      const w = fig.weights;
      return (i) => {
        const r = fig.ruleWeights ? fig.ruleWeights[i] : w[i];
        const moved = Math.abs(r - w[i]) > AT_LIMIT;
        const text = moved
          ? `held at ${pct(w[i])} instead of its ${rule} of ${pct(r)}: the nearest weights that meet the limits`
          : `held at its ${rule} of ${pct(w[i])}${aside ? aside(fig, i) : ''}`;
        return { text };
      };
    },
  };
}
