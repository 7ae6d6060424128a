/**
 * The versioned circuit file format (`"format": "wyeward-circuit", "version": 1`).
 * Documented in docs/circuit-format.md; JSON Schema in docs/circuit-format.schema.json
 * (generated from these schemas by scripts in tests, which fail when the committed file is stale).
 */
import { z } from 'zod';
import { busSchema, nonNegNum, posNum } from './common.ts';
import { primitiveSchemas } from './primitives.ts';
import { blockSchemas } from './blocks.ts';
import { casesSchema } from './cases.ts';

export const elementSchemas = { ...primitiveSchemas, ...blockSchemas } as const;
export type ElementType = keyof typeof elementSchemas;
export const ELEMENT_TYPES = Object.keys(elementSchemas) as ElementType[];

/** Any element of a circuit file (primitive or building block). */
export const elementSchema = z.discriminatedUnion('type', [
  primitiveSchemas.impedance,
  primitiveSchemas.voltageSource,
  primitiveSchemas.currentSource,
  primitiveSchemas.coupledBranch,
  primitiveSchemas.switch,
  primitiveSchemas.admittanceMatrix,
  primitiveSchemas.zipLoad,
  blockSchemas.source,
  blockSchemas.splitPhaseSource,
  blockSchemas.line,
  blockSchemas.transformer,
  blockSchemas.splitPhaseTransformer,
  blockSchemas.load,
  blockSchemas.capacitorBank,
  blockSchemas.fault,
  blockSchemas.switch3,
  blockSchemas.earthing,
]);
export type CircuitElement = z.infer<typeof elementSchema>;
export type CircuitElementInput = z.input<typeof elementSchema>;

const puRange = z.tuple([posNum, posNum]).refine(([lo, hi]) => lo < hi, 'the low limit must be below the high limit');

/** Limit settings: a named base set plus any overrides. */
export const limitsSchema = z.strictObject({
  set: z.enum(['ansi-c84.1', 'iec-en']).default('ansi-c84.1'),
  voltageWarningPu: puRange.optional().meta({ description: 'Voltage band [low, high] in pu of nominal outside which a warning is raised.' }),
  voltageViolationPu: puRange.optional().meta({ description: 'Voltage band [low, high] in pu of nominal outside which a violation is raised.' }),
  unbalancePercent: nonNegNum.optional().meta({ description: 'Unbalance limit, %, for every definition not given its own in "unbalancePercentByMetric".' }),
  unbalanceMetric: z.enum(['nema', 'iec', 'ieee']).optional().meta({ description: 'The definition the limit set is stated in (named first in reports).' }),
  unbalancePercentByMetric: z
    .strictObject({ iec: nonNegNum.optional(), nema: nonNegNum.optional(), ieee: nonNegNum.optional() })
    .optional()
    .meta({ description: 'Own unbalance limit, %, per definition: iec |V2|/|V1|, nema line-voltage, ieee phase-voltage.' }),
  neutralShiftPercent: nonNegNum.optional().meta({ description: 'Neutral-to-earth voltage in % of nominal line-to-neutral above which a warning is raised.' }),
  loadingPercent: nonNegNum.optional().meta({ description: 'Transformer loading above which a warning is raised.' }),
});
export type LimitsInput = z.input<typeof limitsSchema>;

/** Nominal data of a bus (optional: nominal voltages are otherwise inferred from sources and transformers). */
export const busInfoSchema = z.strictObject({
  name: busSchema,
  kvLL: posNum.optional().meta({ description: 'Nominal line-to-line voltage, kV (split-phase: leg to leg).' }),
  label: z.string().optional(),
});

/** A whole circuit file. */
export const circuitSchema = z.strictObject({
  format: z.literal('wyeward-circuit'),
  version: z.literal(1),
  frequencyHz: posNum,
  name: z.string().optional(),
  description: z.string().optional(),
  sequence: z.enum(['ABC', 'ACB']).default('ABC').meta({ description: 'Phase rotation of every source.' }),
  buses: z.array(busInfoSchema).optional(),
  limits: limitsSchema.optional(),
  elements: z.array(elementSchema),
  cases: casesSchema.optional().meta({ description: 'Study cases: named lists of changes (set fields of an element, add one, remove one) applied to this base circuit. See docs/circuit-format.md.' }),
});
/** A validated circuit (defaults applied). */
export type Circuit = z.infer<typeof circuitSchema>;
/** A circuit as written in a file (defaults optional). */
export type CircuitInput = z.input<typeof circuitSchema>;
