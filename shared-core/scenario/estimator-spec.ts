import { z } from 'zod';

/**
 * The estimator object of a scenario candidate: `method` plus that method's options, named as
 * the command-line flags are (`target`, `lambda`, `halfLife`). The list of methods here is the
 * one registry the UI, the command line and the schema read.
 */
export const estimatorMethods = ['sample', 'ewma', 'ledoit-wolf', 'oas', 'denoised', 'robust', 'nonlinear'] as const;
export type EstimatorMethod = (typeof estimatorMethods)[number];

export const shrinkageTargets = ['scaled-identity', 'constant-correlation', 'single-index'] as const;
export type ShrinkageTarget = (typeof shrinkageTargets)[number];

const unit = z.number().gt(0).lt(1);

export const estimatorSpecSchema = z.discriminatedUnion('method', [
  z.strictObject({ method: z.literal('sample') }),
  z
    .strictObject({ method: z.literal('ewma'), lambda: unit.optional(), halfLife: z.number().positive().optional() })
    .refine((e) => e.lambda === undefined || e.halfLife === undefined, {
      message: 'give lambda or halfLife, not both',
    }),
  z.strictObject({ method: z.literal('ledoit-wolf'), target: z.enum(shrinkageTargets).optional() }),
  z.strictObject({ method: z.literal('oas') }),
  z.strictObject({ method: z.literal('denoised') }),
  z.strictObject({ method: z.literal('robust') }),
  z.strictObject({ method: z.literal('nonlinear') }),
]);
export type EstimatorSpec = z.infer<typeof estimatorSpecSchema>;
