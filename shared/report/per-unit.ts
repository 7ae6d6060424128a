/**
 * Per-unit bases of a study: one system base power (MVA) and a base voltage per voltage level
 * (kV line to line), each level's base taken from its nominal voltage unless the study sets it.
 * Conventions (P, the usual per-unit system of power-system texts):
 *   Z_base = kV_base² / MVA_base (Ω), I_base = MVA_base / (√3 · kV_base) (kA) on a three-phase level,
 *   V_base(line to neutral) = V_base(line to line) · V_LN,nom / V_LL,nom (1/√3 on a three-phase bus,
 *   1/2 on a split-phase bus), and an impedance given on one base moves to another by
 *   Z_new = Z_old · (kV_old / kV_new)² · (MVA_new / MVA_old).
 * The bases live in the study's layout beside the circuit (`content.layout.perUnit`, set in the
 * workspace's study settings), kept verbatim by the server.
 * Pure TypeScript: shared by the server (report, CSV) and the browser (tables, property panel).
 */
import { z } from 'zod';

/** Default system base when the study sets none, MVA (P: a round base near the ratings of a distribution study). */
export const DEFAULT_BASE_MVA = 1;

/** The stored setting: `{ baseMva, baseKv: { <level>: kV } }`, level = nominal line-to-line kV as text ("0.208"). */
export const perUnitSettingsSchema = z.object({
  baseMva: z.number().positive().max(1e6).default(DEFAULT_BASE_MVA),
  baseKv: z.record(z.string().max(40), z.number().positive().max(1e4)).default({}),
});
export type PerUnitSettings = z.infer<typeof perUnitSettingsSchema>;

/** Results shown in volts and amperes ('si') or in per unit of the study's bases ('pu'). */
export const RESULT_UNITS = ['si', 'pu'] as const;
export type ResultUnits = (typeof RESULT_UNITS)[number];

/** The name of a voltage level from its nominal line-to-line voltage in V: "0.208" (kV, six significant figures at most). */
export function levelKey(nominalVLL: number): string {
  return String(Number((nominalVLL / 1000).toPrecision(6)));
}

/** Reads the per-unit settings of a study's stored layout (defaults when absent or malformed). */
export function readPerUnitSettings(layout: unknown): PerUnitSettings {
  const raw = layout && typeof layout === 'object' ? (layout as { perUnit?: unknown }).perUnit : undefined;
  const parsed = perUnitSettingsSchema.safeParse(raw ?? {});
  return parsed.success ? parsed.data : perUnitSettingsSchema.parse({});
}

/** The bases of one voltage level. */
export interface LevelBase {
  /** Base voltage line to line, kV. */
  kvLL: number;
  /** System base, MVA. */
  mva: number;
  /** Base impedance, Ω. */
  zOhms: number;
  /** Base current (line current of a three-phase level), A. */
  amps: number;
}

/** Bases of a level at `kvLL` on `mva`: Z = kV²/MVA, I = MVA/(√3 kV). */
export function levelBase(kvLL: number, mva: number): LevelBase {
  return { kvLL, mva, zOhms: (kvLL * kvLL) / mva, amps: (mva * 1000) / (Math.sqrt(3) * kvLL) };
}

/** The base of a level with nominal line-to-line voltage `nominalVLL` (V): the study's override, else the nominal. */
export function baseOfLevel(s: PerUnitSettings, nominalVLL: number): LevelBase {
  return levelBase(s.baseKv[levelKey(nominalVLL)] ?? nominalVLL / 1000, s.baseMva);
}

/** An impedance in Ω in per unit of `base`. */
export function ohmsToPu(ohms: number, base: LevelBase): number {
  return ohms / base.zOhms;
}

/** A per-unit impedance moved from one base to another: Z·(kV_old/kV_new)²·(MVA_new/MVA_old). */
export function changeBase(zPu: number, from: { kv: number; mva: number }, to: { kv: number; mva: number }): number {
  return zPu * (from.kv / to.kv) ** 2 * (to.mva / from.mva);
}

/** The bus-level bases used in tables: V_LN base and V_LL base in V, I base in A. */
export interface BusBase {
  level: string;
  vLN: number;
  vLL: number;
  amps: number;
}

/** Bases of a bus from its nominal voltages (undefined when the bus has no nominal). */
export function busBase(s: PerUnitSettings, bus: { nominalVLL?: number; nominalVLN?: number }): BusBase | undefined {
  if (!bus.nominalVLL || !bus.nominalVLN) return undefined;
  const b = baseOfLevel(s, bus.nominalVLL);
  const vLL = b.kvLL * 1000;
  return { level: levelKey(bus.nominalVLL), vLL, vLN: vLL * (bus.nominalVLN / bus.nominalVLL), amps: b.amps };
}
