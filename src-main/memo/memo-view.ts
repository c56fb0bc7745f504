import { InputError } from '../../shared-core/errors.js';
import { isSolved, type CandidateResult, type OptimalCandidate } from '../../shared-core/optimise/result.js';
import { tradeList, type TradePlan } from '../../shared-core/trades/trade-list.js';
import type { MemoInput } from './memo-input.js';

/**
 * What the memo's pages read from the input, worked out once: printed asset names, the display
 * order (by target weight), current weights from the holdings, the trade plan. Checks the input
 * and throws an InputError naming the JSON path of the first inconsistency.
 */
export interface MemoView {
  input: MemoInput;
  /** Every asset of the estimate, in the estimate's order. */
  assets: readonly string[];
  /** Assets held now or proposed, by target weight (then current weight, then id). */
  shown: readonly string[];
  /** Assets neither held nor proposed. */
  unused: readonly string[];
  recommended: OptimalCandidate;
  recommendedIndex: number;
  /** Current weights (fractions), or null without holdings or scenario weights. */
  current: Record<string, number> | null;
  trades: TradePlan | null;
  name(asset: string): string;
  candidateLabel(c: CandidateResult): string;
}

export function buildView(input: MemoInput): MemoView {
  const assets = [...input.run.estimate.assets];
  const known = new Set(assets);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(input.createdOn) || Number.isNaN(Date.parse(`${input.createdOn}T00:00:00Z`)))
    throw new InputError(`expected a date YYYY-MM-DD, got '${input.createdOn}'`, { path: 'createdOn' });
  if (!(input.lot > 0) || !Number.isFinite(input.lot))
    throw new InputError(`the lot must be a positive amount, got ${input.lot}`, { path: 'lot' });
  if (input.household.name.trim() === '')
    throw new InputError('the household needs a name', { path: 'household.name' });
  const recommendedIndex = input.run.candidates.findIndex((c) => c.id === input.recommended);
  if (recommendedIndex === -1)
    throw new InputError(`no candidate with id '${input.recommended}' in the run`, { path: 'recommended' });
  const recommended = input.run.candidates[recommendedIndex];
  if (recommended.status !== 'optimal')
    throw new InputError(
      `the recommended candidate '${recommended.id}' is ${recommended.status} (${recommended.message}); recommend a solved one`,
      { path: 'recommended' },
    );
  for (const [ci, c] of input.run.candidates.entries())
    for (const asset of Object.keys(isSolved(c) ? c.weights : {}))
      if (!known.has(asset))
        throw new InputError(`asset '${asset}' is not in the estimate's assets`, {
          path: `run.candidates[${ci}].weights.${asset}`,
        });

  let current: Record<string, number> | null = null;
  let trades: TradePlan | null = null;
  const holdings = input.household.holdings;
  if (holdings) {
    const amounts: Record<string, number> = {};
    holdings.positions.forEach((p, i) => {
      const path = `household.holdings.positions[${i}]`;
      if (!known.has(p.asset))
        throw new InputError(`asset '${p.asset}' is held but not in the scenario's assets`, { path: `${path}.asset` });
      if (!Number.isFinite(p.amount) || p.amount < 0)
        throw new InputError(`a holding amount must be zero or more, got ${p.amount}`, { path: `${path}.amount` });
      amounts[p.asset] = (amounts[p.asset] ?? 0) + p.amount;
    });
    const total = Object.values(amounts).reduce((s, v) => s + v, 0);
    if (!(total > 0))
      throw new InputError('the holdings add up to zero; give amounts or leave them out', {
        path: 'household.holdings.positions',
      });
    current = Object.fromEntries(assets.map((a) => [a, (amounts[a] ?? 0) / total]));
    trades = tradeList({ assets, held: amounts, weights: recommended.weights, lot: input.lot });
  } else if (input.scenario.document.current) {
    current = Object.fromEntries(assets.map((a) => [a, input.scenario.document.current?.[a] ?? 0]));
  }

  const w = (a: string) => recommended.weights[a] ?? 0;
  const c = (a: string) => current?.[a] ?? 0;
  const byTarget = [...assets].sort((a, b) => w(b) - w(a) || c(b) - c(a) || (a < b ? -1 : a > b ? 1 : 0));
  // An asset whose weights print as 0.0 now and proposed, and that trades nothing, is left out
  // of the allocation table (its printed trade column must still add up, hence the trade test).
  const traded = new Set(trades?.rows.filter((r) => r.trade !== 0 || r.current !== 0).map((r) => r.asset) ?? []);
  const visible = (a: string) => Math.abs(w(a)) >= 0.0005 || Math.abs(c(a)) >= 0.0005 || traded.has(a);
  const info = input.scenario.document.assetInfo ?? {};
  return {
    input,
    assets,
    shown: byTarget.filter(visible),
    unused: byTarget.filter((a) => !visible(a)),
    recommended,
    recommendedIndex,
    current,
    trades,
    name: (asset) => info[asset]?.name ?? asset,
    candidateLabel: (cand) =>
      cand.label ?? input.scenario.document.candidates.find((s) => s.id === cand.id)?.label ?? cand.id,
  };
}
