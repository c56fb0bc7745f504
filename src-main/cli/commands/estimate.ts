import { correlationMatrix, assetVolatilities } from '../../../shared-core/analytics/risk.js';
import { InputError, type InputLocation } from '../../../shared-core/errors.js';
import { annualised, estimateCovariance } from '../../../shared-core/estimators/registry.js';
import type { CovarianceEstimate } from '../../../shared-core/estimators/types.js';
import type { Frequency } from '../../../shared-core/scenario/frequency.js';
import { toRows } from '../../../shared-core/linalg/matrix.js';
import { buildReturns, type ReturnMethod, type ReturnsResult } from '../../../shared-core/returns/build-returns.js';
import { estimatorSpecSchema, type EstimatorSpec } from '../../../shared-core/scenario/estimator-spec.js';
import { isIsoDate } from '../../../shared-core/scenario/iso-date.js';
import { readNamedPriceTable, type PriceTableFile } from '../../io/read-price-table.js';
import { EXIT, UsageError, type CliIO, type OptionValues } from '../command.js';

/**
 * `holdfast estimate`: the covariance of a price file's returns by one estimator, annualised,
 * with its diagnostics; one JSON object with --json, a readable table otherwise. Everything is
 * computed before anything is written, so bad input leaves standard output empty.
 */
export async function runEstimate(options: OptionValues, io: CliIO): Promise<number> {
  const spec = estimatorSpec(options);
  const frequency = (options.frequency as Frequency | undefined) ?? 'daily';
  const method = (options.returns as ReturnMethod | undefined) ?? 'log';
  for (const key of ['from', 'to'] as const) {
    const value = options[key];
    if (value !== undefined && !isIsoDate(String(value)))
      throw new UsageError(`--${key} needs a date YYYY-MM-DD, got '${value}'`);
  }
  const periodsPerYear = options['periods-per-year'] as number | undefined;
  if (periodsPerYear !== undefined && !(periodsPerYear > 0))
    throw new UsageError(`--periods-per-year must be positive, got ${periodsPerYear}`);
  const maxFillDays = options['max-fill-days'] as number | undefined;
  if (maxFillDays !== undefined && !(Number.isInteger(maxFillDays) && maxFillDays >= 0))
    throw new UsageError(`--max-fill-days must be a whole number of days, got ${maxFillDays}`);

  const desmoothed = options.desmooth === undefined ? undefined : String(options.desmooth).split(',');
  if (desmoothed?.some((id) => id === '')) throw new UsageError(`--desmooth needs asset ids separated by commas`);

  const file = readNamedPriceTable(io.cwd, String(options.prices), (w) =>
    io.stderr(`holdfast estimate: warning: ${w}\n`),
  );
  const inFile = (error: unknown) => (error instanceof InputError ? error.inFile(file.path) : error);
  const table = file.table;
  for (const id of desmoothed ?? [])
    if (!table.assets.includes(id)) throw new UsageError(`--desmooth: no asset '${id}' in ${file.path}`);
  const locate = file.locate;
  let returns: ReturnsResult;
  let estimate: CovarianceEstimate;
  try {
    returns = buildReturns(table, {
      from: options.from as string | undefined,
      to: options.to as string | undefined,
      frequency,
      method,
      maxFillDays,
      locate,
      desmooth: desmoothed,
    });
    estimate = estimateCovariance(returns.returns, spec, { frequency: returns.frequency, periodsPerYear });
  } catch (error) {
    if (error instanceof InputError && error.location.line === undefined)
      throw new InputError(error.message, { ...pointAtAsset(error.location, table.assets, locate), file: file.path });
    throw inFile(error);
  }
  if (io.signal.aborted) return EXIT.interrupted;

  const covariance = annualised(estimate);
  const window = { from: returns.dates[0], to: returns.dates[returns.dates.length - 1] };
  const text = options.json
    ? JSON.stringify({
        assets: returns.assets,
        periodsPerYear: estimate.periodsPerYear,
        observations: estimate.diagnostics.observations,
        covariance: toRows(covariance),
        shrinkage: estimate.diagnostics.shrinkage,
        diagnostics: {
          ...jsonSafe(estimate.diagnostics),
          method: spec.method,
          ...(spec.method === 'ledoit-wolf' ? { target: spec.target ?? 'scaled-identity' } : {}),
          frequency: returns.frequency,
          returns: method,
          window,
          coverage: returns.coverage,
          ...(returns.desmoothing.length > 0 ? { desmoothing: returns.desmoothing } : {}),
          warnings: returns.warnings,
        },
      }) + '\n'
    : readableTable(returns, estimate, spec, window);
  for (const warning of returns.warnings) io.stderr(`holdfast estimate: warning: ${warning}\n`);
  io.stdout(text);
  return EXIT.ok;
}

function estimatorSpec(options: OptionValues): EstimatorSpec {
  const method = (options.method as string | undefined) ?? 'ledoit-wolf';
  if (options.target !== undefined && method !== 'ledoit-wolf')
    throw new UsageError(`--target applies to --method ledoit-wolf, not ${method}`);
  for (const flag of ['lambda', 'half-life'])
    if (options[flag] !== undefined && method !== 'ewma')
      throw new UsageError(`--${flag} applies to --method ewma, not ${method}`);
  const raw: Record<string, unknown> = { method };
  if (options.target !== undefined) raw.target = options.target;
  if (options.lambda !== undefined) raw.lambda = options.lambda;
  if (options['half-life'] !== undefined) raw.halfLife = options['half-life'];
  const parsed = estimatorSpecSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const key = String(issue.path[0] ?? '');
    const flag = key === 'halfLife' ? '--half-life' : key === 'lambda' ? '--lambda' : '';
    if (key === 'lambda') throw new UsageError(`--lambda must lie strictly between 0 and 1, got ${options.lambda}`);
    if (key === 'halfLife') throw new UsageError(`--half-life must be positive, got ${options['half-life']}`);
    throw new UsageError(
      `${flag ? `${flag}: ` : ''}${issue.message === 'give lambda or halfLife, not both' ? 'give --lambda or --half-life, not both' : issue.message}`,
    );
  }
  return parsed.data;
}

/** An estimator's `returns[*][i]` path points at asset i's column of the price file. */
function pointAtAsset(
  location: InputLocation,
  assets: readonly string[],
  locate: PriceTableFile['locate'],
): InputLocation {
  const m = /^returns\[\*\]\[(\d+)\]$/.exec(location.path ?? '');
  if (m) return locate(assets[Number(m[1])]);
  return { line: 1, column: 1 };
}

/** JSON has no Infinity: a singular estimate's condition number prints as null. */
function jsonSafe(diagnostics: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(diagnostics))
    out[key] = typeof value === 'number' && !Number.isFinite(value) ? null : value;
  return out;
}

function readableTable(
  returns: ReturnsResult,
  estimate: CovarianceEstimate,
  spec: EstimatorSpec,
  window: { from: string; to: string },
): string {
  const covariance = annualised(estimate);
  const vols = assetVolatilities(covariance);
  const corr = correlationMatrix(covariance);
  const d = estimate.diagnostics;
  const name = spec.method === 'ledoit-wolf' ? `ledoit-wolf (${spec.target ?? 'scaled-identity'})` : spec.method;
  const lines = [
    `Covariance by ${name}, ${returns.frequency} ${returns.method} returns ${window.from} to ${window.to}, annualised x ${estimate.periodsPerYear}`,
    `Observations ${d.observations}` +
      (d.effectiveObservations !== d.observations ? ` (effective ${d.effectiveObservations.toFixed(1)})` : '') +
      (d.shrinkage !== null ? `, shrinkage intensity ${d.shrinkage.toFixed(4)}` : '') +
      `, condition number ${Number.isFinite(d.conditionNumber) ? d.conditionNumber.toPrecision(4) : 'infinite (singular)'}` +
      (d.eigenvaluesClipped !== undefined ? `, eigenvalues clipped ${d.eigenvaluesClipped}` : ''),
    '',
  ];
  const ids = returns.assets;
  const width = Math.max(5, ...ids.map((id) => id.length));
  lines.push(
    ['asset'.padEnd(width), 'vol %/yr'.padStart(9), ...ids.map((id) => id.padStart(Math.max(6, id.length)))].join('  '),
  );
  ids.forEach((id, i) => {
    const cells = ids.map((other, j) => corr.data[i * ids.length + j].toFixed(2).padStart(Math.max(6, other.length)));
    lines.push([id.padEnd(width), (100 * vols[i]).toFixed(2).padStart(9), ...cells].join('  '));
  });
  lines.push(
    '',
    'Correlations to the right of the volatilities. Estimates come from past data; past performance does not',
    'guarantee future results. Not advice until a licensed adviser reviews it under the local rules.',
  );
  return lines.join('\n') + '\n';
}
