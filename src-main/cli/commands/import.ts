import { existsSync, statSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../../shared-core/errors.js';
import { importPriceFile, type PriceImportOutcome } from '../../io/import-prices.js';
import { problemLines, warningLines, type ValidationReport } from '../../io/validate-prices.js';
import type { ImportPlan } from '../../io/plan-import.js';
import { CancelledError, type Store } from '../../store/store.js';
import { EXIT, UsageError, type CliIO, type OptionValues } from '../command.js';
import { storeAt } from './store-access.js';

const SHOWN = 40;

/** `holdfast import`: a price file into the store, validated first, changes only on --apply. */
export async function runImport(options: OptionValues, io: CliIO): Promise<number> {
  const currency = options.currency as string | undefined;
  if (currency !== undefined && !/^[A-Z]{3}$/.test(currency))
    throw new UsageError(`option '--currency' needs an ISO 4217 code such as EUR, got '${currency}'`);
  const pricesName = options.prices as string;
  const pricesPath = resolve(io.cwd, pricesName);
  if (!existsSync(pricesPath)) throw new InputError('no such file', { file: pricesName });
  if (statSync(pricesPath).isDirectory()) throw new InputError('is a directory', { file: pricesName });
  const storeName = options.store as string;
  let opened: Store | undefined;
  const store = (mode: 'read' | 'write') => (opened ??= storeAt(io.cwd, storeName, { create: mode === 'write' }));
  let outcome: PriceImportOutcome;
  try {
    outcome = await importPriceFile(store, pricesPath, {
      file: pricesName,
      universe: options.universe as string,
      apply: options.apply === true,
      dateOrder: options['date-order'] as 'day-first' | 'month-first' | undefined,
      decimal: options.decimal as 'point' | 'comma' | undefined,
      currency,
      signal: io.signal,
    });
  } catch (error) {
    if (error instanceof CancelledError) {
      io.stderr(`holdfast import: ${error.message}\n`);
      return EXIT.interrupted;
    }
    if (error instanceof InputError && error.location.file === undefined) throw error.inFile(pricesName);
    throw error;
  } finally {
    opened?.close();
  }
  if (options.json) io.stdout(JSON.stringify(outcome) + '\n');
  else printOutcome(outcome, storeName, io);
  if (outcome.status === 'invalid') return EXIT.badInput;
  return outcome.status === 'needs-confirmation' ? EXIT.failure : EXIT.ok;
}

function printOutcome(outcome: PriceImportOutcome, storeName: string, io: CliIO): void {
  const r = outcome.report;
  const out = outcome.status === 'invalid' ? io.stderr : io.stdout;
  out(describeFile(r));
  if (outcome.status === 'invalid') {
    for (const line of problemLines(r)) io.stderr(`  ${line}\n`);
    io.stderr('nothing was written\n');
    return;
  }
  for (const w of warningLines(r)) io.stdout(`  warning: ${w}\n`);
  io.stdout(describePlan(outcome.plan));
  if (outcome.status === 'needs-confirmation') {
    io.stderr(
      `holdfast import: ${outcome.plan.changedPoints} stored prices would change; nothing was written. ` +
        'Run again with --apply to replace them.\n',
    );
    return;
  }
  if (outcome.status === 'unchanged') {
    io.stdout(`nothing new: ${storeName} holds every price of the file already\n`);
    return;
  }
  const b = outcome.batch;
  io.stdout(
    `written to ${storeName} as import batch ${b.id}: ${b.added} prices added, ${b.replaced} replaced, ` +
      `${b.assets} assets in universe '${outcome.plan.universe}'\n`,
  );
}

function describeFile(r: ValidationReport): string {
  const order = r.dateOrder === 'iso' ? 'ISO dates' : `${r.dateOrder} dates`;
  return `${r.file}: ${r.form} form, ${r.delimiter}-separated, decimal ${r.decimal}, ${order}; ${r.dataRows} rows, ${r.assets.length} assets\n`;
}

function describePlan(p: ImportPlan): string {
  const lines = [
    `plan: ${p.newAssets} new assets, ${p.newPoints} new prices, ${p.changedPoints} changed, ${p.unchangedPoints} unchanged`,
  ];
  const changed = p.assets.filter((a) => a.changedCount > 0);
  for (const a of changed.slice(0, SHOWN)) {
    const shown = a.changed
      .slice(0, 5)
      .map((c) => `${c.date}: ${c.stored} -> ${c.incoming}`)
      .join(', ');
    lines.push(`  ${a.asset}: ${a.changedCount} changed (${shown}${a.changedCount > 5 ? ', ...' : ''})`);
  }
  if (changed.length > SHOWN) lines.push(`  ... and ${changed.length - SHOWN} more assets with changes`);
  return lines.join('\n') + '\n';
}
