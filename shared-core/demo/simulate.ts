import { isTradingDay, isoOfDay, dayOfIso, weekdayOf, type CalendarName } from './calendar.js';
import { factorBehaviour, factorNames, regimeSwitching } from './factors.js';
import type { DemoAssetSpec } from './assets.js';
import { createRandom, deriveSeed, type RandomSource } from './random.js';

/**
 * The seeded multi-factor model behind the invented prices. Every weekday the market moves
 * (factor shocks with regime-dependent volatility, drift and contagion, plus each asset's own
 * noise); a price is observed only where the asset's calendar trades, after its inception, and
 * not on the odd day a data feed missed. Monthly-priced funds report a smoothed month-end value
 * (MA(1) smoothing of the true return, theta0 = 0.7, theta1 = 0.3, the form studied by
 * Getmansky, Lo and Makarov 2004, J. Financial Economics 74), which is why their volatility
 * looks lower than it is.
 */
export interface SimulationSettings {
  seed: number;
  from: string;
  to: string;
  /** Share of trading days on which a daily-priced asset's price is missing (data-feed gaps). */
  missingRate: number;
  /** Decimal places of the stored closes (prices) and of the FX rate. */
  priceDecimals: number;
  fxDecimals: number;
  fxStart: number;
}

export interface Simulation {
  dates: string[];
  /** Closes per asset (asset currency); NaN where there is no price. */
  closes: Float64Array[];
  /** Euro price of one US dollar, NaN on days the euro calendar is closed. */
  usdInEur: Float64Array;
  /** 1 on stressed days (per date). */
  stressed: Uint8Array;
}

const WEEKDAYS_PER_YEAR = 261;

/** Days on which a data feed fails to deliver, drawn once per asset from its own stream. */
function feedGap(rng: RandomSource, rate: number): boolean {
  return rng.uniform() < rate;
}

function roundTo(x: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(x * f) / f;
}

export function simulate(assets: readonly DemoAssetSpec[], settings: SimulationSettings): Simulation {
  const dt = 1 / WEEKDAYS_PER_YEAR;
  const sqrtDt = Math.sqrt(dt);
  const K = factorNames.length;
  const N = assets.length;
  const factorIndex = new Map(factorNames.map((f, k) => [f, k]));

  // Per-regime factor drifts, vols and couplings as flat arrays for the inner loop.
  const drift = [new Float64Array(K), new Float64Array(K)];
  const vol = [new Float64Array(K), new Float64Array(K)];
  const coupling = [new Float64Array(K * K), new Float64Array(K * K)];
  factorNames.forEach((name, k) => {
    const b = factorBehaviour[name];
    for (const r of [0, 1]) {
      drift[r][k] = b.drift[r] * dt;
      vol[r][k] = b.vol[r] * sqrtDt;
      for (const [other, c] of Object.entries(b.coupling ?? {})) {
        const j = factorIndex.get(other as (typeof factorNames)[number])!;
        if (j >= k) throw new Error(`factor ${name} may couple only to factors listed before it`);
        coupling[r][k * K + j] = c[r];
      }
    }
  });
  const loadings = assets.map((a) => {
    const row = new Float64Array(K);
    for (const [f, l] of Object.entries(a.loadings)) row[factorIndex.get(f as (typeof factorNames)[number])!] = l;
    return row;
  });
  const fxIndex = factorIndex.get('fx')!;

  const market = createRandom(deriveSeed(settings.seed, 'market'));
  const regimeRng = createRandom(deriveSeed(settings.seed, 'regime'));
  const own = assets.map((a) => createRandom(deriveSeed(settings.seed, `own:${a.id}`)));
  const gaps = assets.map((a) => createRandom(deriveSeed(settings.seed, `gap:${a.id}`)));

  const first = dayOfIso(settings.from);
  const last = dayOfIso(settings.to);
  const cache = new Map<string, Set<number>>();
  const calendars: CalendarName[] = ['euro', 'us'];
  // A fund launched inside the history shows its launch price; one older than the history
  // shows, if monthly, its first month-end value.
  const inception = assets.map((a) => (a.inception ? dayOfIso(a.inception) : first));

  // Month end: the last euro trading day of each month, when monthly net asset values are published.
  const lastTradingDayOfMonth = new Map<string, number>();
  for (let day = first; day <= last; day++)
    if (isTradingDay('euro', day, cache)) lastTradingDayOfMonth.set(isoOfDay(day).slice(0, 7), day);
  const monthEnd = new Set(lastTradingDayOfMonth.values());
  const suspended = assets.map((a) => (a.suspended ? [dayOfIso(a.suspended[0]), dayOfIso(a.suspended[1])] : [1, 0]));

  const logPrice = assets.map((a) => Math.log(a.startPrice));
  const reportedLog = assets.map((a) => Math.log(a.startPrice));
  const monthTrue = new Float64Array(N); // true log return accumulated since the last month end
  const lastMonthTrue = new Float64Array(N);
  let logFx = Math.log(settings.fxStart);
  let regime = 0;

  const dates: string[] = [];
  const columns: number[][] = assets.map(() => []);
  const fxColumn: number[] = [];
  const stressed: number[] = [];
  const f = new Float64Array(K);

  for (let day = first; day <= last; day++) {
    const w = weekdayOf(day);
    if (w === 0 || w === 6) continue;
    // Markov regime switch, then one market move for the day.
    const u = regimeRng.uniform();
    if (regime === 0 && u < regimeSwitching.calmToStressed) regime = 1;
    else if (regime === 1 && u < regimeSwitching.stressedToCalm) regime = 0;
    for (let k = 0; k < K; k++) {
      let x = drift[regime][k] + vol[regime][k] * market.normal();
      for (let j = 0; j < k; j++) x += coupling[regime][k * K + j] * f[j];
      f[k] = x;
    }
    logFx += f[fxIndex];
    for (let i = 0; i < N; i++) {
      const a = assets[i];
      let r = a.drift * dt + a.ownVol * sqrtDt * own[i].normal();
      const l = loadings[i];
      for (let k = 0; k < K; k++) r += l[k] * f[k];
      if (day > inception[i]) {
        logPrice[i] += r;
        monthTrue[i] += r;
      }
    }
    const open = calendars.filter((c) => isTradingDay(c, day, cache));
    if (open.length === 0) continue;
    dates.push(isoOfDay(day));
    stressed.push(regime);
    fxColumn.push(open.includes('euro') ? roundTo(Math.exp(logFx), settings.fxDecimals) : NaN);
    for (let i = 0; i < N; i++) {
      const a = assets[i];
      const gap = feedGap(gaps[i], settings.missingRate);
      let value = NaN;
      if (day >= inception[i] && open.includes(a.calendar)) {
        if (a.pricing === 'daily') {
          const halted = day >= suspended[i][0] && day <= suspended[i][1];
          value = day === inception[i] || (!gap && !halted) ? logPrice[i] : NaN;
        } else if (monthEnd.has(day) || (day === inception[i] && a.inception !== undefined)) {
          const reported = day === inception[i] ? 0 : 0.7 * monthTrue[i] + 0.3 * lastMonthTrue[i];
          reportedLog[i] += reported;
          value = reportedLog[i];
          lastMonthTrue[i] = day === inception[i] ? 0 : monthTrue[i];
          monthTrue[i] = 0;
        }
      }
      columns[i].push(Number.isNaN(value) ? NaN : roundTo(Math.exp(value), settings.priceDecimals));
    }
  }
  return {
    dates,
    closes: columns.map((c) => Float64Array.from(c)),
    usdInEur: Float64Array.from(fxColumn),
    stressed: Uint8Array.from(stressed),
  };
}
