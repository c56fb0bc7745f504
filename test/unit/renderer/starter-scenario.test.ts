import { describe, expect, it } from 'vitest';
import type { Asset, UniverseMember } from '../../../shared-core/contract/service-api.js';
import { parseScenario } from '../../../shared-core/scenario/schema.js';
import { starterScenario, STATED_DEFAULTS_TEXT } from '../../../src-renderer/households/starter-scenario.js';

const asset = (id: string, liquidity: Asset['liquidity'] = 'daily', fx: Asset['fx'] = null): UniverseMember => ({
  asset: {
    id,
    name: `Invented ${id}`,
    assetClass: 'equity',
    region: '',
    currency: 'EUR',
    liquidity,
    lockUpDays: null,
    notes: '',
    fx,
  },
  groups: [],
});
const members = [
  asset('EQ1'),
  asset('EQ2'),
  asset('PE1', 'illiquid'),
  asset('USDEUR', 'daily', { base: 'USD', quote: 'EUR' }),
];
const start = (mandate?: { assetCap: number | null; illiquidMax: number | null }) =>
  starterScenario({ name: 'First', baseCurrency: 'EUR', members, holdings: undefined, mandate });

describe('a new scenario starts from the household mandate, else from stated defaults', () => {
  it('takes the cap per asset and the illiquid cap from the mandate, and says so', () => {
    const { document, origin } = start({ assetCap: 0.15, illiquidMax: 0.05 });
    expect(document.constraints).toEqual({ longOnly: true, weightBounds: { default: [0, 0.15] }, illiquidMax: 0.05 });
    expect(origin).toMatch(
      /^Limits from the household's mandate: long-only, no asset above 15\.0 %, illiquid assets at most 5\.0 % together\. /,
    );
    expect(origin).not.toMatch(/stated default/);
    // The starting document is a valid scenario whose limits the schema keeps as typed.
    const parsed = parseScenario(document);
    expect(parsed.ok && parsed.scenario.constraints.weightBounds).toEqual({ default: [0, 0.15] });
  });

  it('fills a limit the mandate leaves empty from the stated default, naming it as such', () => {
    const { document, origin } = start({ assetCap: 0.2, illiquidMax: null });
    expect(document.constraints).toEqual({ longOnly: true, weightBounds: { default: [0, 0.2] }, illiquidMax: 0.1 });
    expect(origin).toContain('no asset above 20.0 %');
    expect(origin).toContain('so these are stated defaults: illiquid assets at most 10.0 % together');
  });

  it('uses the stated defaults with a note when the household has no mandate (none stored, or both empty)', () => {
    for (const mandate of [undefined, { assetCap: null, illiquidMax: null }]) {
      const { document, origin } = start(mandate);
      expect(document.constraints).toEqual({ longOnly: true, illiquidMax: 0.1 });
      expect(origin).toContain(
        `The household has no mandate on file, so the limits are stated defaults: ${STATED_DEFAULTS_TEXT}.`,
      );
    }
  });

  it('leaves the exchange-rate series out of the assets', () => {
    expect(start().document.assets).toEqual(['EQ1', 'EQ2', 'PE1']);
  });
});
