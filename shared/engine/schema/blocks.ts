/**
 * Schemas of the three-phase building blocks. Each block refers to buses by name; a bus `B` has
 * conductor nodes `B.a`, `B.b`, `B.c`, `B.n` (three-phase) or `B.1`, `B.2`, `B.n` (split-phase).
 * Expansions into primitives live in `../blocks/`, one file per block.
 */
import { z } from 'zod';
import { busSchema, complexSchema, conductorSchema, earthingSchema, idSchema, isPassive, NEGATIVE_RESISTANCE, nodeSchema, nonNegNum, num, passiveComplexSchema, posNum } from './common.ts';

const phaseOverride = z.strictObject({
  pu: nonNegNum.optional().meta({ description: 'EMF magnitude in per unit of nominal (line-to-neutral for wye, line-to-line for delta).' }),
  angleDeg: num.optional().meta({ description: 'Absolute EMF angle in degrees.' }),
});

/** Internal impedance of a source: per phase, as sequence impedances, or from short-circuit MVA. */
export const sourceImpedanceSchema = z.union(
  [
    z.strictObject({ ohms: passiveComplexSchema }),
    z.strictObject({ z1: passiveComplexSchema, z0: passiveComplexSchema.optional() }),
    z.strictObject({ shortCircuitMva: posNum, xOverR: posNum, z0OverZ1: posNum.optional() }),
  ],
  { error: 'expected source impedance { "ohms" }, { "z1", "z0"? } or { "shortCircuitMva", "xOverR", "z0OverZ1"? }' },
);

export const sourceSchema = z.strictObject({
  type: z.literal('source'),
  id: idSchema,
  bus: busSchema,
  kvLL: posNum.meta({ description: 'Nominal line-to-line voltage, kV.' }),
  connection: z.enum(['wye', 'delta']).default('wye'),
  earthing: earthingSchema.optional().meta({ description: 'Wye star-point earthing (default solid).' }),
  angleDeg: num.default(0).meta({ description: 'Angle of the phase-a EMF (wye) in degrees; delta: Vab leads it by 30°.' }),
  phases: z
    .strictObject({ a: phaseOverride.optional(), b: phaseOverride.optional(), c: phaseOverride.optional(), ab: phaseOverride.optional(), bc: phaseOverride.optional(), ca: phaseOverride.optional() })
    .optional()
    .meta({ description: 'Per-phase EMF overrides: a/b/c for wye, ab/bc/ca for delta.' }),
  impedance: sourceImpedanceSchema.optional(),
});

export const splitPhaseSourceSchema = z.strictObject({
  type: z.literal('splitPhaseSource'),
  id: idSchema,
  bus: busSchema,
  voltsLN: posNum.default(120).meta({ description: 'Leg-to-neutral EMF, V (leg-to-leg is twice this).' }),
  angleDeg: num.default(0),
  ohms: passiveComplexSchema.optional().meta({ description: 'Internal impedance per leg, ohms.' }),
  earthing: earthingSchema.optional(),
});

const lineImpedanceSchema = z.union(
  [
    z.strictObject({
      kind: z.literal('perConductor'),
      ohmsPerLength: z.partialRecord(conductorSchema, passiveComplexSchema),
    }),
    z.strictObject({
      kind: z.literal('matrix'),
      conductors: z.array(conductorSchema).min(1),
      ohmsPerLength: z.array(z.array(complexSchema)),
    }).superRefine((m, ctx) => {
      m.ohmsPerLength.forEach((row, i) => {
        if (row[i] !== undefined && !isPassive(row[i])) ctx.addIssue({ code: 'custom', path: ['ohmsPerLength', i, i], message: `self impedance of conductor ${m.conductors[i] ?? i + 1}: ${NEGATIVE_RESISTANCE}` });
      });
    }),
    z.strictObject({
      kind: z.literal('sequence'),
      z1PerLength: passiveComplexSchema,
      z0PerLength: passiveComplexSchema,
      neutralOhmsPerLength: passiveComplexSchema.optional(),
    }),
    z.strictObject({
      kind: z.literal('carson'),
      earthResistivityOhmM: posNum.default(100),
      kronReduceNeutral: z.boolean().default(false),
      conductors: z
        .array(z.strictObject({ conductor: conductorSchema, xFt: num, yFt: num, gmrFt: posNum, rOhmsPerMile: nonNegNum }))
        .min(1),
    }),
  ],
  { error: 'expected line impedance of kind "perConductor", "matrix", "sequence" or "carson" with its fields' },
);

/** Units of a line's length. */
export const LENGTH_UNITS = ['km', 'm', 'mi', 'ft'] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];
/** Units that per-length line data may be given per (kft = 1000 ft). */
export const PER_LENGTH_UNITS = ['km', 'm', 'mi', 'ft', 'kft'] as const;
export type PerLengthUnit = (typeof PER_LENGTH_UNITS)[number];
/** Metres in one of each length unit (international foot and mile). */
export const METRES_PER: Record<PerLengthUnit, number> = { km: 1000, m: 1, mi: 1609.344, ft: 0.3048, kft: 304.8 };

export const lineSchema = z.strictObject({
  type: z.literal('line'),
  id: idSchema,
  from: busSchema,
  to: busSchema,
  length: posNum,
  lengthUnit: z.enum(LENGTH_UNITS).default('km').meta({ description: 'Unit of "length".' }),
  perLengthUnit: z
    .enum(PER_LENGTH_UNITS)
    .optional()
    .meta({ description: 'Unit of length the per-length impedance and shunt data are given per ("kft" = 1000 ft); default: the same as "lengthUnit". Carson data stay in their own units (ft, Ω/mile).' }),
  impedance: lineImpedanceSchema,
  shunt: z
    .strictObject({ siemensPerLength: z.array(z.array(complexSchema)) })
    .optional()
    .meta({ description: 'Shunt admittance per length, in the order of the line conductors; half at each end.' }),
  open: z.array(conductorSchema).default([]).meta({ description: 'Conductors that are open (broken) along this line.' }),
});

/** A bank's leakage impedance given as %R and %X must not be zero (%Z itself is checked above zero). */
function leakageAboveZero(t: { percentZ?: number; percentR?: number; percentX?: number }): boolean {
  return t.percentZ !== undefined || (t.percentR ?? 0) > 0 || (t.percentX ?? 0) > 0;
}
const LEAKAGE_ZERO = 'the leakage impedance must be above zero (%R and %X cannot both be 0)';

const CONNECTIONS_NA = ['Yg-Yg', 'Y-Y', 'D-Yg', 'Yg-D', 'Y-D', 'D-D', 'D-Y', 'Yg-Y', 'Y-Yg'] as const;

export const transformerSchema = z
  .strictObject({
    type: z.literal('transformer'),
    id: idSchema,
    from: busSchema.meta({ description: 'High-voltage bus.' }),
    to: busSchema.meta({ description: 'Low-voltage bus.' }),
    kva: posNum.meta({ description: 'Three-phase rating, kVA.' }),
    kvHigh: posNum.meta({ description: 'Rated line-to-line voltage of the HV side, kV.' }),
    kvLow: posNum.meta({ description: 'Rated line-to-line voltage of the LV side, kV.' }),
    vectorGroup: z
      .string()
      .regex(/^(YN|Y|D)(yn|y|d)(0|1|2|3|4|5|6|7|8|9|10|11)$/, 'a vector group looks like Dyn11, YNyn0, Yd1 or Dd0 (IEC 60076-1 clock notation)')
      .optional(),
    connection: z.enum(CONNECTIONS_NA).optional().meta({ description: 'North American connection name; low side lags high side by 30° for D–Y and Y–D.' }),
    percentR: nonNegNum.optional(),
    percentX: nonNegNum.optional(),
    percentZ: posNum.optional(),
    xOverR: posNum.optional(),
    hvEarthing: earthingSchema.optional(),
    lvEarthing: earthingSchema.optional(),
    tap: z
      .strictObject({
        steps: z.number().int('tap steps must be a whole number').min(-32).max(32).default(0),
        stepPercent: posNum.max(10).default(2.5),
      })
      .refine((t) => Math.abs(t.steps * t.stepPercent) < 50, { message: 'the tap position must stay within ±50 % of the rated ratio' })
      .optional()
      .meta({ description: 'Off-load tap on the HV winding: steps × stepPercent % (default 0). The HV winding turns, and so the HV:LV ratio, change by (1 + steps·stepPercent/100); a positive tap lowers the LV voltage for a given HV voltage.' }),
  })
  .refine((t) => (t.vectorGroup === undefined) !== (t.connection === undefined), {
    message: 'give exactly one of "vectorGroup" (IEC clock notation) or "connection" (North American rule)',
  })
  .refine((t) => (t.percentZ !== undefined && t.xOverR !== undefined && t.percentR === undefined && t.percentX === undefined) || (t.percentZ === undefined && t.xOverR === undefined && (t.percentR !== undefined || t.percentX !== undefined)), {
    message: 'give the leakage impedance as "percentR" and "percentX", or as "percentZ" and "xOverR"',
  })
  .refine(leakageAboveZero, { message: LEAKAGE_ZERO, path: ['percentX'] });

export const splitPhaseTransformerSchema = z
  .strictObject({
    type: z.literal('splitPhaseTransformer'),
    id: idSchema,
    from: busSchema,
    primary: z.tuple([conductorSchema, conductorSchema]).meta({ description: 'HV conductors the primary winding sits between, e.g. ["a","n"] or ["a","b"].' }),
    to: busSchema,
    kva: posNum,
    kvHigh: posNum.meta({ description: 'Rated primary winding voltage, kV.' }),
    lowVolts: posNum.default(240).meta({ description: 'Rated full secondary winding voltage (leg to leg), V.' }),
    percentR: nonNegNum.optional(),
    percentX: nonNegNum.optional(),
    percentZ: posNum.optional(),
    xOverR: posNum.optional(),
    lvEarthing: earthingSchema.optional(),
  })
  .refine((t) => (t.percentZ !== undefined && t.xOverR !== undefined) !== (t.percentR !== undefined || t.percentX !== undefined), {
    message: 'give the leakage impedance as "percentR" and "percentX", or as "percentZ" and "xOverR"',
  })
  .refine(leakageAboveZero, { message: LEAKAGE_ZERO, path: ['percentX'] });

/** One phase of a load: an impedance, R/L/C at the study frequency, or P and Q at rated voltage. */
export const loadSpecSchema = z.union(
  [
    // A negative resistance is refused by the load schema (a refinement here would hide under the union's message).
    z.strictObject({ ohms: complexSchema }),
    z.strictObject({
      rOhms: nonNegNum.optional(),
      lHenry: nonNegNum.optional(),
      cFarad: posNum.optional(),
      arrangement: z.enum(['series', 'parallel']).default('series'),
    }),
    z.strictObject({
      kw: num,
      kvar: num.default(0),
      model: z
        .union([z.enum(['impedance', 'current', 'power']), z.strictObject({ z: nonNegNum, i: nonNegNum, p: nonNegNum })])
        .default('impedance'),
    }),
  ],
  { error: 'expected a load value { "ohms" }, { "rOhms", "lHenry", "cFarad", "arrangement" } or { "kw", "kvar", "model" }' },
);
export type LoadSpec = z.infer<typeof loadSpecSchema>;

export const loadSchema = z
  .strictObject({
    type: z.literal('load'),
    id: idSchema,
    bus: busSchema,
    connection: z.enum(['wye', 'wyeFloating', 'delta', 'single']),
    between: z.tuple([conductorSchema, conductorSchema]).optional().meta({ description: 'Single-phase loads: the two conductors.' }),
    kvLL: posNum.optional().meta({ description: 'Rated line-to-line voltage for kW/kvar values, kV (default: bus nominal).' }),
    ratedVolts: posNum.optional().meta({ description: 'Single-phase loads: rated voltage across the load, V.' }),
    each: loadSpecSchema.optional().meta({ description: 'The same value on every phase (kW/kvar per phase).' }),
    phases: z.partialRecord(z.enum(['a', 'b', 'c', 'ab', 'bc', 'ca']), loadSpecSchema).optional(),
    total: loadSpecSchema.optional().meta({ description: 'Three-phase total, split equally (kW/kvar only).' }),
    generation: z.boolean().optional().meta({ description: 'The element generates real power: its kW may be negative (power delivered to the bus). Without it a negative kW is refused.' }),
  })
  .superRefine((l, ctx) => {
    const specs: [PropertyKey[], LoadSpec | undefined][] = [[['each'], l.each], [['total'], l.total], ...Object.entries(l.phases ?? {}).map(([k, s]) => [['phases', k], s] as [PropertyKey[], LoadSpec | undefined])];
    for (const [path, spec] of specs) {
      if (spec && 'ohms' in spec && !isPassive(spec.ohms)) ctx.addIssue({ code: 'custom', path: [...path, 'ohms'], message: NEGATIVE_RESISTANCE });
      if (!l.generation && spec && 'kw' in spec && spec.kw < 0) ctx.addIssue({ code: 'custom', path: [...path, 'kw'], message: 'a load cannot take negative kW unless it is marked as generation' });
    }
  })
  .refine((l) => [l.each, l.phases, l.total].filter((x) => x !== undefined).length === 1, {
    message: 'give exactly one of "each", "phases" or "total"',
  })
  .refine((l) => (l.connection === 'single') === (l.between !== undefined), {
    message: '"between" is required for single-phase loads and only for them',
  });

export const capacitorBankSchema = z.strictObject({
  type: z.literal('capacitorBank'),
  id: idSchema,
  bus: busSchema,
  kvar: posNum.meta({ description: 'Three-phase rating at rated voltage, kvar.' }),
  kvLL: posNum.optional().meta({ description: 'Rated line-to-line voltage, kV (default: bus nominal).' }),
  connection: z.enum(['wye', 'wyeFloating', 'delta']).default('wye'),
});

export const faultSchema = z.strictObject({
  type: z.literal('fault'),
  id: idSchema,
  bus: busSchema,
  kind: z.enum(['threePhase', 'threePhaseEarth', 'lineEarth', 'lineLine', 'doubleLineEarth']),
  phases: z.array(z.enum(['a', 'b', 'c'])).optional().meta({ description: 'Faulted phases (default a for line-earth, b and c for line-line and double line-earth).' }),
  ohms: passiveComplexSchema.default(0).meta({ description: 'Fault impedance in each faulted phase, ohms (0 = bolted).' }),
  earthOhms: passiveComplexSchema.default(0).meta({ description: 'Impedance from the fault star point to earth, ohms.' }),
});

export const switch3Schema = z.strictObject({
  type: z.literal('switch3'),
  id: idSchema,
  from: busSchema,
  to: busSchema,
  conductors: z.array(conductorSchema).default(['a', 'b', 'c', 'n']),
  closed: z.boolean().default(true),
  open: z.array(conductorSchema).default([]).meta({ description: 'Conductors left open even when the switch is closed.' }),
});

export const earthingElectrodeSchema = z.strictObject({
  type: z.literal('earthing'),
  id: idSchema,
  node: nodeSchema.meta({ description: 'Node connected to earth, e.g. "B1.n".' }),
  ohms: passiveComplexSchema.meta({ description: 'Electrode resistance, ohms (0 = solid bond).' }),
});

export const blockSchemas = {
  source: sourceSchema,
  splitPhaseSource: splitPhaseSourceSchema,
  line: lineSchema,
  transformer: transformerSchema,
  splitPhaseTransformer: splitPhaseTransformerSchema,
  load: loadSchema,
  capacitorBank: capacitorBankSchema,
  fault: faultSchema,
  switch3: switch3Schema,
  earthing: earthingElectrodeSchema,
} as const;
