import { formatFigure, type BenchSuite } from './harness.js';
import { demoDataSuite } from './demo-data.js';
import { webHostSuite } from './web-host.js';
import { firstScreenSuite } from './first-screen.js';
import { storeSuite } from './store.js';
import { memoBench } from './memo.js';
import { estimatorsSuite } from './estimators.js';
import { backtestSuite } from './backtest.js';
import { scenarioRecomputeSuite } from './scenario-recompute.js';
import { solveSuite } from './solve.js';
import { reviewSuite } from './review.js';
import { bookScreenSuite } from './book-screen.js';

/** Every benchmark suite; a suite is one module in bench/ plus one line here. */
const suites: BenchSuite[] = [
  demoDataSuite,
  webHostSuite,
  firstScreenSuite,
  storeSuite,
  memoBench,
  estimatorsSuite,
  backtestSuite,
  scenarioRecomputeSuite,
  solveSuite,
  reviewSuite,
  bookScreenSuite,
];

const only = process.argv.slice(2);
for (const suite of suites) {
  if (only.length > 0 && !only.includes(suite.name)) continue;
  console.log(`\n== ${suite.name}`);
  for (const figure of await suite.run()) console.log(`  ${formatFigure(figure)}`);
}
