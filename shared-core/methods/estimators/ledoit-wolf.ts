import { defineEstimator } from '../define.js';

export const shrinkageTargets = ['scaled-identity', 'constant-correlation', 'single-index'] as const;
export type ShrinkageTarget = (typeof shrinkageTargets)[number];

const TARGET_WORDS: Record<ShrinkageTarget, string> = {
  'scaled-identity': 'a scaled identity',
  'constant-correlation': 'constant correlation',
  'single-index': 'a single-index model',
};

const label = 'Ledoit-Wolf shrinkage';

export const ledoitWolf = defineEstimator({
  method: 'ledoit-wolf',
  label,
  idPart: 'lw',
  options: (z) => z.strictObject({ method: z.literal('ledoit-wolf'), target: z.enum(shrinkageTargets).optional() }),
  initial: { method: 'ledoit-wolf' },
  describe: (spec) => (spec.target !== undefined ? `${label}, ${spec.target} target` : label),
  memoWords: (spec) => `Ledoit-Wolf shrinkage towards ${TARGET_WORDS[spec.target ?? 'scaled-identity']}`,
  memoShort: (spec) =>
    spec.target && spec.target !== 'scaled-identity' ? `Ledoit-Wolf, ${spec.target}` : 'Ledoit-Wolf',
  source:
    'Ledoit and Wolf (2004), J. Multivariate Analysis 88 (scaled identity); Ledoit and Wolf (2004), ' +
    'J. Portfolio Management 30(4) (constant correlation); Ledoit and Wolf (2003), J. Empirical Finance 10 (single index)',
  formula:
    'Sigma = delta F + (1 - delta) S, S the 1/T covariance of de-meaned returns, F the target (scaled identity trace(S)/N I, constant correlation, or a single-index model), delta in [0, 1] estimated from the data to minimise the expected squared error.',
  whenToUse:
    "The usual default: a well-conditioned estimate when the window is short against the number of assets. Scaled identity pulls every variance and covariance towards a common level; constant correlation keeps each asset's own variance and pulls correlations towards their average; single index pulls them towards a one-factor market model.",
});
