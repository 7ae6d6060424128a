/**
 * Test helper: how a transformer bank's windings sit on its terminals, worked out independently of
 * the engine (shared/engine/blocks/transformer.ts) from the definition of the clock number.
 */

/** Parsed vector group or North American connection: winding kinds, neutrals brought out, clock. */
export interface Group {
  hv: 'Y' | 'D';
  lv: 'Y' | 'D';
  hvN: boolean;
  lvN: boolean;
  clock: number;
}

/**
 * (V) IEC 60076-1 clock notation: the LV phasors lag the HV ones by clock × 30°.
 * (M) IEEE C57.12.00 for North American connections: the low side lags the high side by 30° for
 * Δ–Y and Y–Δ, 0° for Y–Y and Δ–Δ ("Yg" = earthed wye, neutral brought out).
 */
export function parseGroup(t: { vectorGroup?: string; connection?: string }): Group {
  if (t.vectorGroup) {
    const m = /^(YN|Y|D)(yn|y|d)(\d+)$/.exec(t.vectorGroup)!;
    return { hv: m[1] === 'D' ? 'D' : 'Y', lv: m[2] === 'd' ? 'D' : 'Y', hvN: m[1] === 'YN', lvN: m[2] === 'yn', clock: Number(m[3]) };
  }
  const [h, l] = t.connection!.split('-');
  const hv = h === 'D' ? 'D' : 'Y';
  const lv = l === 'D' ? 'D' : 'Y';
  return { hv, lv, hvN: h === 'Yg', lvN: l === 'Yg', clock: hv !== lv ? 1 : 0 };
}

/**
 * Windings of the bank for an ABC system: unit k has its HV winding fixed — wye: phase k to the
 * star (index 3), delta: phase k to phase k+1 — and its LV winding on the pair of LV terminals whose
 * voltage is in phase with that HV winding once the LV terminals lag by clock × 30°. Worked out here
 * in closed form (angles in multiples of 30°), from the HV side, unlike the engine which searches
 * from the LV side. The shift this wiring produces is checked on its own against ngspice.
 */
export function lvWindingsFor(g: Group): { hv: [number, number]; lv: [number, number] }[] {
  const mod = (x: number, m: number) => ((x % m) + m) % m;
  return [0, 1, 2].map((k) => {
    // HV winding angle in units of 30°: wye Vk at −4k; delta Vk − Vk+1 at 1 − 4k.
    const hv: [number, number] = g.hv === 'Y' ? [k, 3] : [k, (k + 1) % 3];
    const theta = g.hv === 'Y' ? -4 * k : 1 - 4 * k;
    // LV terminal p sits at −clock − 4p; wye winding p→star at that angle, star→p at +6;
    // delta winding p→p+1 at −clock − 4p + 1, its reverse p+1→p at +6.
    for (let p = 0; p < 3; p++) {
      if (g.lv === 'Y') {
        if (mod(-g.clock - 4 * p - theta, 12) === 0) return { hv, lv: [p, 3] as [number, number] };
        if (mod(-g.clock - 4 * p + 6 - theta, 12) === 0) return { hv, lv: [3, p] as [number, number] };
      } else {
        if (mod(-g.clock - 4 * p + 1 - theta, 12) === 0) return { hv, lv: [p, (p + 1) % 3] as [number, number] };
        if (mod(-g.clock - 4 * p + 7 - theta, 12) === 0) return { hv, lv: [(p + 1) % 3, p] as [number, number] };
      }
    }
    throw new Error(`no LV winding for ${JSON.stringify(g)}`);
  });
}
