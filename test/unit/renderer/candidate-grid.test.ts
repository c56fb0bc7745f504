import { describe, expect, it } from 'vitest';
import { demoAssets } from '../../../shared-core/demo/assets.js';
import { demoScenario } from '../../../shared-core/demo/scenario.js';
import type { EstimatorSpec } from '../../../shared-core/scenario/estimator-spec.js';
import type { ObjectiveSpec } from '../../../shared-core/scenario/objective-spec.js';
import {
  candidateId,
  candidatesForGrid,
  gridFromCandidates,
  isTicked,
  specKey,
  type CandidateGrid,
} from '../../../src-renderer/scenario/candidate-grid.js';

const lw = { method: 'ledoit-wolf' } as const;
const sample = { method: 'sample' } as const;
const ewma = { method: 'ewma', lambda: 0.97 } as const;
const md = { method: 'max-diversification' } as const;
const mv = { method: 'min-variance' } as const;

describe('candidates as estimators x objectives', () => {
  it('keys a spec by method and sorted options, so option order does not matter', () => {
    const ewma09 = { method: 'ewma', lambda: 0.9 };
    expect(specKey(ewma09)).toBe('ewma;lambda=0.9');
    expect(specKey({ method: 'ewma', halfLife: 60, lambda: undefined } as never)).toBe('ewma;halfLife=60');
  });

  it('makes one candidate per ticked cell with ids by one rule, estimate then objective, as the demo scenario', () => {
    const grid: CandidateGrid = { estimators: [sample, lw, ewma], objectives: [md, mv] };
    const out = candidatesForGrid(grid, () => true, []);
    expect(out.map((c) => c.id)).toEqual([
      'sample-maxdiv',
      'sample-minvar',
      'lw-maxdiv',
      'lw-minvar',
      'ewma-maxdiv',
      'ewma-minvar',
    ]);
    const demo = demoScenario(demoAssets, {});
    expect(demo.candidates.map((c) => c.id)).toEqual(
      demo.candidates.map((c) => candidateId(c.estimator as EstimatorSpec, c.objective as ObjectiveSpec)),
    );
    expect(out[2].label).toBe('Maximum diversification \u00b7 Ledoit-Wolf shrinkage');
  });

  it('keeps the id, label and overrides of a candidate that survives an edit of the grid', () => {
    const previous = [
      { id: 'lw-maxdiv', label: 'Mine', estimator: lw, objective: md, constraints: { maxTurnover: 0.2 } },
    ];
    const out = candidatesForGrid({ estimators: [lw], objectives: [md, mv] }, () => true, previous);
    expect(out[0]).toBe(previous[0]);
    expect(out[1].id).toBe('lw-minvar');
  });

  it('gives two variants of one method distinct ids', () => {
    const grid: CandidateGrid = { estimators: [ewma, { method: 'ewma', halfLife: 30 }], objectives: [md] };
    expect(candidatesForGrid(grid, () => true, []).map((c) => c.id)).toEqual(['ewma-maxdiv', 'ewma-maxdiv-2']);
  });

  it('carries overrides across an edit of an estimator option through the rename map', () => {
    const previous = [{ id: 'x', estimator: ewma, objective: md, constraints: { maxTurnover: 0.1 } }];
    const edited = { method: 'ewma', lambda: 0.94 } as const;
    const out = candidatesForGrid(
      { estimators: [edited], objectives: [md] },
      () => true,
      previous,
      new Map([[specKey(ewma), specKey(edited)]]),
    );
    expect(out[0].estimator).toEqual(edited);
    expect(out[0].constraints).toEqual({ maxTurnover: 0.1 });
  });

  it('reads the grid back from a candidate list, each estimator and objective once', () => {
    const candidates = candidatesForGrid(
      { estimators: [sample, lw], objectives: [md, mv] },
      (e, o) => !(e === lw && o === mv),
      [],
    );
    expect(candidates).toHaveLength(3);
    const grid = gridFromCandidates(candidates);
    expect(grid.estimators).toEqual([sample, lw]);
    expect(grid.objectives).toEqual([md, mv]);
    expect(isTicked(candidates, lw, mv)).toBe(false);
    expect(isTicked(candidates, lw, md)).toBe(true);
  });
});
