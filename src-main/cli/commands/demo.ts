import { resolve } from 'node:path';
import { UsageError, EXIT, type CliIO, type OptionValues } from '../command.js';
import { writeDemoFiles } from '../../demo/write-demo-files.js';

/** `holdfast demo --out DIR`: the invented demonstration household and prices as files. */
export async function runDemo(options: OptionValues, io: CliIO): Promise<number> {
  const seed = options.seed as number | undefined;
  if (seed !== undefined && !Number.isSafeInteger(seed))
    throw new UsageError(`option '--seed' needs a whole number, got '${seed}'`);
  const out = resolve(io.cwd, options.out as string);
  const written = writeDemoFiles(out, { seed });
  for (const f of written.files) io.stdout(`${f.path} (${f.bytes} bytes)\n`);
  io.stdout(
    `invented demonstration data, seed ${written.data.seed}: ${written.data.assets.length} assets, ` +
      `${written.data.prices.dates.length} dates ${written.data.prices.dates[0]} to ${written.data.prices.dates.at(-1)}\n`,
  );
  return EXIT.ok;
}
