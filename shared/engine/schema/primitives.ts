/** Schemas of the primitive elements, exactly the shapes of `types.ts`. */
import { z } from 'zod';
import { complexSchema, idSchema, nodeSchema, posNum, nonNegNum } from './common.ts';

export const impedanceSchema = z.strictObject({
  type: z.literal('impedance'),
  id: idSchema,
  from: nodeSchema,
  to: nodeSchema,
  ohms: complexSchema,
});

export const voltageSourceSchema = z.strictObject({
  type: z.literal('voltageSource'),
  id: idSchema,
  plus: nodeSchema,
  minus: nodeSchema,
  volts: complexSchema,
  seriesOhms: complexSchema.optional(),
});

export const currentSourceSchema = z.strictObject({
  type: z.literal('currentSource'),
  id: idSchema,
  from: nodeSchema,
  to: nodeSchema,
  amps: complexSchema,
});

export const coupledBranchSchema = z.strictObject({
  type: z.literal('coupledBranch'),
  id: idSchema,
  from: z.array(nodeSchema).min(1),
  to: z.array(nodeSchema).min(1),
  ohms: z.array(z.array(complexSchema)),
});

export const switchSchema = z.strictObject({
  type: z.literal('switch'),
  id: idSchema,
  from: nodeSchema,
  to: nodeSchema,
  closed: z.boolean(),
});

export const admittanceMatrixSchema = z.strictObject({
  type: z.literal('admittanceMatrix'),
  id: idSchema,
  nodes: z.array(nodeSchema).min(1),
  siemens: z.array(z.array(complexSchema)),
});

export const zipLoadSchema = z.strictObject({
  type: z.literal('zipLoad'),
  id: idSchema,
  from: nodeSchema,
  to: nodeSchema,
  ratedVolts: posNum,
  ratedVA: complexSchema,
  zip: z.strictObject({ z: nonNegNum, i: nonNegNum, p: nonNegNum }).optional(),
});

export const primitiveSchemas = {
  impedance: impedanceSchema,
  voltageSource: voltageSourceSchema,
  currentSource: currentSourceSchema,
  coupledBranch: coupledBranchSchema,
  switch: switchSchema,
  admittanceMatrix: admittanceMatrixSchema,
  zipLoad: zipLoadSchema,
} as const;
