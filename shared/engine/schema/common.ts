/**
 * Schema pieces shared by the primitives and the building blocks: numbers, complex values,
 * node and bus names, earthing. zod 4 numbers already reject NaN and ±Infinity.
 */
import { z } from 'zod';
import { CONDUCTORS } from '../conductors.ts';

/** A finite number. */
export const num = z.number();
/** A strictly positive finite number. */
export const posNum = z.number().positive();
/** A finite number ≥ 0. */
export const nonNegNum = z.number().nonnegative();

/** Complex value: `{ "re", "im" }`, `{ "mag", "angleDeg" }`, or a plain number (real). */
export const complexSchema = z.union(
  [
    z.number(),
    z.strictObject({ re: z.number(), im: z.number() }),
    z.strictObject({ mag: z.number().nonnegative(), angleDeg: z.number() }),
  ],
  { error: 'expected a complex value: a number, { "re", "im" } or { "mag", "angleDeg" } with finite numbers' },
).meta({ description: 'Complex value: a real number, {re, im} or {mag, angleDeg} (degrees).' });
export type ComplexInput = z.infer<typeof complexSchema>;

/** Real part of a complex input. */
export function realPart(v: ComplexInput): number {
  if (typeof v === 'number') return v;
  if ('re' in v) return v.re;
  return v.mag * Math.cos((v.angleDeg * Math.PI) / 180);
}

/** True when the real part is not negative (a magnitude∠±90° with rounding counts as zero). */
export function isPassive(v: ComplexInput): boolean {
  const re = realPart(v);
  const mag = typeof v === 'number' ? Math.abs(v) : 're' in v ? Math.hypot(v.re, v.im) : v.mag;
  return re >= -1e-12 * mag;
}

/** Message for an impedance with a negative real part. */
export const NEGATIVE_RESISTANCE = 'an impedance cannot have a negative resistance (real part): a passive element only absorbs power';

/** A passive impedance: a complex value whose real part (resistance) is not negative. */
export const passiveComplexSchema = complexSchema.refine(isPassive, { error: NEGATIVE_RESISTANCE });

/** Element id: non-empty. */
export const idSchema = z.string().min(1, 'an id must not be empty');
/** Node name: any non-empty string; "earth" is the reference. */
export const nodeSchema = z.string().min(1, 'a node name must not be empty');
/** Bus name: non-empty, no dots or spaces (a bus B has conductor nodes B.a, B.b, B.c, B.n, B.1, B.2). */
export const busSchema = z
  .string()
  .min(1, 'a bus name must not be empty')
  .regex(/^[^.\s]+$/, 'a bus name must not contain dots or spaces')
  .refine((s) => s !== 'earth', 'a bus cannot be named "earth"');

/** Conductor letters of a three-phase bus and of a split-phase bus (../conductors.ts). */
export { CONDUCTORS, PHASES, type Conductor, type Phase } from '../conductors.ts';
export const conductorSchema = z.enum(CONDUCTORS);

/** Earthing of a star point: solid, unearthed, or through an impedance (ohms). */
export const earthingSchema = z
  .union([z.enum(['solid', 'unearthed']), z.strictObject({ ohms: passiveComplexSchema })], {
    error: 'expected earthing "solid", "unearthed" or { "ohms": complex }',
  })
  .meta({ description: 'Star-point earthing: "solid", "unearthed" or {ohms} (through an impedance).' });
export type EarthingInput = z.infer<typeof earthingSchema>;
