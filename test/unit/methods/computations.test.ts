import { describe, expect, it } from 'vitest';
import { estimators } from '../../../shared-core/estimators/registry.js';
import { estimatorMethods } from '../../../shared-core/methods/estimator-registry.js';
import { objectiveMethods } from '../../../shared-core/methods/objective-registry.js';
import { objectiveComputations } from '../../../shared-core/optimise/objectives/index.js';

// A method is its definition (shared-core/methods/) and its computation (one file, listed in the
// typed table of the layer above). The tables' types ask for every defined method: the
// expect-error directives below are checked by `npm run typecheck`, which fails if a table
// missing a method were ever accepted.
describe('every defined method has its computation, one table each', () => {
  it('objectives: one computation per defined objective, and no other', () => {
    expect(Object.keys(objectiveComputations).sort()).toEqual([...objectiveMethods].sort());
    for (const method of objectiveMethods) {
      const c = objectiveComputations[method];
      expect(typeof c.solve, method).toBe('function');
      expect(typeof c.scale, method).toBe('function');
      expect(typeof c.explainer, method).toBe('function');
    }
  });

  it('estimators: one computation per defined estimator, and no other', () => {
    expect(Object.keys(estimators).sort()).toEqual([...estimatorMethods].sort());
  });

  it('a table that leaves a method out does not typecheck', () => {
    const { 'equal-weight': _objective, ...fewerObjectives } = objectiveComputations;
    // @ts-expect-error equal-weight's computation is missing
    const objectives: typeof objectiveComputations = fewerObjectives;
    const { nonlinear: _estimator, ...fewerEstimators } = estimators;
    // @ts-expect-error the nonlinear estimator is missing
    const covariances: typeof estimators = fewerEstimators;
    expect(Object.keys(objectives)).not.toContain('equal-weight');
    expect(Object.keys(covariances)).not.toContain('nonlinear');
  });
});
