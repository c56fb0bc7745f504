import { demoFiles, generateDemo } from '../shared-core/demo/index.js';
import { timeMedian, type BenchSuite } from './harness.js';

/** The invented demonstration data: generation and serialisation (target: well under a second). */
export const demoDataSuite: BenchSuite = {
  name: 'demo-data',
  async run() {
    const generate = await timeMedian(() => generateDemo(), 7);
    const files = await timeMedian(() => demoFiles(generateDemo()), 7);
    const d = generateDemo();
    return [
      {
        label: `generate demo data (${d.assets.length} assets x ${d.prices.dates.length} days)`,
        medianMs: generate,
        targetMs: 1000,
      },
      { label: 'generate and serialise the demo files', medianMs: files, targetMs: 1000 },
    ];
  },
};
