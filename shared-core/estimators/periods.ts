import { PERIODS_PER_YEAR } from '../scenario/frequency.js';
import type { EstimateContext } from './types.js';

export function periodsPerYear(context: EstimateContext): number {
  return context.periodsPerYear ?? PERIODS_PER_YEAR[context.frequency];
}
