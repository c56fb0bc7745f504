import { InputError } from '../../errors.js';
import { identity } from '../../linalg/matrix.js';
import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import { budgetGaps, ercOverCone, ercUnconstrained, ercWeightSensitivity } from '../erc.js';
import { pct } from '../explain.js';
import { directForm, homogenisedForm } from '../formulate.js';
import { describeConflict } from '../infeasibility.js';
import { mandateViolation, RULE_FEASIBILITY } from '../mandate.js';
import { solveQp } from '../qp/index.js';
import type { ObjectiveComputation } from './computation.js';

/** Two largest gaps closer than this (a share of risk) are treated as tied. */
const GAP_TIE = 1e-9;

/**
 * Equal risk contribution, or risk budgeting with the candidate's budgets (Maillard, Roncalli and
 * Teiletche 2010; erc.ts): each asset's share of risk equal to its budget. Unconstrained when that
 * portfolio meets the mandate; otherwise the sequential QP over the mandate cone (erc.ts), from a
 * feasible portfolio that holds every asset.
 */
export const equalRiskContribution: ObjectiveComputation<
  Extract<ObjectiveSpec, { method: 'equal-risk-contribution' }>
> = {
  ruleBased: false,
  checkInputs: ({ budgets }, { assets, path }) => {
    const known = new Set(assets);
    for (const key of Object.keys(budgets ?? {}))
      if (!known.has(key)) throw new InputError(`unknown asset '${key}'`, { path: `${path}.budgets.${key}` });
  },
  solve: (spec, { problem: p, mandate: m, covariance: S }) => {
    const n = p.assets.length;
    const given = spec.budgets;
    let budgets = Float64Array.from(p.assets, (a) => (given ? (given[a] ?? 0) : 1));
    const missing = p.assets.filter((_, i) => !(budgets[i] > 0));
    let iterations = 0;
    const failed = (status: 'error' | 'infeasible', message: string) =>
      ({ kind: 'failed', status, message, iterations }) as const;
    if (missing.length > 0)
      return failed('error', `equal-risk-contribution needs a positive risk budget for ${missing.join(', ')}`);
    const total = budgets.reduce((a, b) => a + b, 0);
    budgets = budgets.map((b) => b / total);
    const figures = { budgets };
    const free = ercUnconstrained(S, budgets);
    iterations += free.iterations;
    if (!free.ok) return failed('error', `equal risk contribution: ${free.reason}`);
    if (mandateViolation(m, free.weights) <= RULE_FEASIBILITY)
      return { kind: 'weights', weights: free.weights, iterations, residual: 0, figures };
    // Limits cut the risk-parity portfolio: the sequential QP over the mandate cone (erc.ts).
    const cone = homogenisedForm(m, S);
    const lifted = {
      ...m,
      lb: Float64Array.from(m.lb, (v, i) => (i < n ? Math.max(v, Math.min(1e-3, m.ub[i] / 2)) : v)),
    };
    const start = solveQp(
      directForm(
        lifted,
        identity(n),
        free.weights.map((v) => -v),
      ).qp,
    );
    iterations += start.iterations;
    if (start.status === 'infeasible') {
      const plain = solveQp(directForm(m, identity(n)).qp);
      if (plain.status === 'infeasible')
        return failed('infeasible', describeConflict(m, directForm(m, identity(n)), plain.conflict));
      return {
        kind: 'failed',
        status: 'error',
        message:
          'equal risk contribution needs a feasible portfolio that holds every asset; the limits force some weights to zero',
        iterations: 0,
      };
    }
    if (start.status !== 'optimal')
      return failed('error', `equal risk contribution: no starting point (${start.status})`);
    const v0 = new Float64Array(cone.qp.q.length);
    v0.set(start.solution.x);
    v0[cone.kappa] = 1;
    const erc = ercOverCone(S, budgets, cone, v0, { warmStart: p.warmStart, shouldCancel: p.shouldCancel });
    iterations += erc.iterations;
    if (!erc.ok) return failed('error', `equal risk contribution: ${erc.reason}`);
    return {
      kind: 'weights',
      weights: erc.weights,
      iterations,
      residual: erc.residual,
      form: cone,
      ...(erc.lastQp ? { qp: erc.lastQp } : {}),
      ...(erc.warmStart ? { warmStart: erc.warmStart } : {}),
      flags: ['limits bind, so risk contributions depart from the budgets where a limit forces it'],
      figures,
    };
  },
  // The risk-budgeting objective F of erc.ts means nothing to a client; its limits are priced
  // by what they do to the largest gap between an asset's share of risk and its budget,
  // through the derivative of the weights in the limit (erc.ts, ercWeightSensitivity).
  scale: (_phi, { S, m, w, form, q, budgets }) => {
    const move =
      form && q && q.status === 'optimal' && budgets ? ercWeightSensitivity(S, budgets, form, m, q.solution) : null;
    return {
      maximise: false,
      chain: NaN,
      points: true,
      verbs: ['widen', 'narrow'],
      shadow: (s, loosenUp) => {
        const dw = move?.(s.item);
        if (!dw || !budgets) return undefined;
        const { gap, dGap } = budgetGaps(S, budgets, w, dw);
        let largest = 0;
        for (const g of gap) largest = Math.max(largest, Math.abs(g));
        // The largest of several functions moves, in the loosening direction, as the fastest
        // rising of those tied at the top.
        const dir = loosenUp ? 1 : -1;
        let slope = -Infinity;
        for (let i = 0; i < gap.length; i++)
          if (Math.abs(gap[i]) >= largest - GAP_TIE) slope = Math.max(slope, Math.sign(gap[i]) * dGap[i] * dir);
        return Number.isFinite(slope) ? slope * dir : undefined;
      },
    };
  },
  explainer: (_spec, fig, { n }) => {
    const w = fig.weights;
    return (i, { reason, capWord, tail }) => {
      const b = fig.budgets ? fig.budgets[i] : 1 / n;
      const text = `held at ${pct(w[i])}: risk contribution ${pct(fig.riskShares[i])} against a budget of ${pct(b)}${
        reason === 'held'
          ? ''
          : reason === 'group-limit'
            ? tail
            : ` (at its ${reason === 'at-upper-bound' ? capWord : 'floor'})`
      }`;
      return { text, measure: fig.riskShares[i], threshold: b };
    };
  },
};
