import { resolve } from 'node:path';
import { DEFAULT_DEMO_SEED } from '../../../shared-core/demo/index.js';
import { UsageError, EXIT, type Command } from '../command.js';
import { writeDemoFiles } from '../../demo/write-demo-files.js';

/** `holdfast demo --out DIR`: the invented demonstration household and prices as files. */
export const demoCommand: Command = {
  name: 'demo',
  summary: 'write the invented demonstration household, prices, FX and scenario to a folder',
  options: [
    { name: 'out', kind: 'string', valueName: 'DIR', required: true, description: 'folder to write the files into' },
    {
      name: 'seed',
      kind: 'number',
      valueName: 'N',
      description: `seed of the price model (default ${DEFAULT_DEMO_SEED}); same seed, same bytes`,
    },
  ],
  details:
    'Everything written is invented demonstration data: the household, the funds, the company and the prices\n' +
    'come from a seeded model, not from any market. Files: demo-prices.csv (wide: date, then one column per\n' +
    'asset id), demo-fx.csv (column USD: euro per US dollar), demo-scenario.json (holdfast-scenario@1),\n' +
    'demo-household.json (holdings in currency amounts, asset tags), README-DEMO.txt.',
  async run(options, io) {
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
  },
};
