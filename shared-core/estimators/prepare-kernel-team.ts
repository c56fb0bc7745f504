import { crossProductForks } from '../linalg/cross-product.js';
import { prepareKernelTeam } from '../linalg/kernel-team.js';
import { tridiagonalFormForks } from '../linalg/tridiagonal-form.js';

/**
 * Starts the kernel team's helper (linalg/kernel-team.ts) ahead of estimates on up to T periods
 * of N assets whose cross product or tridiagonal reduction will split over it: the helper then
 * loads (30-60 ms on a quiet machine) while the returns are built, where the first large kernel
 * used to wait for it. Nothing where no team is installed or the kernels stay on one thread.
 */
export function prepareKernelTeamForEstimates(n: number, t: number): void {
  if (crossProductForks(n, t) || tridiagonalFormForks(n)) prepareKernelTeam();
}
