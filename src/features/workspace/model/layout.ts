/**
 * What a study stores beside its circuit (`content.layout`): where each canvas node sits, which
 * bus handle each connection uses and its open conductors, the viewport, and the study settings
 * the circuit format has no field for (transformer-shift convention, wiring-colour standard).
 * The circuit stays the source of truth for the network; the layout only places it.
 */
import { z } from 'zod';
import { perUnitSettingsSchema, type PerUnitSettings } from '../../../../shared/report/per-unit.ts';

export const WIRING_STANDARDS = ['iec-60445', 'north-american'] as const;
export type WiringStandard = (typeof WIRING_STANDARDS)[number];
export const SHIFT_CONVENTIONS = ['north-american', 'iec'] as const;
export type ShiftConvention = (typeof SHIFT_CONVENTIONS)[number];

const xy = z.object({ x: z.number(), y: z.number() });
const conductor = z.enum(['a', 'b', 'c', 'n', '1', '2']);

export const workspaceLayoutSchema = z.object({
  kind: z.literal('wyeward-layout'),
  version: z.literal(1),
  /** Node positions, keyed `bus:<name>` for buses and by element id for elements. */
  positions: z.record(z.string(), xy).default({}),
  /** Per connection (edge id `<elementId>:<port>`): the bus handle used and its open conductors. */
  edges: z.record(z.string(), z.object({ busHandle: z.string().optional(), open: z.array(conductor).optional() })).default({}),
  viewport: z.object({ x: z.number(), y: z.number(), zoom: z.number().positive() }).optional(),
  /** Convention new transformers get and results state (IEC clock number or North American rule). */
  shiftConvention: z.enum(SHIFT_CONVENTIONS).default('north-american'),
  /** Phase colours on the canvas and in results. */
  wiringStandard: z.enum(WIRING_STANDARDS).default('north-american'),
  /** Per-unit bases of the results (system MVA, base kV per voltage level); absent: 1 MVA and the nominal voltages. */
  perUnit: perUnitSettingsSchema.optional(),
});
export type WorkspaceLayout = z.infer<typeof workspaceLayoutSchema>;

/** Reads a stored layout, or null when there is none or it is not ours (the canvas then lays the circuit out itself). */
export function readLayout(raw: unknown): WorkspaceLayout | null {
  const parsed = workspaceLayoutSchema.safeParse(raw);
  return parsed.success ? parsed.data : null;
}

/** Study-wide settings edited in the settings dialog. */
export interface StudySettings {
  frequencyHz: number;
  sequence: 'ABC' | 'ACB';
  /** Limit set and overrides, as the circuit stores them. */
  limits?: { set: 'ansi-c84.1' | 'iec-en'; [k: string]: unknown };
  name?: string;
  description?: string;
  shiftConvention: ShiftConvention;
  wiringStandard: WiringStandard;
  /** Per-unit bases (absent: the defaults of shared/report/per-unit.ts). */
  perUnit?: PerUnitSettings;
  /** The circuit's study cases, carried through the canvas unchanged (edited elsewhere). */
  cases?: unknown[];
}

/** Settings of a new study: 60 Hz, ABC, ANSI C84.1 limits, North American practice. */
export function defaultSettings(): StudySettings {
  return { frequencyHz: 60, sequence: 'ABC', shiftConvention: 'north-american', wiringStandard: 'north-american' };
}
