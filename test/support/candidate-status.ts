import type { CandidateResult, FailedCandidate, OptimalCandidate } from '../../shared-core/optimise/result.js';

/** The candidate as an optimum; any other status fails the test with the candidate's message. */
export function optimal(r: CandidateResult): OptimalCandidate {
  if (r.status !== 'optimal') throw new Error(`${r.id}: expected an optimum, got ${r.status} (${r.message})`);
  return r;
}

/** A candidate expected not to solve, with its status and message; a solved one fails the test. */
export function failed(r: CandidateResult): FailedCandidate {
  if (r.status !== 'infeasible' && r.status !== 'error')
    throw new Error(`${r.id}: expected a failure, got ${r.status}`);
  return r;
}
