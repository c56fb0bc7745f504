import { InputError, formatInputError } from '../../../shared-core/errors.js';
import { isSolved, type CandidateResult } from '../../../shared-core/optimise/result.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { runScenario, type ScenarioRun } from '../../../shared-core/run/run-scenario.js';
import { parseScenarioText, type Scenario } from '../../../shared-core/scenario/schema.js';
import { CancelledError } from '../../../shared-core/stability/cancel.js';
import { EXIT, UsageError, type CliIO, type OptionValues } from '../command.js';
import { readInputFile, readPriceFile, withExchangeRates } from '../files.js';
import type { PriceTableFile } from '../../io/read-price-table.js';

/** What `solve` needs, however it was obtained (files now; the store form reads the same shape). */
export interface SolveInputs {
  scenario: Scenario;
  prices: PriceTable;
  /** Where the prices came from, for error messages. */
  pricesName: string;
  scenarioName: string;
  /** Prices read from the store: no file line or column to point at. */
  fromStore?: boolean;
  /** Exchange rates into the base currency for assets priced in another currency. */
  fx?: PriceTable;
  /** The price file's cell of an asset's price on a date (the file form). */
  locate?: PriceTableFile['locate'];
}

/** The file form: `--prices FILE.csv --scenario FILE.json`. Throws InputError naming the file. */
export function readSolveFiles(io: CliIO, pricesPath: string, scenarioPath: string, fxPath?: string): SolveInputs {
  const scenarioFile = readInputFile(io.cwd, scenarioPath);
  const parsed = parseScenarioText(scenarioFile.text);
  if (!parsed.ok) {
    // Every error is reported; the first one is thrown with the file name attached.
    const [first, ...rest] = parsed.errors.map((e) => e.inFile(scenarioFile.path));
    for (const e of rest) io.stderr(`holdfast solve: ${formatInputError(e)}\n`);
    throw first;
  }
  const warn = (w: string) => io.stderr(`holdfast solve: warning: ${w}\n`);
  const pricesFile = readPriceFile(io.cwd, pricesPath, warn);
  const prices = pricesFile.table;
  const names = { pricesName: pricesFile.path, scenarioName: scenarioFile.path, locate: pricesFile.locate };
  if (fxPath === undefined) return { scenario: parsed.scenario, prices, ...names };
  const rated = withExchangeRates(io.cwd, prices, parsed.scenario, fxPath, warn);
  return { scenario: parsed.scenario, prices: rated.prices, fx: rated.fx, ...names };
}

/** Runs the scenario; errors in the returns stage name the price file's line and column. */
export function solveInputs(inputs: SolveInputs, signal?: AbortSignal): ScenarioRun {
  try {
    return runScenario(inputs.scenario, inputs.prices, {
      locate: inputs.fromStore ? undefined : inputs.locate,
      ...(inputs.fx ? { fx: inputs.fx } : {}),
      shouldCancel: signal ? () => signal.aborted : undefined,
    });
  } catch (error) {
    if (error instanceof InputError) {
      // A JSON path points into the scenario; a line or column into the prices.
      const file = error.location.path !== undefined ? inputs.scenarioName : inputs.pricesName;
      throw error.inFile(file);
    }
    throw error;
  }
}

/** 0 when every candidate is optimal, 3 when any is infeasible, 1 when one failed otherwise. */
export function exitCodeOf(candidates: readonly CandidateResult[]): number {
  if (candidates.some((c) => c.status === 'infeasible')) return EXIT.infeasible;
  if (candidates.every((c) => c.status === 'optimal')) return EXIT.ok;
  return EXIT.failure;
}

/** The `--json` document: the issue's keys, then the explanations; a candidate without weights prints `{}` and `null`. */
export function solveJson(run: ScenarioRun): string {
  const candidates = run.candidates.map((c) => ({
    id: c.id,
    ...(c.label !== undefined ? { label: c.label } : {}),
    status: c.status,
    ...(c.status !== 'optimal' ? { message: c.message } : {}),
    weights: isSolved(c) ? c.weights : {},
    metrics: isSolved(c) ? c.metrics : null,
    solver: { iterations: c.solver.iterations, kktResidual: c.solver.kktResidual, ms: c.solver.ms },
    ...(isSolved(c) && c.explanations ? { explanations: c.explanations } : {}),
  }));
  return (
    JSON.stringify({ candidates }, (_, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v)) + '\n'
  );
}

const pct = (v: number) => `${(v * 100).toFixed(1)}%`.padStart(7);

export function solveTable(run: ScenarioRun): string {
  const lines: string[] = [];
  for (const c of run.candidates) {
    lines.push(
      `${c.id}${c.label ? ` (${c.label})` : ''}: ${c.status}${c.status !== 'optimal' ? ` - ${c.message}` : ''}`,
    );
    if (isSolved(c)) {
      const m = c.metrics;
      lines.push(
        `  volatility ${pct(m.volatility).trim()}, diversification ratio ${m.diversificationRatio.toFixed(3)}, effective bets ${m.effectiveBets.toFixed(2)}, effective holdings ${m.effectiveHoldings.toFixed(2)}, turnover ${pct(m.turnover).trim()}`,
      );
      for (const a of c.explanations?.assets ?? [])
        if (Math.abs(a.weight) > 5e-4) lines.push(`  ${a.asset.padEnd(14)}${pct(a.weight)}  ${a.text}`);
      for (const b of c.explanations?.binding ?? []) lines.push(`  binding: ${b.text}`);
      for (const f of c.explanations?.flags ?? []) lines.push(`  note: ${f}`);
    }
    lines.push('');
  }
  lines.push('Estimates come from past data; past performance does not guarantee future results.');
  lines.push('Decision support only: not advice until a licensed adviser reviews it under the local rules.');
  return lines.join('\n') + '\n';
}

export async function runSolve(inputs: SolveInputs, options: OptionValues, io: CliIO): Promise<number> {
  let run: ScenarioRun;
  try {
    run = solveInputs(inputs, io.signal);
  } catch (error) {
    if (error instanceof CancelledError) {
      io.stderr('holdfast solve: interrupted; nothing written\n');
      return EXIT.interrupted;
    }
    throw error;
  }
  io.stdout(options.json ? solveJson(run) : solveTable(run));
  return exitCodeOf(run.candidates);
}

/**
 * `holdfast solve`: every candidate of a scenario on a price file. Everything is computed before
 * anything is written, so bad input leaves standard output empty.
 */
export async function runSolveCommand(options: OptionValues, io: CliIO): Promise<number> {
  if (
    (options.store === undefined) !== (options.household === undefined) ||
    (options.store !== undefined) === (options.prices !== undefined)
  )
    throw new UsageError("'solve' needs --prices FILE.csv, or --store FILE with --household NAME");
  if (options.fx !== undefined && options.store !== undefined)
    throw new UsageError('--fx is for the file form: the store form reads the stored exchange rates');
  let inputs: SolveInputs;
  if (options.store !== undefined) {
    // Loaded here so that the file form starts without the store and SQLite.
    const { readSolveStore } = await import('./solve-from-store.js');
    inputs = readSolveStore(io.cwd, options.store as string, options.household as string, options.scenario as string);
  } else
    inputs = readSolveFiles(io, options.prices as string, options.scenario as string, options.fx as string | undefined);
  return runSolve(inputs, options, io);
}
