import { describe, expect, it } from 'vitest';
import { formatInputError } from '../../../shared-core/errors.js';
import { parseScenario, parseScenarioText } from '../../../shared-core/scenario/schema.js';

const minimal = {
  format: 'holdfast-scenario@1',
  name: 'Core allocation',
  baseCurrency: 'EUR',
  candidates: [{ id: 'md-lw', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } }],
};

function errorsOf(value: unknown): string[] {
  const result = parseScenario(value);
  return result.ok ? [] : result.errors.map(formatInputError);
}

describe('holdfast-scenario@1', () => {
  it('accepts the minimal document and fills the documented defaults', () => {
    const result = parseScenario(minimal);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.scenario.returns).toEqual({ frequency: 'daily', method: 'log', maxFillDays: 5 });
    expect(result.scenario.constraints).toEqual({});
  });

  it('names the JSON path and the allowed methods for an unknown objective', () => {
    const bad = { ...minimal, candidates: [{ ...minimal.candidates[0], objective: { method: 'max-div' } }] };
    expect(errorsOf(bad)).toEqual([
      "candidates[0].objective.method: unknown method 'max-div'; expected one of max-diversification, min-variance, equal-risk-contribution, max-decorrelation, max-sharpe, inverse-volatility, equal-weight",
    ]);
  });

  it('names an unknown estimator option value and an unknown key', () => {
    const bad = {
      ...minimal,
      candidates: [{ ...minimal.candidates[0], estimator: { method: 'ledoit-wolf', target: 'diagonal' }, weight: 1 }],
    };
    expect(errorsOf(bad)).toEqual([
      "candidates[0].estimator.target: unknown target 'diagonal'; expected one of scaled-identity, constant-correlation, single-index",
      "candidates[0]: unknown key 'weight'",
    ]);
  });

  it('refuses repeated candidate ids, an unknown recommendation and impossible dates', () => {
    const bad = {
      ...minimal,
      window: { from: '2023-02-30' },
      candidates: [minimal.candidates[0], minimal.candidates[0]],
      recommended: 'erc',
    };
    expect(errorsOf(bad)).toEqual([
      'window.from: expected a date YYYY-MM-DD',
      "candidates[1].id: repeated id 'md-lw'",
      "recommended: no candidate with id 'erc'",
    ]);
  });

  it('reports a JSON syntax error with line and column', () => {
    const result = parseScenarioText('{\n  "format": "holdfast-scenario@1",\n  "name": }');
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors[0].location).toEqual({ line: 3, column: 11 });
  });
});
