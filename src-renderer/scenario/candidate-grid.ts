import type { Candidate, ScenarioInput } from '../../shared-core/scenario/schema.js';
import { estimatorDefinition, type EstimatorSpec } from '../../shared-core/methods/estimator-registry.js';
import { objectiveDefinition, type ObjectiveSpec } from '../../shared-core/methods/objective-registry.js';
import { describeEstimator, describeObjective } from '../../shared-core/present/method-words.js';

/**
 * The candidates of a scenario as a grid: risk estimates down, objectives across, one candidate
 * per ticked cell. The document keeps only the candidates (the public format); the grid keeps
 * the rows and columns the advisor added even while none of their cells is ticked.
 */
export interface CandidateGrid {
  estimators: EstimatorSpec[];
  objectives: ObjectiveSpec[];
}

type CandidateInput = ScenarioInput['candidates'][number];

/** Canonical key of a spec: method first, then options sorted by name. */
export function specKey(spec: { method: string }): string {
  const entries = Object.entries(spec)
    .filter(([k, v]) => k !== 'method' && v !== undefined)
    .sort(([a], [b]) => a.localeCompare(b));
  return [spec.method, ...entries.map(([k, v]) => `${k}=${JSON.stringify(v)}`)].join(';');
}

// The methods' names, short codes and descriptions come from their definitions (shared-core/methods/).
export { describeEstimator, describeObjective } from '../../shared-core/present/method-words.js';

export function gridFromCandidates(candidates: readonly CandidateInput[]): CandidateGrid {
  const estimators = new Map<string, EstimatorSpec>();
  const objectives = new Map<string, ObjectiveSpec>();
  for (const c of candidates) {
    if (c.estimator && typeof c.estimator.method === 'string' && !estimators.has(specKey(c.estimator)))
      estimators.set(specKey(c.estimator), c.estimator as EstimatorSpec);
    if (c.objective && typeof c.objective.method === 'string' && !objectives.has(specKey(c.objective)))
      objectives.set(specKey(c.objective), c.objective as ObjectiveSpec);
  }
  return { estimators: [...estimators.values()], objectives: [...objectives.values()] };
}

export function findCandidate(
  candidates: readonly CandidateInput[],
  estimator: EstimatorSpec,
  objective: ObjectiveSpec,
): CandidateInput | undefined {
  const e = specKey(estimator);
  const o = specKey(objective);
  return candidates.find((c) => specKey(c.estimator) === e && specKey(c.objective) === o);
}

/**
 * The one rule for candidate ids: risk estimate, then objective ("lw-maxdiv", as the demo
 * scenario and a new scenario's first candidate), made unique against `taken` with a suffix.
 */
export function candidateId(
  estimator: EstimatorSpec,
  objective: ObjectiveSpec,
  taken: ReadonlySet<string> = new Set(),
): string {
  const base = `${estimatorDefinition(estimator.method).idPart}-${objectiveDefinition(objective.method).idPart}`;
  if (!taken.has(base)) return base;
  for (let i = 2; ; i++) if (!taken.has(`${base}-${i}`)) return `${base}-${i}`;
}

export function candidateLabel(estimator: EstimatorSpec, objective: ObjectiveSpec): string {
  return `${describeObjective(objective)} \u00b7 ${describeEstimator(estimator)}`;
}

/**
 * Rebuilds the candidate list for a grid and a set of ticked cells, keeping each surviving
 * candidate's id, label and overrides, in grid order (estimator rows, then objective columns).
 */
export function candidatesForGrid(
  grid: CandidateGrid,
  ticked: (estimator: EstimatorSpec, objective: ObjectiveSpec) => boolean,
  previous: readonly CandidateInput[],
  /** Map from an old spec key to its replacement's, when an estimator or objective was edited. */
  renamed: ReadonlyMap<string, string> = new Map(),
): CandidateInput[] {
  const out: CandidateInput[] = [];
  const taken = new Set<string>();
  const keep = new Map<string, CandidateInput>();
  for (const c of previous) {
    const e = renamed.get(specKey(c.estimator)) ?? specKey(c.estimator);
    const o = renamed.get(specKey(c.objective)) ?? specKey(c.objective);
    keep.set(`${e}|${o}`, c);
  }
  for (const estimator of grid.estimators)
    for (const objective of grid.objectives) {
      if (!ticked(estimator, objective)) continue;
      const old = keep.get(`${specKey(estimator)}|${specKey(objective)}`);
      if (
        old &&
        !taken.has(old.id) &&
        specKey(old.estimator) === specKey(estimator) &&
        specKey(old.objective) === specKey(objective)
      ) {
        out.push(old);
        taken.add(old.id);
        continue;
      }
      const id = candidateId(estimator, objective, taken);
      taken.add(id);
      const next: CandidateInput = { id, label: candidateLabel(estimator, objective), estimator, objective };
      if (old?.constraints) next.constraints = old.constraints;
      out.push(next);
    }
  return out;
}

/** True when the cell (estimator, objective) has a candidate in the list. */
export function isTicked(
  candidates: readonly CandidateInput[],
  estimator: EstimatorSpec,
  objective: ObjectiveSpec,
): boolean {
  return findCandidate(candidates, estimator, objective) !== undefined;
}

export type { Candidate };
