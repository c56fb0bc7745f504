/**
 * The factors behind the invented demonstration prices and how they behave in each regime.
 * Figures are annualised and chosen by hand to look like a multi-asset book (broad equity near
 * 15% volatility over a cycle, core government bonds near 5%, gold near 16%); they are invented,
 * not estimated from any market.
 */
export const factorNames = [
  'world',
  'europe',
  'us',
  'emerging',
  'japan',
  'smallcap',
  'rates',
  'credit',
  'inflation',
  'gold',
  'property',
  'trend',
  'fx',
] as const;
export type FactorName = (typeof factorNames)[number];

export type Regime = 'calm' | 'stressed';

export interface FactorBehaviour {
  /** Annualised volatility of the factor's own shock, calm then stressed. */
  vol: readonly [number, number];
  /** Annual drift of the log factor, calm then stressed. */
  drift: readonly [number, number];
  /**
   * Contagion: this factor also moves by `coupling[j] x (move of factor j)` for factors listed
   * earlier, calm then stressed. Listing only earlier factors keeps the system triangular, so
   * every regime has a valid covariance by construction.
   */
  coupling?: Partial<Record<FactorName, readonly [number, number]>>;
}

/**
 * `rates`, `credit` and `inflation` are price moves of a one-year-duration position (an asset
 * with duration D loads D on them); `fx` is the log change of one US dollar priced in euro.
 */
export const factorBehaviour: Readonly<Record<FactorName, FactorBehaviour>> = {
  world: { vol: [0.11, 0.28], drift: [0.13, -0.3] },
  europe: { vol: [0.06, 0.09], drift: [-0.01, -0.03] },
  us: { vol: [0.05, 0.07], drift: [0.02, 0] },
  emerging: { vol: [0.09, 0.14], drift: [-0.01, -0.1], coupling: { world: [0.1, 0.25] } },
  japan: { vol: [0.08, 0.1], drift: [0, 0] },
  smallcap: { vol: [0.06, 0.1], drift: [0, -0.08], coupling: { world: [0.05, 0.2] } },
  rates: { vol: [0.008, 0.011], drift: [0, 0.004], coupling: { world: [0, -0.025] } },
  credit: { vol: [0.004, 0.012], drift: [0.001, -0.02], coupling: { world: [0.008, 0.035] } },
  inflation: { vol: [0.004, 0.007], drift: [0, -0.003], coupling: { rates: [-0.2, -0.4] } },
  gold: { vol: [0.14, 0.2], drift: [0.05, 0.08], coupling: { world: [0, -0.1] } },
  property: { vol: [0.09, 0.15], drift: [0, -0.1], coupling: { world: [0.1, 0.3] } },
  trend: { vol: [0.08, 0.1], drift: [0.01, 0.12], coupling: { world: [0, -0.15] } },
  fx: { vol: [0.075, 0.1], drift: [-0.005, 0], coupling: { world: [0, -0.12] } },
};

/** Daily regime switching (a two-state Markov chain): calm spells last about a year, stressed ones about ten weeks. */
export const regimeSwitching = { calmToStressed: 0.004, stressedToCalm: 0.02 } as const;
