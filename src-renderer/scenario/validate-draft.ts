import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { parseScenario, type Scenario, type ScenarioInput } from '../../shared-core/scenario/schema.js';
import { coarsestPricing } from '../../shared-core/returns/coarsest-pricing.js';
import { isCoarser } from '../../shared-core/returns/calendar.js';
import { describeField, inFieldWords } from '../../shared-core/present/field-words.js';
import { formatDate, formatPercent } from './format.js';

/**
 * Everything wrong with a draft, each message tied to the JSON path of the field that caused it
 * so the editor can show it beside that field. Three sources, in order: what could not be read
 * as typed (text in a number field), the scenario schema's own messages, and quick checks of
 * the draft against the prices and the arithmetic of the limits (a cap below 1/N long-only, a
 * window without prices) that would otherwise only surface after a solve.
 */
export interface FieldMessage {
  /** JSON path as the schema names it: `constraints.weightBounds.default` (never shown). */
  path: string;
  /** In the field's own words and units (shared-core/present/field-words.ts). */
  message: string;
  source: 'typing' | 'schema' | 'check';
  /** The one change that resolves it, offered as a button. */
  fix?: { label: string; path: (string | number)[]; value: unknown };
}

export type DraftCheck = { ok: true; scenario: Scenario; messages: [] } | { ok: false; messages: FieldMessage[] };

export interface DraftContext {
  /** Prices of the draft's assets (any window); absent while they load. */
  prices?: PriceTable;
  /** Text the advisor typed that is not a number, by path. */
  typing?: Readonly<Record<string, string>>;
}

export function checkDraft(draft: ScenarioInput, context: DraftContext = {}): DraftCheck {
  const messages: FieldMessage[] = Object.entries(context.typing ?? {}).map(([path, message]) => ({
    path,
    message,
    source: 'typing',
  }));
  const parsed = parseScenario(draft);
  if (!parsed.ok) {
    for (const error of parsed.errors) {
      const path = error.location.path ?? '(document)';
      messages.push({ path, message: inFieldWords(path, error.message), source: 'schema' });
    }
    return { ok: false, messages };
  }
  messages.push(...checkScenario(parsed.scenario, context.prices));
  return messages.length === 0 ? { ok: true, scenario: parsed.scenario, messages: [] } : { ok: false, messages };
}

/** The assets a scenario uses: its list, or every column of the prices. */
export function scenarioAssets(scenario: Pick<Scenario, 'assets'>, prices?: PriceTable): string[] {
  return scenario.assets ? [...scenario.assets] : prices ? [...prices.assets] : [];
}

function upperBound(scenario: Scenario, asset: string): number {
  const bounds = scenario.constraints.weightBounds;
  const longOnly = scenario.constraints.longOnly !== false;
  let hi = bounds?.[asset]?.[1] ?? bounds?.default?.[1] ?? (longOnly ? 1 : Infinity);
  const cap = scenario.assetInfo?.[asset]?.liquidityCap;
  if (cap !== undefined) hi = Math.min(hi, cap);
  return hi;
}

function lowerBound(scenario: Scenario, asset: string): number {
  const bounds = scenario.constraints.weightBounds;
  const longOnly = scenario.constraints.longOnly !== false;
  return bounds?.[asset]?.[0] ?? bounds?.default?.[0] ?? (longOnly ? 0 : -Infinity);
}

function boundPath(scenario: Scenario, assets: readonly string[]): string {
  const bounds = scenario.constraints.weightBounds;
  if (bounds?.default) return 'constraints.weightBounds.default';
  const own = assets.find((a) => bounds?.[a]);
  return own ? `constraints.weightBounds.${own}` : 'constraints.weightBounds';
}

/** Checks that need the whole valid document (and the prices, where given). */
export function checkScenario(scenario: Scenario, prices?: PriceTable): FieldMessage[] {
  const out: FieldMessage[] = [];
  const assets = scenarioAssets(scenario, prices);
  const check = (path: string, message: string) => out.push({ path, message, source: 'check' });
  const n = assets.length;

  if (scenario.constraints.longOnly !== false && n > 0) {
    const sumHi = assets.reduce((s, a) => s + upperBound(scenario, a), 0);
    if (sumHi < 1 - 1e-12)
      check(
        boundPath(scenario, assets),
        `the per-asset upper bounds add to ${formatPercent(sumHi, 'en-GB')}, below the 100% invested; ` +
          `long-only with ${n} assets needs caps of at least 1/${n} = ${formatPercent(1 / n, 'en-GB')}`,
      );
  }
  if (n > 0) {
    const sumLo = assets.reduce((s, a) => s + lowerBound(scenario, a), 0);
    if (sumLo > 1 + 1e-12)
      check(
        boundPath(scenario, assets),
        `the per-asset lower bounds add to ${formatPercent(sumLo, 'en-GB')}, above the 100% invested`,
      );
  }

  const members = new Set(assets);
  (scenario.constraints.groups ?? []).forEach((g, i) => {
    const strangers = g.members.filter((m) => !members.has(m));
    if (strangers.length > 0)
      check(
        `constraints.groups[${i}].members`,
        `${g.name} names ${strangers.map((s) => `'${s}'`).join(', ')}, not among the scenario's assets`,
      );
  });

  const needsReturns = scenario.candidates.some((c) => c.objective.method === 'max-sharpe');
  if (needsReturns) {
    const missing = assets.filter((a) => scenario.expectedReturns?.[a] === undefined);
    if (missing.length > 0)
      check(
        'expectedReturns',
        `maximum Sharpe ratio needs an expected return for every asset; missing for ${missing.join(', ')}`,
      );
  }

  if (prices) {
    scenario.assets?.forEach((a, i) => {
      if (!prices.assets.includes(a)) check(`assets[${i}]`, `no prices for '${a}' in the store`);
    });
    const pricing = coarsestPricing(
      prices,
      assets.filter((a) => prices.assets.includes(a)),
      scenario.window ?? {},
    );
    if (isCoarser(pricing.frequency, scenario.returns.frequency)) {
      const named =
        pricing.assets.slice(0, 3).join(', ') +
        (pricing.assets.length > 3 ? ` and ${pricing.assets.length - 3} more` : '');
      out.push({
        path: 'returns.frequency',
        message: `${named} ${pricing.assets.length === 1 ? 'is' : 'are'} priced ${pricing.frequency}, so the returns cannot be ${scenario.returns.frequency}: use ${pricing.frequency} returns or leave ${pricing.assets.length === 1 ? 'it' : 'them'} out`,
        source: 'check',
        fix: { label: `Use ${pricing.frequency} returns`, path: ['returns', 'frequency'], value: pricing.frequency },
      });
    }
    const windowMessage = checkWindow(scenario, prices, assets);
    if (windowMessage) check(windowMessage.path, windowMessage.message);
  }
  return out;
}

/** Return periods need at least this many prices in the window (common practice: far more). */
export const MIN_WINDOW_PRICES = 3;

function checkWindow(
  scenario: Scenario,
  prices: PriceTable,
  assets: readonly string[],
): { path: string; message: string } | null {
  const from = scenario.window?.from;
  const to = scenario.window?.to;
  // Dates in the reader's locale, as everywhere on screen.
  if (from !== undefined && to !== undefined && from > to)
    return {
      path: 'window.from',
      message: `the window starts (${formatDate(from)}) after it ends (${formatDate(to)})`,
    };
  const columns = assets.map((a) => prices.closes[prices.assets.indexOf(a)]).filter((c) => c !== undefined);
  if (columns.length === 0) return null;
  let first: string | undefined;
  let last: string | undefined;
  let inside = 0;
  prices.dates.forEach((date, t) => {
    if (!columns.some((c) => Number.isFinite(c[t]))) return;
    first ??= date;
    last = date;
    if ((from === undefined || date >= from) && (to === undefined || date <= to)) inside++;
  });
  if (first === undefined) return { path: 'assets', message: 'the store holds no prices for these assets' };
  if (inside >= MIN_WINDOW_PRICES) return null;
  const range = `${from !== undefined ? formatDate(from) : 'the start'} to ${to !== undefined ? formatDate(to) : 'the end'}`;
  return {
    path: from !== undefined ? 'window.from' : 'window.to',
    message: `${inside === 0 ? 'no prices' : `only ${inside} price dates`} from ${range}; the prices of these assets run from ${formatDate(first)} to ${formatDate(last!)}`,
  };
}

/** Messages for one field: its own path and everything beneath it. */
export function messagesAt(messages: readonly FieldMessage[], path: string): FieldMessage[] {
  return messages.filter((m) => m.path === path || m.path.startsWith(`${path}.`) || m.path.startsWith(`${path}[`));
}

/** One line per message for a summary list, naming the field by its label: "From (date): no prices ...". */
export function describeMessage(m: FieldMessage): string {
  return describeField(m.path, m.message);
}
