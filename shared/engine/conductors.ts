/**
 * Conductor letters of a three-phase bus and of a split-phase bus, and the phases. Kept apart from
 * the schemas (schema/common.ts re-exports them) so that code without zod can use them.
 */
export const CONDUCTORS = ['a', 'b', 'c', 'n', '1', '2'] as const;
export type Conductor = (typeof CONDUCTORS)[number];
export const PHASES = ['a', 'b', 'c'] as const;
export type Phase = (typeof PHASES)[number];
