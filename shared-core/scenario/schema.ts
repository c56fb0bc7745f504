import { z } from 'zod';
import { InputError } from '../errors.js';
import { backtestSpecSchema, stressSpecSchema } from './backtest-spec.js';
import { estimatorMethods, estimatorSpecSchema } from './estimator-spec.js';
import { frequencies } from './frequency.js';
import { isoDate } from './iso-date.js';
import { issueToInputError } from './json-path.js';
import { parseJsonText } from './json-text.js';
import { objectiveMethods, objectiveSpecSchema } from './objective-spec.js';
import { canonicalAssetClass } from './asset-class.js';

/**
 * `holdfast-scenario@1`: the public, versioned interchange format of a scenario, and the one
 * source of truth for it. The command line, the store, the app and the memo all read it through
 * `parseScenario`.
 */
export const SCENARIO_FORMAT = 'holdfast-scenario@1';

// Every document is validated once: zod's compiled fast path (generated with new Function on a
// schema's first parse) costs more than it saves here; a scenario parses in 6 ms instead of
// 9-14 ms in a fresh process. It also keeps eval out of the renderer.
z.config({ jitless: true });

const weight = z.number().finite();
const bound = z.tuple([weight, weight]).refine(([lo, hi]) => lo <= hi, { message: 'lower bound above upper bound' });

export const groupBandSchema = z
  .strictObject({
    name: z.string().min(1),
    members: z.array(z.string().min(1)).min(1),
    min: z.number().min(0).max(1).optional(),
    max: z.number().min(0).max(1).optional(),
  })
  .refine((g) => g.min === undefined || g.max === undefined || g.min <= g.max, {
    message: 'group minimum above its maximum',
  });

export const constraintsSchema = z.strictObject({
  /** Long-only unless set to false. With `false` and no bounds given there are no per-asset bounds. */
  longOnly: z.boolean().optional(),
  /** `default` applies to every asset without its own entry. */
  weightBounds: z.record(z.string(), bound).optional(),
  groups: z.array(groupBandSchema).optional(),
  /** Sum of |w - current| against `current`. */
  maxTurnover: z.number().min(0).optional(),
  /** Sum of |w|, for long-short. */
  maxGrossExposure: z.number().min(1).optional(),
  /** Cap on the total weight of assets whose liquidity is `illiquid`. */
  illiquidMax: z.number().min(0).max(1).optional(),
  /** Each weight either 0 or at least this (long-only; a heuristic, optimise/minimum-position.ts). */
  minPosition: z.number().gt(0).lt(1).optional(),
});
export type Constraints = z.infer<typeof constraintsSchema>;

export const liquidityTags = ['daily', 'monthly', 'illiquid'] as const;

/** What the scenario knows of each asset beyond its prices (the store fills it from its tags). */
export const assetInfoSchema = z.strictObject({
  name: z.string().optional(),
  /** Kept in its one spelling (asset-class.ts), whatever the file wrote. */
  assetClass: z.string().overwrite(canonicalAssetClass).optional(),
  region: z.string().optional(),
  currency: z
    .string()
    .regex(/^[A-Z]{3}$/, 'expected an ISO 4217 code such as EUR')
    .optional(),
  liquidity: z.enum(liquidityTags).optional(),
  /** Per-asset cap from liquidity data (for example a share of average daily volume). */
  liquidityCap: z.number().min(0).max(1).optional(),
});
export type AssetInfo = z.infer<typeof assetInfoSchema>;

export const candidateSchema = z.strictObject({
  id: z.string().regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, 'expected letters, digits, dot, dash or underscore'),
  label: z.string().optional(),
  estimator: estimatorSpecSchema,
  objective: objectiveSpecSchema,
  /** Overrides of the scenario's constraints for this candidate only. */
  constraints: constraintsSchema.optional(),
});
export type Candidate = z.infer<typeof candidateSchema>;

export const scenarioSchema = z
  .strictObject({
    format: z.literal(SCENARIO_FORMAT),
    name: z.string().min(1),
    baseCurrency: z.string().regex(/^[A-Z]{3}$/, 'expected an ISO 4217 code such as EUR'),
    assets: z.array(z.string().min(1)).min(1).optional(),
    window: z
      .strictObject({ from: isoDate.optional(), to: isoDate.optional(), years: z.number().positive().optional() })
      .optional(),
    returns: z
      .strictObject({
        frequency: z.enum(frequencies).default('daily'),
        method: z.enum(['log', 'simple']).default('log'),
        /** Never fill a missing price forward over more than this many days. */
        maxFillDays: z.number().int().min(0).default(5),
      })
      .default({ frequency: 'daily', method: 'log', maxFillDays: 5 }),
    periodsPerYear: z.number().positive().optional(),
    constraints: constraintsSchema.default({}),
    /** Current weights, the reference for turnover. */
    current: z.record(z.string(), weight).optional(),
    expectedReturns: z.record(z.string(), z.number().finite()).optional(),
    assetInfo: z.record(z.string(), assetInfoSchema).optional(),
    candidates: z.array(candidateSchema).min(1),
    /** The candidate the advisor recommends (marked in the comparison and the memo). */
    recommended: z.string().optional(),
    backtest: backtestSpecSchema.optional(),
    stress: stressSpecSchema.optional(),
  })
  .superRefine((s, ctx) => {
    const seen = new Set<string>();
    s.candidates.forEach((c, i) => {
      if (seen.has(c.id))
        ctx.addIssue({ code: 'custom', path: ['candidates', i, 'id'], message: `repeated id '${c.id}'` });
      seen.add(c.id);
    });
    if (s.recommended !== undefined && !seen.has(s.recommended))
      ctx.addIssue({ code: 'custom', path: ['recommended'], message: `no candidate with id '${s.recommended}'` });
    // No asset can hold more than the whole of a long-only portfolio: a cap of 150 % is a typing
    // slip, refused in the field's own words (the screens show the same text beside the field).
    if (s.constraints.longOnly !== false)
      for (const [asset, [, hi]] of Object.entries(s.constraints.weightBounds ?? {}))
        if (hi > 1)
          ctx.addIssue({
            code: 'custom',
            path: ['constraints', 'weightBounds', asset, 1],
            message: 'the upper bound must be at most 100 % (the portfolio is long-only)',
          });
    if (s.window?.years !== undefined && s.window.from !== undefined)
      ctx.addIssue({
        code: 'custom',
        path: ['window', 'years'],
        message: "give a start date 'from' or a number of 'years', not both",
      });
  });

export type Scenario = z.infer<typeof scenarioSchema>;
/** The document as written (defaults not yet applied). */
export type ScenarioInput = z.input<typeof scenarioSchema>;

export type ScenarioParse = { ok: true; scenario: Scenario } | { ok: false; errors: InputError[] };

/** Validates a parsed JSON value; every error names its JSON path. */
export function parseScenario(value: unknown): ScenarioParse {
  const result = scenarioSchema.safeParse(value, { reportInput: true });
  if (result.success) return { ok: true, scenario: result.data };
  return {
    ok: false,
    errors: result.error.issues.map((issue) => {
      // An unknown `method` names the methods that exist for that kind of object.
      const parent = issue.path[issue.path.length - 2];
      const options = parent === 'estimator' ? estimatorMethods : parent === 'objective' ? objectiveMethods : undefined;
      return issueToInputError({ ...(issue as unknown as Parameters<typeof issueToInputError>[0]), options });
    }),
  };
}

/** Parses scenario JSON text; a syntax error names line and column. */
export function parseScenarioText(text: string): ScenarioParse {
  let value: unknown;
  try {
    value = parseJsonText(text);
  } catch (error) {
    if (error instanceof InputError) return { ok: false, errors: [error] };
    throw error;
  }
  return parseScenario(value);
}
