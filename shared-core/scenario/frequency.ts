/** The return frequencies a scenario can ask for (`returns.frequency`). */
export const frequencies = ['daily', 'weekly', 'monthly'] as const;
export type Frequency = (typeof frequencies)[number];

/** Periods per year by frequency (common practice: 252 trading days, 52 weeks, 12 months). */
export const PERIODS_PER_YEAR: Record<Frequency, number> = { daily: 252, weekly: 52, monthly: 12 };
