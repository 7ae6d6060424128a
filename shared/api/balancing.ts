/** Phase balancing of a study (`POST /api/studies/:id/balance`): request and answer. */
import { z } from 'zod';

/** Largest customer CSV accepted (about 5 000 customers). */
export const MAX_CUSTOMERS_CSV_CHARS = 500_000;

/** The terms a weighted mix may weigh, with their names in words. */
export const MIX_TERMS = [
  ['neutral', 'neutral current'],
  ['unbalance', 'voltage unbalance'],
  ['losses', 'losses'],
  ['voltage', 'lowest customer voltage'],
] as const;
export type MixWeights = Partial<Record<(typeof MIX_TERMS)[number][0], number>>;

const weight = (words: string) =>
  z
    .number({ error: `The ${words} weight must be a number` })
    .min(0, `The ${words} weight cannot be negative`)
    .max(1e6, `The ${words} weight must be at most 1 000 000`)
    .optional();

/** Weights of the weighted mix: each term's score relative to its value before balancing, times its weight. */
export const mixWeightsSchema = z.strictObject(
  { neutral: weight('neutral current'), unbalance: weight('voltage unbalance'), losses: weight('losses'), voltage: weight('lowest customer voltage') },
  { error: 'Weights may be given only for neutral, unbalance, losses and voltage' },
);

/** What is wrong with the weights of a weighted mix, in words (null when they are fine). */
export function mixWeightsProblem(weights: MixWeights | undefined): string | null {
  if (!weights || !Object.values(weights).some((w) => w !== undefined && w > 0)) return 'Give the weighted mix at least one weight above zero.';
  return null;
}

export const balanceRequestSchema = z
  .object({
    /** The customer list as CSV text; without it the study's own single-phase loads are balanced. */
    customersCsv: z.string().max(MAX_CUSTOMERS_CSV_CHARS, 'The customer list is too large: at most 500 000 characters (about 5 000 customers)').optional(),
    objective: z.enum(['neutral', 'unbalance', 'losses', 'voltage', 'mix']).default('neutral'),
    /** Definition of unbalance, for the unbalance objective or the unbalance term of a mix (default iec). */
    definition: z.enum(['iec', 'nema', 'ieee']).optional(),
    /** Weights of the weighted mix (objective `mix` only). */
    weights: mixWeightsSchema.optional(),
    /** Bus where the neutral current is measured (default: the source). */
    bus: z.string().trim().min(1).max(200).optional(),
    maxMoves: z.number().int('The number of moves must be a whole number').min(0, 'The number of moves cannot be negative').max(5000).optional(),
  })
  .superRefine((body, ctx) => {
    if (body.objective === 'mix') {
      const problem = mixWeightsProblem(body.weights);
      if (problem) ctx.addIssue({ code: 'custom', path: ['weights'], message: problem });
    } else if (body.weights !== undefined) ctx.addIssue({ code: 'custom', path: ['weights'], message: 'Weights go with the weighted mix objective only.' });
  });
export type BalanceRequest = z.input<typeof balanceRequestSchema>;

const figuresSchema = z.object({
  neutralCurrentA: z.number(),
  maxUnbalancePercent: z.object({ iec: z.number(), nema: z.number(), ieee: z.number() }),
  lossesKw: z.number(),
  minCustomerVoltagePu: z.number(),
  maxCustomerVoltagePu: z.number(),
});
const cx = z.object({ re: z.number(), im: z.number() });
const currentsSchema = z.object({ a: cx, b: cx, c: cx, n: cx });
const voltageSchema = z.object({ customer: z.string(), bus: z.string(), phase: z.string(), volts: z.number(), pu: z.number() });

export const balanceResponseSchema = z.object({
  /** The objective in words ("neutral current leaving bus WC0"). */
  objective: z.string(),
  assignment: z.record(z.string(), z.enum(['A', 'B', 'C'])),
  moves: z.array(z.object({ customer: z.string(), bus: z.string(), from: z.string(), to: z.string() })),
  before: figuresSchema,
  after: figuresSchema,
  rotatingRule: figuresSchema,
  /** Gap HiGHS proved on the linearised MILP, % (null when it proved none). */
  gapPercent: z.number().nullable(),
  milpStatus: z.string(),
  solves: z.number(),
  maxMoves: z.number(),
  voltages: z.object({ before: z.array(voltageSchema), after: z.array(voltageSchema) }),
  /** Phase and neutral currents where the neutral is measured, before and after, A (complex). */
  currents: z.object({ at: z.string(), before: currentsSchema, after: currentsSchema }),
  /** Whether the customers are the study's own loads (so the assignment can be applied as a revision). */
  fromStudy: z.boolean(),
  caution: z.string(),
});
export type BalanceResponse = z.infer<typeof balanceResponseSchema>;

/** Stages a running balancing reports (the engine's balancePhases onProgress). */
export const BALANCE_STAGES = ['solving', 'linearising', 'milp', 'local-search', 'done'] as const;

/** One progress report of a running balancing: its stage and the exact solves made so far. */
export interface BalanceProgress {
  stage: (typeof BALANCE_STAGES)[number];
  solves: number;
}

/** The media type of the streamed mode of POST /api/studies/:id/balance (newline-delimited JSON). */
export const BALANCE_STREAM_TYPE = 'application/x-ndjson';
