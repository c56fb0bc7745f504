import { estimatorMethods } from '../../../shared-core/methods/estimator-registry.js';
import { shrinkageTargets } from '../../../shared-core/methods/estimators/ledoit-wolf.js';
import type { Command, OptionSpec } from '../command.js';

/*
 * The command table: every command's name, summary, options and help, with no implementation
 * loaded. `holdfast --help`, `holdfast COMMAND --help` and bad options (exit 2) are answered from
 * it alone; a command's module (and so the store, the schemas or the PDF writer it uses) is
 * imported only when that command runs.
 *
 * The methods come from their definitions (shared-core/methods/), which import nothing at run
 * time. The values below come from modules that load far more than their value (zod schemas, the demo
 * generator, the household file). They are written out here and checked equal to their source
 * by test/unit/cli/command-table.test.ts.
 */

/** `DEFAULT_DEMO_SEED` of shared-core/demo/generate.ts. */
export const DEFAULT_DEMO_SEED = 2;
/** `DEFAULT_DRAWS` of shared-core/stability/weight-bands.ts. */
export const DEFAULT_DRAWS = 200;
/** `HOUSEHOLD_FILE_FORMAT` of src-main/io/household-file.ts. */
export const HOUSEHOLD_FILE_FORMAT = 'holdfast-household@1';

/**
 * The `--fx FILE.csv` option of the file forms: exchange rates, one column per currency, the
 * price of one unit in the scenario's base currency. Each asset's own currency comes from the
 * scenario's `assetInfo` (a wide price file has no place for it).
 */
const fxOption: OptionSpec = {
  name: 'fx',
  kind: 'string',
  valueName: 'FILE.csv',
  description: "exchange rates, one column per currency, in the base currency (assets' currencies from assetInfo)",
};

const demoCommand: Command = {
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
  load: () => import('./demo.js').then((m) => m.runDemo),
};

const importCommand: Command = {
  name: 'import',
  summary: 'import a price file (wide or long CSV) into the store and a universe',
  options: [
    { name: 'store', kind: 'string', valueName: 'FILE', required: true, description: 'the store (created if absent)' },
    { name: 'prices', kind: 'string', valueName: 'FILE.csv', required: true, description: 'the price file' },
    { name: 'universe', kind: 'string', valueName: 'NAME', required: true, description: 'universe the assets join' },
    { name: 'apply', kind: 'boolean', description: 'confirm replacing stored prices that the file changes' },
    { name: 'json', kind: 'boolean', description: 'print one JSON object: status, validation report, plan, batch' },
    {
      name: 'date-order',
      kind: 'string',
      choices: ['day-first', 'month-first'],
      description: 'how to read dates such as 03/04/2025 when the file does not show it',
    },
    {
      name: 'decimal',
      kind: 'string',
      choices: ['point', 'comma'],
      description: 'decimal mark, if not detected right',
    },
    {
      name: 'currency',
      kind: 'string',
      valueName: 'CODE',
      description: 'currency of assets new to the store (ISO 4217)',
    },
  ],
  details:
    'Wide form: a header "date" then one column per asset id. Long form: the columns date, asset, close.\n' +
    'Separators comma, semicolon or tab; decimal point or comma; dates YYYY-MM-DD, DD/MM/YYYY or MM/DD/YYYY.\n' +
    'Exit 0 when written (or nothing new), 2 on invalid input with the validation report (nothing written),\n' +
    '1 when stored prices would change: the difference is shown and nothing is written until --apply.',
  load: () => import('./import.js').then((m) => m.runImport),
};

const backupCommand: Command = {
  name: 'backup',
  summary: 'copy the store to one backup file (safe while the app has it open)',
  options: [
    { name: 'store', kind: 'string', valueName: 'FILE', required: true, description: 'the store to copy' },
    { name: 'out', kind: 'string', valueName: 'FILE', required: true, description: 'the backup file (must not exist)' },
  ],
  load: () => import('./backup.js').then((m) => m.runBackup),
};

const restoreCommand: Command = {
  name: 'restore',
  summary: 'restore the store from a backup file after checking it',
  options: [
    { name: 'from', kind: 'string', valueName: 'FILE', required: true, description: 'the backup file' },
    { name: 'store', kind: 'string', valueName: 'FILE', required: true, description: 'the store to restore into' },
  ],
  details:
    'The backup is verified first (its structure, and every price series, scenario revision and memo against\n' +
    'its checksum); a damaged backup is refused, naming what is damaged, and the store is left as it was.\n' +
    'A store already at --store is not deleted: it is kept as <store>.replaced-<time> beside it.',
  load: () => import('./restore.js').then((m) => m.runRestore),
};

const checkCommand: Command = {
  name: 'check',
  summary: 'verify a store or backup file: its structure and every checksum',
  options: [
    { name: 'store', kind: 'string', valueName: 'FILE', required: true, description: 'the store or backup to verify' },
    { name: 'json', kind: 'boolean', description: 'print the verdict as one JSON object' },
  ],
  details:
    'Reads the file only. Exit 0 when it is sound, 1 when something is damaged (each damaged series,\n' +
    'revision or memo is named), 2 when the file is missing or not a Holdfast store.',
  load: () => import('./check.js').then((m) => m.runCheck),
};

const reviewCommand: Command = {
  name: 'review',
  summary: 'the book review: every household against its recommendation, on the latest prices',
  options: [
    { name: 'store', kind: 'string', valueName: 'FILE', required: true, description: 'the store' },
    { name: 'json', kind: 'boolean', description: 'print the rows as JSON' },
    { name: 'csv', kind: 'string', valueName: 'FILE', description: 'also write the table as CSV' },
    {
      name: 'resolve',
      kind: 'boolean',
      description: 're-solve each recommendation on the latest prices and report how far the optimum moved',
    },
  ],
  details:
    'For each household: the scenario and revision it follows and its recommended candidate; drift of the\n' +
    "holdings from it (sum |current - target| against the household's tolerance, default 5 %) and the\n" +
    'largest gap; volatility and diversification ratio of the holdings and of the recommendation on the\n' +
    'latest prices, with the change since the revision was saved; the mandate limits the holdings break;\n' +
    'the last memo and what changed since. Reads the store only.\n' +
    'Exit 0 when every household is in order, 4 when one needs attention or cannot be computed.',
  load: () => import('./review.js').then((m) => m.runReview),
};

const exportHouseholdCommand: Command = {
  name: 'export-household',
  summary: `write one household with its scenarios and prices to a portable ${HOUSEHOLD_FILE_FORMAT} file`,
  options: [
    { name: 'store', kind: 'string', valueName: 'FILE', required: true, description: 'the store to read' },
    { name: 'household', kind: 'string', valueName: 'NAME', required: true, description: 'the household' },
    { name: 'out', kind: 'string', valueName: 'FILE.json', required: true, description: 'the file (must not exist)' },
  ],
  load: () => import('./household-transfer.js').then((m) => m.runExportHousehold),
};

const importHouseholdCommand: Command = {
  name: 'import-household',
  summary: `add a household from a ${HOUSEHOLD_FILE_FORMAT} file to the store`,
  options: [
    { name: 'store', kind: 'string', valueName: 'FILE', required: true, description: 'the store (created if absent)' },
    { name: 'from', kind: 'string', valueName: 'FILE.json', required: true, description: 'the household file' },
    { name: 'json', kind: 'boolean', description: 'print the result as one JSON object' },
  ],
  load: () => import('./household-transfer.js').then((m) => m.runImportHousehold),
};

const serveCommand: Command = {
  name: 'serve',
  summary: 'serve the application and its service API on 127.0.0.1 for a local browser',
  options: [
    { name: 'store', kind: 'string', valueName: 'FILE', required: true, description: 'the store to open' },
    { name: 'port', kind: 'number', valueName: 'N', description: 'port on 127.0.0.1 (default: any free port)' },
    {
      name: 'demo',
      kind: 'boolean',
      description: 'create the store from the invented demonstration data if the file does not exist',
    },
  ],
  details:
    'Listens on 127.0.0.1 only. The printed address carries a token drawn for this launch; requests without it\n' +
    'are refused. Stop with Ctrl-C: the store is closed cleanly.',
  load: () => import('./serve.js').then((m) => m.runServe),
};

const estimateCommand: Command = {
  name: 'estimate',
  summary: 'estimate the covariance of the returns in a price file',
  options: [
    {
      name: 'prices',
      kind: 'string',
      valueName: 'FILE.csv',
      required: true,
      description: 'wide price file: date, then one column per asset',
    },
    { name: 'method', kind: 'string', choices: estimatorMethods, description: 'estimator (default ledoit-wolf)' },
    {
      name: 'target',
      kind: 'string',
      choices: shrinkageTargets,
      description: 'ledoit-wolf target (default scaled-identity)',
    },
    {
      name: 'lambda',
      kind: 'number',
      description: 'ewma decay in (0, 1) (default 0.94 daily, 0.97 weekly and monthly)',
    },
    { name: 'half-life', kind: 'number', description: 'ewma half-life in periods, instead of --lambda' },
    {
      name: 'from',
      kind: 'string',
      valueName: 'YYYY-MM-DD',
      description: 'first date of the window (default: whole common window)',
    },
    { name: 'to', kind: 'string', valueName: 'YYYY-MM-DD', description: 'last date of the window' },
    {
      name: 'frequency',
      kind: 'string',
      choices: ['daily', 'weekly', 'monthly'],
      description: 'return frequency (default daily)',
    },
    { name: 'returns', kind: 'string', choices: ['log', 'simple'], description: 'return type (default log)' },
    { name: 'periods-per-year', kind: 'number', description: 'annualisation factor (default 252, 52 or 12)' },
    { name: 'max-fill-days', kind: 'number', description: 'longest carry of a stale price, calendar days (default 5)' },
    {
      name: 'desmooth',
      kind: 'string',
      valueName: 'ID[,ID...]',
      description: 'assets with smoothed (appraisal) returns to desmooth (Getmansky, Lo and Makarov 2004)',
    },
    { name: 'json', kind: 'boolean', description: 'print one JSON object instead of a table' },
  ],
  details: [
    'The covariance printed is annualised: periods per year times the per-period covariance.',
    'Estimates come from past data; past performance does not guarantee future results.',
  ].join('\n'),
  load: () => import('./estimate.js').then((m) => m.runEstimate),
};

const memoCommand: Command = {
  name: 'memo',
  summary: 'write the PDF allocation memo of a scenario',
  options: [
    { name: 'prices', kind: 'string', valueName: 'FILE.csv', description: 'wide price file (file form)' },
    {
      name: 'scenario',
      kind: 'string',
      valueName: 'FILE.json|NAME',
      description: 'scenario file, or its name in the store',
    },
    { name: 'out', kind: 'string', valueName: 'memo.pdf', required: true, description: 'PDF file to write' },
    { name: 'household-name', kind: 'string', valueName: '"..."', description: 'household name printed on the memo' },
    { name: 'date', kind: 'string', valueName: 'YYYY-MM-DD', description: "the memo's date (default: today, UTC)" },
    {
      name: 'holdings',
      kind: 'string',
      valueName: 'FILE.json',
      description: 'holdings in the base currency (file form; a demo household file works)',
    },
    fxOption,
    { name: 'prepared-by', kind: 'string', valueName: '"..."', description: 'name or initials printed as preparer' },
    { name: 'lot', kind: 'number', valueName: 'AMOUNT', description: 'round trades to this amount (default 1000)' },
    {
      name: 'backtest',
      kind: 'boolean',
      description: "add the walk-forward and stress sections (the scenario's backtest settings; slower)",
    },
    { name: 'stability', kind: 'boolean', description: 'with --backtest: add bootstrap weight bands (200 resamples)' },
    { name: 'store', kind: 'string', valueName: 'FILE', description: 'the store (store form)' },
    { name: 'household', kind: 'string', valueName: 'NAME', description: 'household in the store (store form)' },
  ],
  details: [
    'File form:  holdfast memo --prices FILE.csv --scenario FILE.json --out memo.pdf [--holdings FILE.json]',
    'Store form: holdfast memo --store FILE --household NAME --scenario NAME --out memo.pdf',
    'The same inputs and --date give the same bytes. Estimates come from past data; past performance',
    'does not guarantee future results; the memo is not a recommendation until a licensed adviser reviews it.',
  ].join('\n'),
  load: () => import('./memo.js').then((m) => m.runMemo),
};

const backtestCommand: Command = {
  name: 'backtest',
  summary: 'walk every candidate forward out of sample, with costs, stress views and stability',
  options: [
    { name: 'prices', kind: 'string', valueName: 'FILE.csv', description: 'wide price file (file form)' },
    { name: 'store', kind: 'string', valueName: 'FILE', description: 'the store (store form, with --household)' },
    { name: 'household', kind: 'string', valueName: 'NAME', description: 'household in the store (store form)' },
    {
      name: 'scenario',
      kind: 'string',
      valueName: 'FILE.json|NAME',
      required: true,
      description: 'holdfast-scenario@1 document, or a saved scenario name (store form)',
    },
    fxOption,
    { name: 'json', kind: 'boolean', description: 'print one JSON object on standard output' },
    { name: 'stability', kind: 'boolean', description: "bootstrap today's weights (weight bands)" },
    {
      name: 'draws',
      kind: 'number',
      valueName: 'N',
      description: `bootstrap draws for --stability (default ${DEFAULT_DRAWS})`,
    },
    { name: 'seed', kind: 'number', valueName: 'N', description: 'seed of every bootstrap (default 1)' },
  ],
  details:
    'The scenario\'s "backtest" block sets estimationWindow (default: what the history allows, 36\n' +
    'monthly, 104 weekly or 252 daily returns and never more than half of them), expanding,\n' +
    'rebalance (monthly, quarterly, yearly, drift), driftBand, costBps (one figure or per asset\n' +
    'class), cashRate and from; its\n' +
    '"stress" block holds user-defined shocks. Store form: --store FILE --household NAME --scenario NAME\n' +
    'walks the newest saved revision on the stored prices, as the app and `memo --store` do.\n' +
    'Exit 0 on success, 2 on bad input, 3 when a mandate cannot be met, 130 when interrupted.',
  load: () => import('./backtest.js').then((m) => m.runBacktestCommand),
};

const solveCommand: Command = {
  name: 'solve',
  summary: 'solve the candidate allocations of a scenario',
  options: [
    {
      name: 'prices',
      kind: 'string',
      valueName: 'FILE.csv',
      description: 'wide price file: date, then one column per asset (file form)',
    },
    { name: 'store', kind: 'string', valueName: 'FILE', description: 'the store (store form, with --household)' },
    { name: 'household', kind: 'string', valueName: 'NAME', description: 'household in the store (store form)' },
    {
      name: 'scenario',
      kind: 'string',
      valueName: 'FILE.json|NAME',
      required: true,
      description: 'holdfast-scenario@1 document, or a saved scenario name (store form)',
    },
    fxOption,
    { name: 'json', kind: 'boolean', description: 'print one JSON object instead of a table' },
  ],
  details: [
    'Exit status: 0 when every candidate is optimal, 3 when any is infeasible (the output is still',
    'printed), 1 when a candidate failed otherwise (a singular covariance, an iteration limit), 2 on',
    'bad input (nothing printed on standard output).',
    'Store form: --store FILE --household NAME --scenario NAME solves the newest saved revision on the',
    "stored prices of its assets; asset tags and holdings fill the document's assetInfo and current if absent.",
    'Estimates come from past data; past performance does not guarantee future results.',
  ].join('\n'),
  load: () => import('./solve.js').then((m) => m.runSolveCommand),
};

/**
 * Every `holdfast` command, in the order `--help` lists them. A new command is one module in
 * this folder exporting its run function, plus its entry above and one line here.
 */
export const commands: readonly Command[] = [
  demoCommand,
  importCommand,
  backupCommand,
  restoreCommand,
  checkCommand,
  reviewCommand,
  exportHouseholdCommand,
  importHouseholdCommand,
  serveCommand,
  estimateCommand,
  memoCommand,
  backtestCommand,
  solveCommand,
];
