import { isSolved, type CandidateResult } from '../../../shared-core/optimise/result.js';
import { formatFixed, formatPct } from '../../../shared-core/present/format.js';
import type { ScenarioRun } from '../../../shared-core/run/run-scenario.js';
import { CancelledError } from '../../../shared-core/stability/cancel.js';
import { runScenarioInputs } from '../../app/run-scenario.js';
import type { ScenarioInputs } from '../../app/scenario-inputs.js';
import { EXIT, type CliIO, type OptionValues } from '../command.js';
import { scenarioOptions } from '../scenario-options.js';

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

// The memo's and the screens' formatter (present/format.ts), so a weight reads the same everywhere.
const pct = (v: number) => formatPct(v).padStart(7);

export function solveTable(run: ScenarioRun): string {
  const lines: string[] = [];
  for (const c of run.candidates) {
    lines.push(
      `${c.id}${c.label ? ` (${c.label})` : ''}: ${c.status}${c.status !== 'optimal' ? ` - ${c.message}` : ''}`,
    );
    if (isSolved(c)) {
      const m = c.metrics;
      lines.push(
        `  volatility ${pct(m.volatility).trim()}, diversification ratio ${formatFixed(m.diversificationRatio, 3)}, effective bets ${formatFixed(m.effectiveBets, 2)}, effective holdings ${formatFixed(m.effectiveHoldings, 2)}, turnover ${pct(m.turnover).trim()}`,
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

export async function runSolve(inputs: ScenarioInputs, options: OptionValues, io: CliIO): Promise<number> {
  let run: ScenarioRun;
  try {
    run = runScenarioInputs(inputs, { signal: io.signal });
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
  return runSolve(await scenarioOptions('solve', options, io), options, io);
}
