import { CancelledError } from '../../../shared-core/stability/cancel.js';
import { DEFAULT_DRAWS } from '../../../shared-core/stability/weight-bands.js';
import { BACKTEST_CAUTIONS, backtestJsonText } from '../../../shared-core/walkforward/backtest-json.js';
import type { BacktestPhase, BacktestRun } from '../../../shared-core/walkforward/run-backtest.js';
import { walkForward, type WalkForwardOutcome } from '../../app/walk-forward.js';
import { EXIT, UsageError, type CliIO, type OptionValues } from '../command.js';
import { scenarioOptions } from '../scenario-options.js';
import { textTable } from '../text-table.js';
import { exitCodeOf } from './solve.js';
import { formatFixed, formatPct, PLAIN } from '../../../shared-core/present/format.js';

/**
 * `holdfast backtest`: every candidate of a scenario walked forward over a price file, with
 * metrics, the significance of differences, stress views and (on request) weight stability.
 * Progress goes to standard error; Ctrl-C stops between steps and nothing is printed on stdout.
 */
export async function runBacktestCommand(options: OptionValues, io: CliIO): Promise<number> {
  const draws = options.draws as number | undefined;
  if (draws !== undefined && (!Number.isInteger(draws) || draws < 2))
    throw new UsageError(`option '--draws' needs a whole number of at least 2, got '${draws}'`);
  if (draws !== undefined && !options.stability) throw new UsageError("option '--draws' needs --stability");
  const seed = options.seed as number | undefined;
  if (seed !== undefined && !Number.isInteger(seed))
    throw new UsageError(`option '--seed' needs a whole number, got '${seed}'`);

  const inputs = await scenarioOptions('backtest', options, io);
  const progress = progressPrinter(io, inputs.scenario.candidates.length);
  let outcome: WalkForwardOutcome;
  try {
    outcome = await walkForward(inputs, {
      onProgress: progress,
      signal: io.signal,
      ...(options.stability ? { stabilityDraws: draws ?? DEFAULT_DRAWS } : {}),
      ...(seed !== undefined ? { seed } : {}),
    });
  } catch (error) {
    if (error instanceof CancelledError) {
      io.stderr('holdfast backtest: interrupted; nothing written\n');
      return EXIT.interrupted;
    }
    throw error;
  }
  if (outcome.status === 'not-solved') {
    // As `solve` exits: 3 when a mandate cannot be met, 1 when a solve failed otherwise.
    for (const c of outcome.candidates)
      io.stderr(
        `holdfast backtest: ${c.id}: ${c.status}${'message' in c && c.message ? `: ${c.message}` : ''}; not walked forward\n`,
      );
    return exitCodeOf(outcome.candidates);
  }
  const run = outcome.run;
  for (const w of run.warnings) io.stderr(`holdfast backtest: warning: ${w}\n`);
  io.stdout(options.json ? backtestJsonText(run) + '\n' : report(run));
  return EXIT.ok;
}

/** One stderr line per candidate and phase at each quarter of the way. */
function progressPrinter(io: CliIO, candidates: number) {
  const shown = new Map<string, number>();
  const order: string[] = [];
  return (phase: BacktestPhase, id: string, done: number, total: number): void => {
    if (phase === 'comparison') return;
    if (!order.includes(id)) order.push(id);
    const key = `${phase}:${id}`;
    const quarter = total > 0 ? Math.floor((4 * done) / total) : 4;
    if ((shown.get(key) ?? -1) >= quarter) return;
    shown.set(key, quarter);
    io.stderr(`holdfast backtest: ${id} (${order.indexOf(id) + 1}/${candidates}) ${phase} ${quarter * 25}%\n`);
  };
}

// The memo's and the screens' formatter (present/format.ts), so a figure reads the same everywhere.
const pct = (v: number | null | undefined, digits = 1): string =>
  v === null || v === undefined || !Number.isFinite(v) ? 'n/a' : formatPct(v, PLAIN, digits);
const num = (v: number | null | undefined, digits = 2): string =>
  v === null || v === undefined || !Number.isFinite(v) ? 'n/a' : formatFixed(v, digits);

function report(run: BacktestRun): string {
  const s = run.settings;
  const lines = [
    `Walk-forward ${s.startDate} to ${s.endDate}: ${s.rebalance} rebalancing${s.rebalance === 'drift' ? ` (band ${pct(s.driftBand)})` : ''}, ` +
      `${s.expanding ? 'expanding' : `trailing ${s.estimationWindow}-period`} estimation window, cash rate ${pct(s.cashRate, 2)}`,
    '',
    ...textTable(
      [
        'candidate',
        'return',
        'volatility',
        'Sharpe',
        'max drawdown',
        'DR',
        'turnover/yr',
        'costs',
        'vol ratio (p10-p90)',
      ],
      run.candidates.map((c) => {
        const m = c.metrics;
        const ratio = m.volatilityRatio;
        return [
          c.id,
          pct(m.annualisedReturn),
          pct(m.volatility),
          num(m.sharpeRatio),
          `${pct(m.maxDrawdown.depth)} ${m.maxDrawdown.peakDate}..${m.maxDrawdown.troughDate}`,
          num(m.averageRealisedDiversificationRatio),
          pct(m.turnoverPerYear, 0),
          pct(m.costsPaid, 2),
          ratio ? `${num(ratio.mean)} (${num(ratio.p10)}-${num(ratio.p90)})` : 'n/a',
        ];
      }),
    ),
  ];
  const failed = run.candidates.filter((c) => c.metrics.failedRebalances > 0);
  for (const c of failed)
    lines.push(
      `${c.id}: ${c.metrics.failedRebalances} rebalance(s) could not be solved; the drifted weights were kept`,
    );
  if (run.comparisons.length) {
    const c0 = run.comparisons[0];
    lines.push(
      '',
      `Differences from ${run.reference} (${Math.round(c0.level * 100)}% interval, ${c0.method}, ${c0.draws} draws):`,
    );
    lines.push(
      ...textTable(
        ['candidate', 'Sharpe diff', 'interval', 'p', 'p (HAC)', 'vol diff', 'interval'],
        run.comparisons.map((c) => [
          c.a,
          num(c.sharpeRatio.difference),
          `${num(c.sharpeRatio.lower)}..${num(c.sharpeRatio.upper)}`,
          num(c.sharpeRatio.pValue, 3),
          c.hacTest ? num(c.hacTest.pValue, 3) : '-',
          pct(c.volatility.difference, 2),
          `${pct(c.volatility.lower, 2)}..${pct(c.volatility.upper, 2)}`,
        ]),
      ),
    );
    lines.push(`p (HAC): ${run.comparisons.find((c) => c.hacTest)?.hacTest?.method ?? 'not available'}.`);
  }
  const ids = run.candidates.filter((c) => c.today.status === 'optimal').map((c) => c.id);
  if (run.stress.historical.length || run.stress.shocks.length) {
    lines.push('', "Stress views on today's weights:");
    lines.push(
      ...textTable(
        ['view', 'window', ...ids],
        [
          ...run.stress.historical.map((h) => [
            h.name,
            `${h.from}..${h.to}`,
            ...ids.map((id) => pct(h.portfolioReturns[id])),
          ]),
          ...run.stress.shocks.map((k) => [
            `${k.name} (${k.target} ${pct(k.shock, 0)})`,
            'shock',
            ...ids.map((id) => pct(k.byCandidate[id]?.portfolioReturn)),
          ]),
        ],
      ),
    );
  }
  for (const c of run.candidates)
    if (c.stability) {
      lines.push(
        '',
        `Weight stability of ${c.id} (${c.stability.method}, ${c.stability.draws} draws, seed ${c.stability.seed}):`,
      );
      lines.push(
        ...textTable(
          ['asset', 'today', '5%', 'median', '95%'],
          run.assets.map((a, i) => [
            a,
            pct(c.today.weights[i]),
            pct(c.stability!.weights[a].p5),
            pct(c.stability!.weights[a].median),
            pct(c.stability!.weights[a].p95),
          ]),
        ),
        `DR ${num(c.stability.diversificationRatio.p5)}..${num(c.stability.diversificationRatio.p95)}, volatility ${pct(c.stability.volatility.p5)}..${pct(c.stability.volatility.p95)}, average turnover between draws ${pct(c.stability.averageTurnoverBetweenDraws)}`,
      );
    }
  lines.push('', BACKTEST_CAUTIONS);
  return lines.join('\n') + '\n';
}
