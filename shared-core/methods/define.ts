import type { z } from 'zod';

/**
 * What a method is, apart from how it computes: its name in a scenario, its options schema, its
 * words on screen and in the memo, and the paper it comes from. The scenario document builds its
 * union of options from these (scenario/estimator-spec.ts, objective-spec.ts), the command line
 * its choices, the editor its lists and the memo its sentences; the computation sits in the layer
 * above the document, one file per method in a table typed by these definitions
 * (estimators/registry.ts, optimise/objectives/index.ts).
 *
 * The options schema is a function of zod's namespace, given to it by the document, rather than
 * a schema built at import: these files then import nothing at run time, so the command line's
 * table can list the methods for `--help` without loading zod.
 */
export type Zod = typeof z;

/**
 * How the words print a figure of an option (a rate, say): given by the edge that shows them
 * (shared-core/present/method-words.ts binds the one formatter), since the definitions sit below it.
 */
export interface MethodFigures {
  /** A fraction as a percentage: 0.025 -> "2.50%". */
  percent: (fraction: number) => string;
}

/** A schema for one method's object: `method` (the literal name) plus its options. */
export type MethodSchema<M extends string> = z.ZodType<{ method: M }, { method: M }>;

interface MethodDefinition<M extends string, S extends MethodSchema<M>> {
  /** The `method` string of the scenario document and the command line. */
  method: M;
  /** The method's name in the editor's lists and its grid. */
  label: string;
  /** A few letters for candidate ids made from the grid ("md-lw"). */
  idPart: string;
  /** The document's schema of this method's object; unknown keys are refused. */
  options: (zod: Zod) => S;
  /** The object the editor starts from when the method is picked. */
  initial: z.input<S>;
  /** The label with the options that change it: "Exponentially weighted, half-life 60". */
  describe: (spec: z.output<S>, figures: MethodFigures) => string;
  /** The memo's words for it, inside a sentence: "exponentially weighted (half-life 60 periods)". */
  memoWords: (spec: z.output<S>, figures: MethodFigures) => string;
  /** The paper or practice it comes from, as cited beside its formula. */
  source: string;
  /** What it computes, in plain-text notation (the methods page, docs/methods.md, prints it). */
  formula: string;
  /** When an adviser would choose it, and when not (the methods page). */
  whenToUse: string;
}

export interface EstimatorDefinition<
  M extends string = string,
  S extends MethodSchema<M> = MethodSchema<M>,
> extends MethodDefinition<M, S> {
  /** The memo's few words for a table cell: "EWMA, half-life 60". */
  memoShort: (spec: z.output<S>, figures: MethodFigures) => string;
}

/** How an objective's shadow prices are told: the quantity a limit moves, and its unit. */
export interface ShadowPriceWords {
  /** The objective's value in a sentence: "DR", "volatility". */
  name: string;
  /** Its unit, as a table heading states it. */
  unit: string;
}

/**
 * How the optimality condition behind each asset's weight is told (the memo's reasons table):
 * the rule in one sentence, and the headings of the figure it compares (explain.ts `measure`)
 * and of its `threshold`. Rule-based weights have none.
 */
export interface OptimalityWords {
  rule: string;
  measure: string;
  threshold: string;
  /** The figures are shares printed as percentages with this many decimals; absent: ratios, two decimals. */
  percentDigits?: number;
}

export interface ObjectiveDefinition<
  M extends string = string,
  S extends MethodSchema<M> = MethodSchema<M>,
> extends MethodDefinition<M, S> {
  /** What a binding limit costs is told in this quantity (optimise/solve-candidate.ts prices it). */
  shadowPrice: ShadowPriceWords;
  optimality?: OptimalityWords;
}

/** Declares an estimator; the identity, so that its options' type flows into its word functions. */
export function defineEstimator<M extends string, S extends MethodSchema<M>>(
  definition: EstimatorDefinition<M, S>,
): EstimatorDefinition<M, S> {
  return definition;
}

/** Declares an objective; the identity, so that its options' type flows into its word functions. */
export function defineObjective<M extends string, S extends MethodSchema<M>>(
  definition: ObjectiveDefinition<M, S>,
): ObjectiveDefinition<M, S> {
  return definition;
}

/** The options schemas of a tuple of definitions, as a tuple (for the document's zod union). */
export type OptionSchemas<T extends readonly { options: (zod: Zod) => unknown }[]> = {
  [K in keyof T]: ReturnType<T[K]['options']>;
};
