import type { Constraints } from '../scenario/schema.js';
import { isSolved } from './result.js';
import type { CandidateProblem, CandidateSolve } from './solve-candidate.js';

/**
 * Minimum position size: every weight either 0 or at least `size`. The exact problem is a mixed
 * integer programme; Holdfast uses a documented heuristic instead (common practice, no proof of
 * optimality): solve; take the smallest weight strictly between 0 and `size`; leave that asset
 * out (its bounds set to [0, 0]) and solve again; where leaving it out is infeasible (a band that
 * needs it, caps that no longer reach 100%), hold it at `size` instead. Repeat until every
 * weight is 0 or at least `size`: at most one step per asset. Long-only mandates only.
 */
export const MINIMUM_POSITION_HEURISTIC =
  'minimum position size by elimination: the smallest weight below the minimum is left out (or raised to the minimum where leaving it out is infeasible) and the candidate solved again';

/** Weights this close to 0 or to the minimum count as on them. */
const ON = 1e-9;

export function solveWithMinimumPosition(
  p: CandidateProblem,
  size: number,
  solve: (problem: CandidateProblem) => CandidateSolve,
): CandidateSolve {
  if (p.constraints.longOnly === false)
    return failed(p, 'error', 'a minimum position size applies to long-only mandates; set longOnly or remove it');
  const base = p.constraints.weightBounds ?? {};
  const defaultBound = base.default ?? [0, 1];
  const boundOf = (a: string): [number, number] => (base[a] ?? defaultBound) as [number, number];
  const out: string[] = [];
  const floored: string[] = [];
  const withBounds = (leftOut: readonly string[], floors: readonly string[], warm?: CandidateSolve): CandidateSolve => {
    const weightBounds: NonNullable<Constraints['weightBounds']> = { ...base };
    for (const a of leftOut) weightBounds[a] = [0, 0];
    for (const a of floors) weightBounds[a] = [Math.max(boundOf(a)[0], size), boundOf(a)[1]];
    return solve({
      ...p,
      constraints: { ...p.constraints, weightBounds },
      ...(warm?.warmStart ? { warmStart: warm.warmStart } : {}),
    });
  };
  let last = withBounds(out, floored);
  if (last.result.status !== 'optimal') return last;
  for (let step = 0; step < p.assets.length; step++) {
    const solved = last.result;
    if (solved.status !== 'optimal') return last; // every `last` is optimal: it is only replaced by one
    const w = solved.weights;
    let smallest: string | undefined;
    for (const a of p.assets)
      if (!floored.includes(a) && w[a] > ON && w[a] < size - ON && (smallest === undefined || w[a] < w[smallest]))
        smallest = a;
    if (smallest === undefined) return annotate(last, size, out, floored);
    const without = withBounds([...out, smallest], floored, last);
    if (without.result.status === 'optimal') {
      out.push(smallest);
      last = without;
      continue;
    }
    if (boundOf(smallest)[1] >= size) {
      const held = withBounds(out, [...floored, smallest], last);
      if (held.result.status === 'optimal') {
        floored.push(smallest);
        last = held;
        continue;
      }
    }
    return failed(
      p,
      'infeasible',
      `no allocation meets the minimum position size of ${pct(size)}: ${smallest} can neither be left out nor held at ${pct(size)} under the other limits`,
    );
  }
  return annotate(last, size, out, floored);
}

function pct(v: number): string {
  return `${Number((v * 100).toFixed(2))}%`;
}

function failed(p: CandidateProblem, status: 'error' | 'infeasible', message: string): CandidateSolve {
  return {
    result: {
      id: p.id,
      ...(p.label !== undefined ? { label: p.label } : {}),
      status,
      message,
      solver: { iterations: 0, kktResidual: NaN, ms: 0 },
    },
  };
}

/** The bounds the heuristic set are not the mandate's: explain those assets by the heuristic instead. */
function annotate(s: CandidateSolve, size: number, out: readonly string[], floored: readonly string[]): CandidateSolve {
  const solved = s.result;
  if (!isSolved(solved) || !solved.explanations || (out.length === 0 && floored.length === 0)) return s;
  const ex = solved.explanations;
  const assets = ex.assets.map((e) =>
    out.includes(e.asset)
      ? {
          ...e,
          reason: 'excluded',
          text: `left out by the minimum position size of ${pct(size)}: its weight without the minimum was below it`,
        }
      : floored.includes(e.asset)
        ? {
            ...e,
            reason: 'at-lower-bound',
            text: `held at the minimum position size of ${pct(size)}: leaving it out would break another limit`,
          }
        : e,
  );
  const artificial = (c: string) =>
    out.some((a) => c.startsWith(`cap on ${a} `)) || floored.some((a) => c.startsWith(`floor on ${a} `));
  const parts = [
    out.length ? `left out ${out.join(', ')}` : '',
    floored.length ? `raised to the minimum ${floored.join(', ')}` : '',
  ].filter(Boolean);
  return {
    ...s,
    result: {
      ...solved,
      explanations: {
        assets,
        binding: ex.binding.filter((b) => !artificial(b.constraint)),
        flags: [
          ...ex.flags,
          `minimum position size ${pct(size)} (a heuristic, not a proven optimum): ${parts.join('; ')}`,
        ],
      },
    },
  };
}
