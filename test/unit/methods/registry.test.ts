import { describe, expect, it } from 'vitest';
import { estimators } from '../../../shared-core/estimators/registry.js';
import { estimatorDefinitions, estimatorMethods } from '../../../shared-core/methods/estimator-registry.js';
import { objectiveDefinitions, objectiveMethods } from '../../../shared-core/methods/objective-registry.js';
import {
  describeEstimator,
  describeObjective,
  estimatorShort,
  estimatorWords,
  objectiveWords,
} from '../../../shared-core/present/method-words.js';
import { estimatorSpecSchema } from '../../../shared-core/scenario/estimator-spec.js';
import { objectiveSpecSchema } from '../../../shared-core/scenario/objective-spec.js';
import { commands } from '../../../src-main/cli/commands/index.js';

// One definition per method: the document's union, the command line's choices, the editor's
// lists and the memo's words are all read from shared-core/methods/.
describe.each([
  { kind: 'estimator', definitions: estimatorDefinitions, methods: estimatorMethods, schema: estimatorSpecSchema },
  { kind: 'objective', definitions: objectiveDefinitions, methods: objectiveMethods, schema: objectiveSpecSchema },
] as const)('$kind definitions', ({ definitions, methods, schema }) => {
  it('have distinct names and id codes, a label and a source each', () => {
    expect(methods).toEqual(definitions.map((d) => d.method));
    expect(new Set(methods).size).toBe(methods.length);
    expect(new Set(definitions.map((d) => d.idPart)).size).toBe(definitions.length);
    for (const d of definitions) {
      expect(d.label.length, d.method).toBeGreaterThan(0);
      expect(d.source.length, d.method).toBeGreaterThan(0);
      expect(d.idPart, d.method).toMatch(/^[a-z]+$/);
    }
  });

  it("make the document's union: each starting object is valid, and an unknown option is refused", () => {
    for (const d of definitions) {
      expect(schema.parse(d.initial), d.method).toEqual(d.initial);
      expect(schema.safeParse({ ...d.initial, unknownOption: 1 }).success, d.method).toBe(false);
    }
    expect(schema.safeParse({ method: 'no-such-method' }).success).toBe(false);
  });
});

describe('the registries feed every list', () => {
  it('every estimator has its computation, and no computation lacks a definition', () => {
    expect(Object.keys(estimators).sort()).toEqual([...estimatorMethods].sort());
  });

  it("the command line's --method choices are the estimators, in the definitions' order", () => {
    const option = commands.find((c) => c.name === 'estimate')?.options.find((o) => o.name === 'method');
    expect(option?.choices).toEqual(estimatorMethods);
  });

  it('words come from the definition with its options', () => {
    expect(describeEstimator({ method: 'ewma', halfLife: 60 })).toBe('Exponentially weighted, half-life 60');
    expect(estimatorWords({ method: 'ledoit-wolf', target: 'single-index' })).toBe(
      'Ledoit-Wolf shrinkage towards a single-index model',
    );
    expect(estimatorShort({ method: 'ewma', lambda: 0.97 })).toBe('EWMA, lambda 0.97');
    expect(describeObjective({ method: 'equal-risk-contribution', budgets: { A: 1 } })).toBe(
      'Equal risk contribution, own budgets',
    );
    expect(objectiveWords({ method: 'min-variance' })).toBe('minimum variance');
    expect(objectiveWords({ method: 'max-sharpe' })).toBe('maximum Sharpe ratio');
    expect(objectiveWords({ method: 'max-sharpe', riskFreeRate: 0.025 })).toBe(
      'maximum Sharpe ratio (risk-free rate 2.50%)',
    );
    expect(describeObjective({ method: 'max-sharpe', riskFreeRate: -0.005 })).toBe(
      'Maximum Sharpe ratio, risk-free rate \u22120.50%',
    );
  });
});
