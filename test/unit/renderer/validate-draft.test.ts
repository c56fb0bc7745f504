import { describe, expect, it } from 'vitest';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import type { ScenarioInput } from '../../../shared-core/scenario/schema.js';
import { checkDraft, describeMessage, messagesAt } from '../../../src-renderer/scenario/validate-draft.js';
import { formatDay } from '../../../shared-core/present/format.js';

const assets = Array.from({ length: 10 }, (_, i) => `A${i}`);
const dates = Array.from({ length: 40 }, (_, i) => `2024-01-${String(i + 1).padStart(2, '0')}`).filter((d) =>
  /^2024-01-(0[1-9]|[12]\d|3[01])$/.test(d),
);
const prices: PriceTable = {
  dates,
  assets,
  closes: assets.map((_, j) => Float64Array.from(dates, (_, t) => 100 + t + j)),
};

const base: ScenarioInput = {
  format: 'holdfast-scenario@1',
  name: 'Test',
  baseCurrency: 'EUR',
  assets,
  constraints: { longOnly: true, weightBounds: { default: [0, 0.15] } },
  candidates: [{ id: 'md-lw', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } }],
};

describe('draft checks beside each field', () => {
  it('accepts a valid draft and returns the parsed scenario', () => {
    const out = checkDraft(base, { prices });
    expect(out.ok).toBe(true);
  });

  it("places the scenario schema's message at its field, in the field's words", () => {
    const out = checkDraft({ ...base, constraints: { weightBounds: { default: [0.2, 0.1] } } }, { prices });
    expect(out.ok).toBe(false);
    expect(messagesAt(out.messages, 'constraints.weightBounds.default')).toEqual([
      {
        path: 'constraints.weightBounds.default',
        message: 'the lower bound is above the upper bound',
        source: 'schema',
      },
    ]);
  });

  it("refuses a cap of 150 % in the field's own words and unit, with no JSON path or fraction on screen", () => {
    const out = checkDraft(
      { ...base, constraints: { longOnly: true, weightBounds: { default: [0, 0.15], A3: [0, 1.5] } } },
      { prices },
    );
    expect(out.ok).toBe(false);
    expect(out.messages.map((m) => [m.path, m.message])).toEqual([
      ['constraints.weightBounds.A3[1]', 'the upper bound must be at most 100 % (the portfolio is long-only)'],
    ]);
    expect(describeMessage(out.messages[0])).toBe(
      'Upper bound of A3: the upper bound must be at most 100 % (the portfolio is long-only)',
    );
    const illiquid = checkDraft({ ...base, constraints: { longOnly: true, illiquidMax: 1.5 } }, { prices });
    expect(illiquid.messages.map(describeMessage)).toEqual([
      'Cap on illiquid assets together: the cap on illiquid assets together must be at most 100 %',
    ]);
    const window = checkDraft({ ...base, backtest: { estimationWindow: 2 } }, { prices });
    expect(window.messages.map(describeMessage)).toEqual([
      'Estimation window (walk-forward): the estimation window (walk-forward) must be at least 3 return periods',
    ]);
    for (const m of [...out.messages, ...illiquid.messages, ...window.messages]) {
      expect(describeMessage(m)).not.toMatch(/constraints\.|backtest\.|\b0\.\d|1\.5|<=|>=/);
    }
  });

  it('offers the one change that computes when an asset is priced monthly and the returns are daily', () => {
    // Month-end prices for A9 only (about 21 weekdays apart), daily for the rest.
    const days = Array.from({ length: 400 }, (_, i) => new Date(Date.UTC(2020, 0, 1 + i)).toISOString().slice(0, 10));
    const monthEnd = (d: string) => d.slice(8) === '28';
    const mixed: PriceTable = {
      dates: days,
      assets,
      closes: assets.map((a, j) =>
        Float64Array.from(days, (d, t) => (a === 'A9' && !monthEnd(d) ? Number.NaN : 100 + t + j)),
      ),
    };
    const daily = checkDraft({ ...base, returns: { frequency: 'daily' } }, { prices: mixed });
    const note = messagesAt(daily.messages, 'returns.frequency');
    expect(note).toHaveLength(1);
    expect(note[0].message).toBe(
      'A9 is priced monthly, so the returns cannot be daily: use monthly returns or leave it out',
    );
    expect(note[0].fix).toEqual({ label: 'Use monthly returns', path: ['returns', 'frequency'], value: 'monthly' });
    expect(checkDraft({ ...base, returns: { frequency: 'monthly' } }, { prices: mixed }).ok).toBe(true);
  });

  it('explains a cap below 1/N long-only: 10 assets capped at 8% add to 80%, not 100% (arithmetic of the budget)', () => {
    const out = checkDraft(
      { ...base, constraints: { longOnly: true, weightBounds: { default: [0, 0.08] } } },
      { prices },
    );
    expect(out.ok).toBe(false);
    expect(out.messages.map((m) => [m.path, m.message])).toEqual([
      [
        'constraints.weightBounds.default',
        'the per-asset upper bounds add to 80.0%, below the 100% invested; long-only with 10 assets needs caps of at least 1/10 = 10.0%',
      ],
    ]);
  });

  it('does not apply the 1/N rule to long-short scenarios', () => {
    const out = checkDraft(
      { ...base, constraints: { longOnly: false, weightBounds: { default: [-0.5, 0.08] } } },
      { prices },
    );
    expect(out.ok).toBe(true);
  });

  it('names a window with no prices and where the prices are', () => {
    const day = (iso: string) => formatDay(iso, undefined);
    const out = checkDraft({ ...base, window: { from: '2030-01-01', to: '2031-01-01' } }, { prices });
    expect(out.ok).toBe(false);
    expect(messagesAt(out.messages, 'window')).toEqual([
      {
        path: 'window.from',
        // Days in the reader's locale, as the rest of the screen shows them.
        message: `no prices from ${day('2030-01-01')} to ${day('2031-01-01')}; the prices of these assets run from ${day('2024-01-01')} to ${day('2024-01-31')}`,
        source: 'check',
      },
    ]);
  });

  it("states a risk-free rate out of range in the rate's words and per cent, and a typed one at its field", () => {
    const sharpe = (riskFreeRate: number): ScenarioInput => ({
      ...base,
      expectedReturns: Object.fromEntries(assets.map((a) => [a, 0.05])),
      candidates: [{ id: 'ms', estimator: { method: 'sample' }, objective: { method: 'max-sharpe', riskFreeRate } }],
    });
    expect(checkDraft(sharpe(0.02), { prices }).ok).toBe(true);
    const out = checkDraft(sharpe(1.5), { prices });
    expect(out.messages.map(describeMessage)).toEqual([
      'Risk-free rate (candidate 1): the risk-free rate (candidate 1) must be below 100 %',
    ]);
    const typed = checkDraft(base, { prices, typing: { 'objectives[0].riskFreeRate': "'two' is not a number" } });
    expect(typed.messages.map(describeMessage)).toEqual(["Risk-free rate, annualised: 'two' is not a number"]);
  });

  it('asks for expected returns when maximum Sharpe ratio is among the objectives', () => {
    const out = checkDraft(
      {
        ...base,
        expectedReturns: { A0: 0.05 },
        candidates: [{ id: 'ms', estimator: { method: 'sample' }, objective: { method: 'max-sharpe' } }],
      },
      { prices },
    );
    expect(messagesAt(out.messages, 'expectedReturns')[0].message).toMatch(
      /^maximum Sharpe ratio needs an expected return for every asset; missing for A1, A2/,
    );
  });

  it('names a group member that is not among the assets and an asset without prices', () => {
    const out = checkDraft(
      {
        ...base,
        assets: [...assets, 'ZZ'],
        constraints: { ...base.constraints, groups: [{ name: 'Equity', members: ['A0', 'QQ'], max: 0.5 }] },
      },
      { prices },
    );
    expect(out.messages.map((m) => `${m.path}: ${m.message}`)).toEqual([
      "constraints.groups[0].members: Equity names 'QQ', not among the scenario's assets",
      "assets[10]: no prices for 'ZZ' in the store",
    ]);
  });

  it('reports text typed into a number field first, at its path', () => {
    const out = checkDraft(base, { prices, typing: { maxTurnover: "'abc' is not a number" } });
    expect(out.ok).toBe(false);
    expect(out.messages[0]).toEqual({ path: 'maxTurnover', message: "'abc' is not a number", source: 'typing' });
  });
});
