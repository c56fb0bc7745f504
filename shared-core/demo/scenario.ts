import { SCENARIO_FORMAT, type ScenarioInput } from '../scenario/schema.js';
import type { DemoAssetSpec } from './assets.js';

/**
 * The demonstration scenario: three estimators times two objectives on the whole invented
 * universe, monthly returns (the hedge-fund-style funds publish month-end values only), with the
 * position caps and asset-class bands of a balanced mandate.
 */
export const DEMO_SCENARIO_NAME = 'Annual review 2025 (invented demonstration data)';

const estimators = [
  { key: 'sample', label: 'Sample', spec: { method: 'sample' } },
  { key: 'lw', label: 'Ledoit-Wolf', spec: { method: 'ledoit-wolf' } },
  // RiskMetrics (J.P. Morgan/Reuters 1996) suggests lambda 0.97 for monthly data.
  { key: 'ewma', label: 'EWMA 0.97', spec: { method: 'ewma', lambda: 0.97 } },
] as const;

const objectives = [
  { key: 'maxdiv', label: 'maximum diversification', spec: { method: 'max-diversification' } },
  { key: 'minvar', label: 'minimum variance', spec: { method: 'min-variance' } },
] as const;

export const demoGroups = {
  equity: ['equity', 'single-stock'],
  bonds: ['government-bond', 'corporate-bond', 'inflation-linked'],
  alternatives: ['gold', 'real-estate', 'hedge-fund'],
} as const;

export function demoScenario(assets: readonly DemoAssetSpec[], current: Record<string, number>): ScenarioInput {
  const members = (classes: readonly string[]) => assets.filter((a) => classes.includes(a.assetClass)).map((a) => a.id);
  return {
    format: SCENARIO_FORMAT,
    name: DEMO_SCENARIO_NAME,
    baseCurrency: 'EUR',
    assets: assets.map((a) => a.id),
    window: { years: 8 },
    returns: { frequency: 'monthly', method: 'log', maxFillDays: 5 },
    constraints: {
      longOnly: true,
      weightBounds: { default: [0, 0.15], 'LMI-US': [0, 0.1], 'MM-EUR': [0, 0.1] },
      groups: [
        { name: 'Equity', members: members(demoGroups.equity), min: 0.25, max: 0.6 },
        { name: 'Bonds', members: members(demoGroups.bonds), min: 0.2, max: 0.55 },
        { name: 'Alternatives', members: members(demoGroups.alternatives), max: 0.3 },
      ],
      illiquidMax: 0.05,
    },
    current,
    assetInfo: Object.fromEntries(
      assets.map((a) => [
        a.id,
        { name: a.name, assetClass: a.assetClass, region: a.region, currency: a.currency, liquidity: a.liquidity },
      ]),
    ),
    candidates: estimators.flatMap((e) =>
      objectives.map((o) => ({
        id: `${e.key}-${o.key}`,
        label: `${e.label}, ${o.label}`,
        estimator: { ...e.spec },
        objective: { ...o.spec },
      })),
    ),
    recommended: 'lw-maxdiv',
  };
}
