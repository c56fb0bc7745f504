import type { AssetCoverage, Coverage } from '../../shared-core/contract/service-api.js';
import { formatDate } from '../scenario/format.js';

/**
 * The coverage picture's geometry and its finding in words. Dates become x positions by whole
 * days; each asset is a row of data runs broken by its gaps, so a late start or a hole shows
 * before a window is chosen that the data cannot fill.
 */
export interface Run {
  from: string;
  to: string;
  kind: 'prices' | 'gap';
  /** Weekdays without a price, for gaps. */
  missing?: number;
}

const DAY_MS = 86_400_000;

export function dayNumber(iso: string): number {
  return Math.round(Date.parse(`${iso}T00:00:00Z`) / DAY_MS);
}

export function runsOf(asset: AssetCoverage): Run[] {
  if (!asset.firstDate || !asset.lastDate) return [];
  const runs: Run[] = [];
  let start = asset.firstDate;
  for (const gap of asset.gaps) {
    runs.push({ from: start, to: gap.after, kind: 'prices' });
    runs.push({ from: gap.after, to: gap.before, kind: 'gap', missing: gap.missingWeekdays });
    start = gap.before;
  }
  runs.push({ from: start, to: asset.lastDate, kind: 'prices' });
  return runs;
}

/** The dates every listed asset has prices between (latest start to earliest end), or null. */
export function commonSpan(coverage: Coverage): { from: string; to: string } | null {
  const priced = coverage.assets.filter((a) => a.firstDate && a.lastDate);
  if (priced.length === 0 || priced.length < coverage.assets.length) return null;
  const from = priced.map((a) => a.firstDate as string).reduce((x, y) => (y > x ? y : x));
  const to = priced.map((a) => a.lastDate as string).reduce((x, y) => (y < x ? y : x));
  return from <= to ? { from, to } : null;
}

/** A monthly (or sparser) series: its usual spacing is two weeks of weekdays or more. */
export function isSparse(asset: AssetCoverage): boolean {
  return (asset.typicalSpacingWeekdays ?? 1) >= 10;
}

function list(items: string[], limit = 3): string {
  if (items.length <= limit) return items.join(', ');
  return `${items.slice(0, limit).join(', ')} and ${items.length - limit} more`;
}

/** The sentence above the picture: what the coverage means for choosing a window. */
export function coverageFinding(coverage: Coverage, locale?: string): string {
  const n = coverage.assets.length;
  if (n === 0) return 'No assets to show.';
  const empty = coverage.assets.filter((a) => a.observations === 0).map((a) => a.asset);
  if (empty.length === n) return 'No prices are stored for these assets yet.';
  const span = commonSpan(coverage);
  const tolerance = 7;
  const first = coverage.firstDate ? dayNumber(coverage.firstDate) : 0;
  const last = coverage.lastDate ? dayNumber(coverage.lastDate) : 0;
  const late = coverage.assets.filter((a) => a.firstDate && dayNumber(a.firstDate) - first > tolerance);
  const early = coverage.assets.filter((a) => a.lastDate && last - dayNumber(a.lastDate) > tolerance);
  const gapped = coverage.assets.filter((a) => a.gaps.length > 0);
  const parts: string[] = [];
  if (empty.length) parts.push(`no prices for ${list(empty)}`);
  if (late.length)
    parts.push(
      `${late.length === 1 ? 'starts late' : `${late.length} start late`}: ${list(late.map((a) => `${a.asset} (${formatDate(a.firstDate as string, locale)})`))}`,
    );
  if (early.length)
    parts.push(
      `${early.length === 1 ? 'ends early' : `${early.length} end early`}: ${list(early.map((a) => a.asset))}`,
    );
  if (gapped.length)
    parts.push(
      `${gapped.length === 1 ? 'has gaps' : `${gapped.length} have gaps`}: ${list(gapped.map((a) => a.asset))}`,
    );
  const head = span
    ? `Every asset has prices from ${formatDate(span.from, locale)} to ${formatDate(span.to, locale)}`
    : 'No window has prices for every asset';
  if (parts.length === 0) return `${head}, without gaps.`;
  return `${head}; ${parts.join('; ')}.`;
}

/** Year boundaries inside [from, to] for the axis. Every other year when the span is long. */
export function yearTicks(from: string, to: string): string[] {
  const a = Number(from.slice(0, 4));
  const b = Number(to.slice(0, 4));
  const step = b - a > 14 ? 5 : b - a > 7 ? 2 : 1;
  const ticks: string[] = [];
  for (let y = a + 1; y <= b; y++) if (y % step === 0) ticks.push(`${y}-01-01`);
  return ticks;
}
