import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runScenario } from '../shared-core/run/run-scenario.js';
import { parseScenario, type Scenario } from '../shared-core/scenario/schema.js';
import { buildComparison, createComparisonCache } from '../src-renderer/worker/comparison.js';
import { formatFigure, median, timeMedian, type BenchFigure, type BenchSuite } from './harness.js';
import { PEER_SCRIPT } from './solve-peer.js';
import { csvOf, inventedPrices, TRADING_DAYS, type UniverseShape } from './solve-universes.js';

/**
 * The solver's bench (issues 4 and 20).
 * 1. Whole-process `holdfast solve` with ledoit-wolf, T = 1260 daily returns, against the script
 *    a quant would write with numpy, scikit-learn's LedoitWolf and cvxopt's QP (solve-peer.ts) on
 *    the same files, the two run alternately in this process. The universes come from seeds in
 *    two shapes (solve-universes.ts): optima that hold few of the assets and optima that hold
 *    most; caps binding and not, group bands, a turnover limit, minimum variance as well as
 *    maximum diversification; N = 500, 1500 and 3000. Per case: iterations, the solver's own
 *    time, the whole process's time and peak memory, and the script's time and peak memory.
 *    Target: at most half the script's time (the median of the paired ratios).
 * 2. Live recompute for the editor: 6 candidates (3 estimators x 2 objectives), in-process.
 * `BENCH_SOLVE_SIZES=500,1500` limits the sizes (N = 3000 takes minutes, most of it the script's;
 * an empty list runs the live recompute alone); `BENCH_SOLVE_CASES=2` keeps the first cases of
 * each size (issue 4's universe and its most-held twin); `BENCH_SOLVE_SEEDS=1,2,3` sets the
 * universes' seeds (default two at N = 500, one above); `BENCH_SOLVE_LIVE=0` leaves out the live
 * recompute. Where a case runs at more than one size, the growth of time with N (the exponent of
 * a least-squares line through log time against log N) is printed for both sides.
 */
const T = TRADING_DAYS;

interface Case {
  n: number;
  /** The universe's seed (solve-universes.ts). */
  seed: number;
  shape: UniverseShape;
  objective: 'max-diversification' | 'min-variance';
  cap: number;
  /** Five bands over consecutive fifths of the assets, each held at 15-25 %. */
  groups?: boolean;
  /** Turnover limit against equal current weights. */
  turnover?: number;
}

/** The caps of issue 4's bench (few held, not binding at most-held optima) and 1.5/N (binding). */
const CAP: Record<number, number> = { 500: 0.02, 1500: 0.01, 3000: 0.005 };

function casesFor(n: number, seed: number): Case[] {
  const cap = CAP[n] ?? 2.5 / n;
  const base: Case[] = [
    { n, seed, shape: 'few-held', objective: 'max-diversification', cap },
    { n, seed, shape: 'most-held', objective: 'max-diversification', cap },
  ];
  if (n >= 3000) return base;
  return [
    ...base,
    { n, seed, shape: 'most-held', objective: 'max-diversification', cap: 1.5 / n },
    { n, seed, shape: 'most-held', objective: 'min-variance', cap },
    { n, seed, shape: 'few-held', objective: 'min-variance', cap },
    { n, seed, shape: 'most-held', objective: 'max-diversification', cap, groups: true },
    { n, seed, shape: 'most-held', objective: 'min-variance', cap, turnover: 0.3 },
  ];
}

/** The universes' seeds: two at N = 500, one above (N = 1500 and 3000 take minutes a case). */
const seedsFor = (n: number): number[] =>
  process.env.BENCH_SOLVE_SEEDS ? process.env.BENCH_SOLVE_SEEDS.split(',').map(Number) : n <= 500 ? [1, 2] : [1];

/** The case without its size and seed, to follow it across sizes. */
const caseKey = (c: Case) =>
  `${c.shape} ${c.objective} cap ${c.cap * c.n}/N${c.groups ? ' groups' : ''}${c.turnover ?? ''}`;

/** Slope of the least-squares line through (log N, log ms). */
function growthExponent(points: readonly { n: number; ms: number }[]): number {
  const xs = points.map((p) => Math.log(p.n));
  const ys = points.map((p) => Math.log(p.ms));
  const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
  const my = ys.reduce((a, b) => a + b, 0) / ys.length;
  let sxy = 0;
  let sxx = 0;
  xs.forEach((x, k) => {
    sxy += (x - mx) * (ys[k] - my);
    sxx += (x - mx) * (x - mx);
  });
  return sxy / sxx;
}

/**
 * Alternating runs per case: the shared host's speed drifts by 10-30 % within a minute.
 * `BENCH_SOLVE_REPEATS` overrides it.
 */
const repeatsFor = (n: number) => Number(process.env.BENCH_SOLVE_REPEATS) || (n <= 500 ? 5 : n <= 1500 ? 3 : 1);

function describe(c: Case): string {
  const limits = [
    `cap ${Number((c.cap * 100).toFixed(2))}%`,
    ...(c.groups ? ['5 group bands 15-25%'] : []),
    ...(c.turnover !== undefined ? [`turnover <= ${c.turnover * 100}%`] : []),
  ];
  return `${c.objective} N=${c.n} ${c.shape} seed ${c.seed} ${limits.join(', ')}`;
}

function groupsOf(assets: readonly string[]): { name: string; members: string[]; min: number; max: number }[] {
  const fifth = Math.ceil(assets.length / 5);
  return Array.from({ length: 5 }, (_, g) => ({
    name: `G${g + 1}`,
    members: assets.slice(g * fifth, (g + 1) * fifth),
    min: 0.15,
    max: 0.25,
  }));
}

function peerAvailable(): string | null {
  const r = spawnSync('/usr/bin/python3', ['-c', 'import numpy, sklearn, cvxopt'], { encoding: 'utf8' });
  return r.status === 0 ? null : 'python3 with numpy, scikit-learn and cvxopt is absent: no peer measured';
}

const TIME = '/usr/bin/time';

/** Wall time, output and peak resident memory (GNU time's %M, when it is installed). */
function timed(
  cmd: string,
  args: string[],
): { ms: number; stdout: string; ok: boolean; stderr: string; peakMb: number } {
  const measured = existsSync(TIME);
  const t0 = performance.now();
  const r = measured
    ? spawnSync(TIME, ['-f', 'peak-kb %M', cmd, ...args], { encoding: 'utf8', maxBuffer: 1 << 28 })
    : spawnSync(cmd, args, { encoding: 'utf8', maxBuffer: 1 << 28 });
  const ms = performance.now() - t0;
  const peak = /peak-kb (\d+)\s*$/.exec(r.stderr ?? '');
  return { ms, stdout: r.stdout, stderr: r.stderr, ok: r.status === 0, peakMb: peak ? Number(peak[1]) / 1024 : NaN };
}

interface Measured {
  figure: BenchFigure;
  ours: number;
  peer?: number;
}

function wholeProcess(c: Case, peerScript: string, missing: string | null): Measured {
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-bench-solve-'));
  try {
    return measuredIn(dir, c, peerScript, missing);
  } finally {
    // The universe's files (5-65 MB a case) go with the case.
    rmSync(dir, { recursive: true, force: true });
  }
}

function measuredIn(dir: string, c: Case, peerScript: string, missing: string | null): Measured {
  const prices = join(dir, 'prices.csv');
  const table = inventedPrices(c.n, c.n * 1000 + c.seed, c.shape);
  writeFileSync(prices, csvOf(table));
  const current = c.turnover !== undefined ? Object.fromEntries(table.assets.map((a) => [a, 1 / c.n])) : undefined;
  const groups = c.groups ? groupsOf(table.assets) : undefined;
  const scenario = join(dir, 'scenario.json');
  writeFileSync(
    scenario,
    JSON.stringify({
      format: 'holdfast-scenario@1',
      name: 'Bench',
      baseCurrency: 'EUR',
      constraints: {
        longOnly: true,
        weightBounds: { default: [0, c.cap] },
        ...(groups ? { groups } : {}),
        ...(c.turnover !== undefined ? { maxTurnover: c.turnover } : {}),
      },
      ...(current ? { current } : {}),
      candidates: [{ id: 'bench', estimator: { method: 'ledoit-wolf' }, objective: { method: c.objective } }],
    }),
  );
  const spec = join(dir, 'spec.json');
  const index = new Map(table.assets.map((a, i) => [a, i]));
  writeFileSync(
    spec,
    JSON.stringify({
      objective: c.objective,
      cap: c.cap,
      groups: (groups ?? []).map((g) => ({ members: g.members.map((m) => index.get(m)), min: g.min, max: g.max })),
      ...(c.turnover !== undefined ? { turnover: c.turnover, current: table.assets.map((a) => current![a]) } : {}),
    }),
  );
  const cli = fileURLToPath(new URL('../src-main/cli/main.js', import.meta.url));
  const ours: number[] = [];
  const solver: number[] = [];
  const peer: number[] = [];
  let ourPeak = 0;
  let peerPeak = 0;
  let notes = '';
  for (let k = 0; k < repeatsFor(c.n); k++) {
    const a = timed(process.execPath, [cli, 'solve', '--prices', prices, '--scenario', scenario, '--json']);
    if (!a.ok) throw new Error(`holdfast solve failed: ${a.stderr}`);
    ours.push(a.ms);
    ourPeak = Math.max(ourPeak, a.peakMb);
    const r = JSON.parse(a.stdout).candidates[0];
    solver.push(r.solver.ms);
    const held = Object.values(r.weights as Record<string, number>).filter((w) => w > 1e-9).length;
    const atCap = Object.values(r.weights as Record<string, number>).filter((w) => w > c.cap - 1e-9).length;
    notes = `${r.status}, ${r.solver.iterations} iterations, KKT ${Number(r.solver.kktResidual).toExponential(1)}, held ${held}, at cap ${atCap}, DR ${r.metrics.diversificationRatio.toFixed(6)}, vol ${(100 * r.metrics.volatility).toFixed(4)}%`;
    if (!missing) {
      const b = timed('/usr/bin/python3', [peerScript, prices, spec]);
      if (!b.ok) throw new Error(`peer script failed: ${b.stderr}`);
      peer.push(b.ms);
      peerPeak = Math.max(peerPeak, b.peakMb);
      const p = JSON.parse(b.stdout) as { status: string; iterations: number; dr: number; volatility: number };
      notes += `; peer ${p.status} in ${p.iterations} iterations, DR ${p.dr.toFixed(6)}, vol ${(100 * p.volatility).toFixed(4)}%`;
    }
  }
  const ourMedian = median(ours);
  const peerMedian = peer.length ? median(peer) : undefined;
  // Each of our runs against the peer's run right after it: less exposed to the host's drift.
  const paired = peer.length ? median(ours.map((ms, k) => ms / peer[k])) : undefined;
  const memory = `peak ${ourPeak.toFixed(0)} MB${missing ? '' : ` (peer ${peerPeak.toFixed(0)} MB)`}`;
  const figure: BenchFigure = {
    label: `holdfast solve ${describe(c)} T=${T} (whole process)`,
    medianMs: ourMedian,
    ...(peerMedian !== undefined
      ? { targetMs: Math.round(peerMedian / 2), peerMs: peerMedian, peerLabel: 'numpy + sklearn LedoitWolf + cvxopt' }
      : {}),
    notes: `solver ${median(solver).toFixed(0)} ms; ${memory}; ${notes}${
      missing ? `; ${missing}` : `; median of the ${ours.length} paired ratios ${paired!.toFixed(2)}`
    }`,
  };
  return { figure, ours: ourMedian, ...(peerMedian !== undefined ? { peer: peerMedian } : {}) };
}

/** The page's six candidates on a universe: three estimators, maximum diversification and minimum variance. */
function liveScenario(estimators: readonly string[], cap: number): Scenario {
  const objectives = ['max-diversification', 'min-variance'];
  const parsed = parseScenario({
    format: 'holdfast-scenario@1',
    name: 'Live recompute bench',
    baseCurrency: 'EUR',
    constraints: { longOnly: true, weightBounds: { default: [0, cap] } },
    candidates: estimators.flatMap((e) =>
      objectives.map((o) => ({ id: `${o}-${e}`, estimator: { method: e }, objective: { method: o } })),
    ),
  });
  if (!parsed.ok) throw new Error(parsed.errors[0].message);
  return parsed.scenario;
}

/** Issue 4's figure: runScenario on today's N = 100 universe, cold and warm-started. */
async function liveRecompute(): Promise<BenchFigure> {
  const prices = inventedPrices(100, 7);
  const scenario = liveScenario(['ledoit-wolf', 'oas', 'ewma'], 0.05);
  let statuses = '';
  const ms = await timeMedian(() => {
    const run = runScenario(scenario, prices);
    statuses = run.candidates.map((c) => c.status).join(',');
  }, 7);
  // The same with the previous run's active sets (what the editor passes between keystrokes).
  const first = runScenario(scenario, prices);
  const warm = await timeMedian(() => runScenario(scenario, prices, { warmStarts: first.warmStarts }), 7);
  return {
    label: 'live recompute: 6 candidates (3 estimators x 2 objectives) N=100 T=1260 in-process',
    medianMs: ms,
    targetMs: 150,
    notes: `warm-started ${warm.toFixed(1)} ms; statuses ${statuses}`,
  };
}

/**
 * Issue 20's figure: the scenario page's worker (buildComparison) on 6 candidates (sample,
 * ledoit-wolf and ewma, each with both objectives), long-only with a 5/N cap; cold (no cache)
 * and with the worker's cache of the previous run, alternating two cap edits.
 */
async function liveComparison(n: number, shape: UniverseShape, targetMs: number): Promise<BenchFigure> {
  const prices = inventedPrices(n, n + 7, shape);
  const cap = 5 / n;
  const scenario = liveScenario(['sample', 'ledoit-wolf', 'ewma'], cap);
  const edited = liveScenario(['sample', 'ledoit-wolf', 'ewma'], 0.95 * cap);
  let outcome = '';
  const cold = await timeMedian(() => {
    const c = buildComparison(scenario, prices);
    outcome = c.candidates
      .map(
        (r) => `${r.id} ${r.status}${r.status === 'optimal' ? ` ${r.solver.iterations} it` : `: ${r.message ?? ''}`}`,
      )
      .join(', ');
  }, 5);
  const cache = createComparisonCache();
  buildComparison(scenario, prices, undefined, undefined, cache);
  let flip = false;
  const cached = await timeMedian(() => {
    flip = !flip;
    return buildComparison(flip ? edited : scenario, prices, undefined, undefined, cache);
  }, 5);
  return {
    label: `live recompute (buildComparison, 6 candidates) N=${n} ${shape} cap ${Number((cap * 100).toFixed(2))}% T=${T} cold`,
    medianMs: cold,
    targetMs,
    notes: `with the worker's cache after a cap edit ${cached.toFixed(1)} ms; ${outcome}`,
  };
}

export const solveSuite: BenchSuite = {
  name: 'solve',
  async run() {
    const figures =
      process.env.BENCH_SOLVE_LIVE === '0'
        ? []
        : [
            await liveRecompute(),
            await liveComparison(100, 'few-held', 150),
            await liveComparison(100, 'most-held', 150),
            await liveComparison(300, 'few-held', 1000),
            await liveComparison(300, 'most-held', 1000),
          ];
    for (const f of figures) process.stderr.write(`  (done) ${formatFigure(f)}\n`);
    const limit = Number(process.env.BENCH_SOLVE_CASES) || Infinity;
    const sizes = (process.env.BENCH_SOLVE_SIZES ?? '500,1500,3000').split(',').filter(Boolean).map(Number);
    const missing = peerAvailable();
    const peerScript = join(mkdtempSync(join(tmpdir(), 'holdfast-bench-peer-')), 'peer.py');
    writeFileSync(peerScript, PEER_SCRIPT);
    // Per case (seed 1), the medians at each size, for the growth with N.
    const growth = new Map<string, { n: number; ours: number; peer?: number; figure: BenchFigure }[]>();
    for (const n of sizes)
      for (const seed of seedsFor(n))
        for (const c of casesFor(n, seed).slice(0, limit)) {
          const m = wholeProcess(c, peerScript, missing);
          process.stderr.write(`  (done) ${formatFigure(m.figure)}\n`);
          figures.push(m.figure);
          if (seed === seedsFor(n)[0]) {
            const points = growth.get(caseKey(c)) ?? [];
            points.push({ n, ours: m.ours, peer: m.peer, figure: m.figure });
            growth.set(caseKey(c), points);
          }
        }
    rmSync(dirname(peerScript), { recursive: true, force: true });
    for (const points of growth.values()) {
      if (points.length < 2) continue;
      const ours = growthExponent(points.map((p) => ({ n: p.n, ms: p.ours })));
      const peer = points.every((p) => p.peer !== undefined)
        ? growthExponent(points.map((p) => ({ n: p.n, ms: p.peer! })))
        : undefined;
      const last = points[points.length - 1].figure;
      last.notes += `; time grows as N^${ours.toFixed(2)} over N = ${points.map((p) => p.n).join(', ')}${
        peer !== undefined ? ` (script N^${peer.toFixed(2)})` : ''
      }`;
    }
    return figures;
  },
};
