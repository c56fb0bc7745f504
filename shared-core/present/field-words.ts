import { formatInputError, InputError } from '../errors.js';
import { daysInLocale, formatPercent1, PLAIN } from './format.js';

/**
 * A field of the scenario in the words of the editor: the label the advisor sees beside it, and
 * whether its value is a share of the portfolio (typed and shown in per cent). Every message on
 * a screen names its field so, never by the document's JSON path, and states limits in the
 * field's own unit ("the upper bound must be at most 100 %", not "<=1").
 */
export interface FieldWords {
  label: string;
  /** `percent`: a fraction shown as per cent; otherwise the unit's name ("return periods"). */
  unit?: 'percent' | string;
}

const SIMPLE: Record<string, FieldWords> = {
  name: { label: 'Name' },
  baseCurrency: { label: 'Base currency' },
  assets: { label: 'Assets' },
  window: { label: 'Estimation window' },
  'window.years': { label: 'Years of data', unit: 'years' },
  'window.from': { label: 'From (date)' },
  'window.to': { label: 'Ending (date)' },
  returns: { label: 'Returns' },
  'returns.frequency': { label: 'Return frequency' },
  'returns.method': { label: 'Return type' },
  'returns.maxFillDays': { label: 'Longest fill of a missing price', unit: 'days' },
  periodsPerYear: { label: 'Periods per year' },
  constraints: { label: 'Mandate limits' },
  'constraints.longOnly': { label: 'Long-only' },
  'constraints.weightBounds': { label: 'Per-asset bounds', unit: 'percent' },
  'constraints.weightBounds.default': { label: 'Every asset between', unit: 'percent' },
  'constraints.weightBounds.default.0': { label: 'Default lower bound', unit: 'percent' },
  'constraints.weightBounds.default.1': { label: 'Default cap per asset', unit: 'percent' },
  'constraints.maxTurnover': { label: 'Maximum turnover', unit: 'percent' },
  'constraints.maxGrossExposure': { label: 'Maximum gross exposure', unit: 'percent' },
  'constraints.illiquidMax': { label: 'Cap on illiquid assets together', unit: 'percent' },
  'constraints.minPosition': { label: 'Minimum position size', unit: 'percent' },
  'constraints.groups': { label: 'Group bands' },
  current: { label: 'Current weights', unit: 'percent' },
  expectedReturns: { label: 'Expected returns', unit: 'percent' },
  candidates: { label: 'Candidates' },
  recommended: { label: 'Recommended candidate' },
  backtest: { label: 'Walk-forward test' },
  'backtest.estimationWindow': { label: 'Estimation window (walk-forward)', unit: 'return periods' },
  'backtest.expanding': { label: 'Window (walk-forward)' },
  'backtest.rebalance': { label: 'Rebalance' },
  'backtest.driftBand': { label: 'Drift band', unit: 'percent' },
  'backtest.costBps': { label: 'Costs', unit: 'bp of traded value' },
  'backtest.cashRate': { label: 'Cash rate for the Sharpe ratio', unit: 'percent' },
  'backtest.from': { label: 'Walk-forward start (date)' },
  stress: { label: 'Stress shocks' },
  '(document)': { label: 'This scenario' },
};

/** Splits `constraints.groups[2].max` into ['constraints', 'groups', '2', 'max']. */
function parts(path: string): string[] {
  return path.split(/\.|\[|\]/).filter((p) => p !== '');
}

/** The label and unit of the field at a JSON path (the most specific one known). */
export function fieldWords(path: string): FieldWords {
  if (SIMPLE[path]) return SIMPLE[path];
  const dotted = path.replace(/\[(\d+)\]/g, '.$1');
  if (SIMPLE[dotted]) return SIMPLE[dotted];
  const p = parts(path);
  if (p[0] === 'constraints' && p[1] === 'weightBounds' && p.length >= 3) {
    const asset = p[2];
    if (p[3] === '0') return { label: `Lower bound of ${asset}`, unit: 'percent' };
    if (p[3] === '1') return { label: `Upper bound of ${asset}`, unit: 'percent' };
    return { label: `Bounds of ${asset}`, unit: 'percent' };
  }
  if (p[0] === 'constraints' && p[1] === 'groups' && p.length >= 3) {
    const band = `band ${Number(p[2]) + 1}`;
    if (p[3] === 'min') return { label: `At least (${band})`, unit: 'percent' };
    if (p[3] === 'max') return { label: `At most (${band})`, unit: 'percent' };
    if (p[3] === 'name') return { label: `Name of ${band}` };
    if (p[3] === 'members') return { label: `Members of ${band}` };
    return { label: `Group ${band}` };
  }
  if (p[0] === 'current' && p[1]) return { label: `Current weight of ${p[1]}`, unit: 'percent' };
  if (p[0] === 'expectedReturns' && p[1]) return { label: `Expected return of ${p[1]}`, unit: 'percent' };
  if (p[0] === 'assets' && p[1]) return { label: 'Assets' };
  if (p[0] === 'assetInfo' && p[1]) {
    if (p[2] === 'liquidityCap') return { label: `Liquidity cap of ${p[1]}`, unit: 'percent' };
    return { label: `Details of ${p[1]}` };
  }
  if (p[0] === 'candidates' && p[1] !== undefined) {
    const rest = p.slice(2).join('.');
    // A candidate's own limits read as the scenario's, in their unit, naming the candidate.
    if (p[2] === 'constraints') {
      const inner = fieldWords(rest);
      return { ...inner, label: `${inner.label} (candidate ${Number(p[1]) + 1})` };
    }
    if (rest === 'objective.riskFreeRate')
      return { label: `Risk-free rate (candidate ${Number(p[1]) + 1})`, unit: 'percent' };
    const what = rest.startsWith('estimator') ? 'risk estimate' : rest.startsWith('objective') ? 'objective' : '';
    return { label: `Candidate ${Number(p[1]) + 1}${what ? `, ${what}` : ''}` };
  }
  if (p[0] === 'objectives' && p[2] === 'riskFreeRate') return { label: 'Risk-free rate, annualised', unit: 'percent' };
  if (p[0] === 'stress') return { label: 'Stress shocks' };
  if (p[0] === 'backtest' && p[1] === 'costBps') return { label: `Costs for ${p[2] ?? 'an asset class'}`, unit: 'bp' };
  // Parents: the nearest known field above.
  for (let k = p.length - 1; k > 0; k--) {
    const parent = fieldWords(p.slice(0, k).join('.'));
    if (parent.label !== 'This scenario') return parent;
  }
  return SIMPLE['(document)'];
}

function limitText(value: number, unit: string | undefined, inFile: boolean): string {
  if (unit === 'percent')
    return `${formatPercent1(value, PLAIN, 2).replace(/\.?0+$/, '')} %${inFile ? ` (${value} in the file)` : ''}`;
  return unit ? `${value} ${unit}` : String(value);
}

/**
 * A schema or check message rewritten in the field's own unit: the bound of a "too big" or "too
 * small" number as per cent for a share of the portfolio, the type errors in plain words, days in
 * the reader's locale. `inFile`: for the command line, which names the file's own values and
 * keeps ISO 8601 days.
 */
export function inFieldWords(
  path: string,
  message: string,
  options: { inFile?: boolean; locale?: string } = {},
): string {
  const { unit } = fieldWords(path);
  const the = `the ${fieldWords(path).label.replace(/^[A-Z]/, (c) => c.toLowerCase())}`;
  const limit = /^Too (big|small): expected (?:number|int) to be (<=|<|>=|>)\s*(-?[\d.e+-]+)/.exec(message);
  if (limit) {
    const [, , op, raw] = limit;
    const words = { '<=': 'at most', '<': 'below', '>=': 'at least', '>': 'above' }[op as '<=' | '<' | '>=' | '>'];
    return `${the} must be ${words} ${limitText(Number(raw), unit, options.inFile === true)}`;
  }
  if (/^Invalid input: expected int/.test(message) || /expected int, received number/.test(message))
    return `${the} must be a whole number`;
  if (/^Invalid input: expected number/.test(message)) return `${the} must be a number`;
  if (/^Invalid input: expected string/.test(message)) return `${the} must be text`;
  if (/^Too small: expected (string|array) to have >=1/.test(message)) return `${the} cannot be empty`;
  if (message === 'lower bound above upper bound') return 'the lower bound is above the upper bound';
  // The core writes days in ISO 8601, as files do; a screen shows them in the reader's locale.
  return options.inFile ? message : daysInLocale(message, options.locale);
}

/** One line for a summary list: "Upper bound of GOLD: the upper bound must be at most 100 %". */
export function describeField(path: string, message: string): string {
  return `${fieldWords(path).label}: ${inFieldWords(path, message)}`;
}

/**
 * A located input error as the command line prints it: where it is (file, line, column and JSON
 * path, as formatInputError writes them), then the message in the words the screens use for that
 * field of the scenario, with a share of the portfolio in per cent and the file's fraction beside
 * it ("the default cap per asset must be at most 100 % (1 in the file)"). A path the scenario's
 * words do not know (another file's) keeps its message.
 */
export function formatFieldError(error: InputError): string {
  const { path } = error.location;
  if (path === undefined || fieldWords(path) === SIMPLE['(document)']) return formatInputError(error);
  return formatInputError(new InputError(inFieldWords(path, error.message, { inFile: true }), error.location));
}
