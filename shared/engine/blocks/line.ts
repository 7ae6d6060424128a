/**
 * Line or cable between two buses.
 *
 * Expansion: one coupled branch `<id>/series` from the `from` conductors to the `to` conductors
 * with Z = (per-length matrix) × length, and, with shunt data, half of Y = (per-length) × length
 * as an admittance stamp to earth at each end (`<id>/shunt-from`, `<id>/shunt-to`: nominal π).
 * Per-length impedance and shunt data are per `perLengthUnit` (default: `lengthUnit`), converted here
 * to per `lengthUnit`, so changing one unit never reinterprets the other (Carson data in Kersting's
 * Ω/mile and feet, converted):
 * - perConductor: a diagonal matrix (no mutual coupling);
 * - matrix: the full n×n matrix in the order of `conductors`;
 * - sequence: Zs = (Z0 + 2Z1)/3, Zm = (Z0 − Z1)/3 on a, b, c (+ an uncoupled neutral if given);
 * - carson: modified Carson equations (./carson.ts), optionally Kron-reducing the neutral.
 * `open` conductors are removed from the series and shunt models (their current is zero, so their
 * mutual terms drop out): this is how an open neutral or an open phase is modelled.
 */
import type { Cx } from '../types.ts';
import { InvalidCircuitError } from '../errors.ts';
import { add, scale, sub, ZERO } from '../phasor.ts';
import { toCx } from '../schema/to-cx.ts';
import { CONDUCTORS } from '../schema/common.ts';
import { METRES_PER, type PerLengthUnit } from '../schema/blocks.ts';
import type { Circuit } from '../schema/circuit.ts';
import { carsonPrimitiveMatrix, kronReduce } from './carson.ts';
import { busNode, type ExpandContext, type Expansion, type TaggedPrimitive } from './expansion.ts';

type LineElement = Extract<Circuit['elements'][number], { type: 'line' }>;

/** Per-length data given per `per` expressed per `unit`: multiply by this (lengths in metres, e.g. Ω/km → Ω/m is 1/1000). */
function perLengthFactor(per: PerLengthUnit, unit: PerLengthUnit): number {
  return METRES_PER[unit] / METRES_PER[per];
}

function fail(el: LineElement, msg: string): never {
  throw new InvalidCircuitError(`line ${el.id}: ${msg}`, [], { elementIds: [el.id] });
}

/** Conductors and per-length series matrix of a line (Ω per `lengthUnit`, whatever unit the data are given per). */
export function linePerLengthMatrix(el: LineElement, frequencyHz: number): { conductors: string[]; z: Cx[][] } {
  const { conductors, z } = givenPerLengthMatrix(el, frequencyHz);
  const k = el.impedance.kind === 'carson' ? perLengthFactor('mi', el.lengthUnit) : perLengthFactor(el.perLengthUnit ?? el.lengthUnit, el.lengthUnit);
  return { conductors, z: k === 1 ? z : z.map((r) => r.map((v) => scale(v, k))) };
}

/** The series matrix as given: Ω per `perLengthUnit` (Carson: Ω/mile). */
function givenPerLengthMatrix(el: LineElement, frequencyHz: number): { conductors: string[]; z: Cx[][] } {
  const imp = el.impedance;
  switch (imp.kind) {
    case 'perConductor': {
      const conductors = CONDUCTORS.filter((c) => imp.ohmsPerLength[c] !== undefined);
      if (conductors.length === 0) fail(el, 'give the impedance of at least one conductor');
      return { conductors, z: conductors.map((ci) => conductors.map((cj) => (ci === cj ? toCx(imp.ohmsPerLength[ci]!) : ZERO))) };
    }
    case 'matrix': {
      const n = imp.conductors.length;
      if (new Set(imp.conductors).size !== n) fail(el, 'the matrix conductors must be distinct');
      if (imp.ohmsPerLength.length !== n || imp.ohmsPerLength.some((r) => r.length !== n)) fail(el, `the impedance matrix must be ${n}×${n} (one row and column per conductor)`);
      return { conductors: [...imp.conductors], z: imp.ohmsPerLength.map((r) => r.map(toCx)) };
    }
    case 'sequence': {
      const z1 = toCx(imp.z1PerLength);
      const z0 = toCx(imp.z0PerLength);
      const zs = scale(add(z0, scale(z1, 2)), 1 / 3);
      const zm = scale(sub(z0, z1), 1 / 3);
      const z = [0, 1, 2].map((i) => [0, 1, 2].map((j) => (i === j ? zs : zm)));
      if (imp.neutralOhmsPerLength === undefined) return { conductors: ['a', 'b', 'c'], z };
      const zn = toCx(imp.neutralOhmsPerLength);
      return { conductors: ['a', 'b', 'c', 'n'], z: [...z.map((r) => [...r, ZERO]), [ZERO, ZERO, ZERO, zn]] };
    }
    case 'carson': {
      const names = imp.conductors.map((c) => c.conductor);
      if (new Set(names).size !== names.length) fail(el, 'the Carson conductors must be distinct');
      for (let i = 0; i < imp.conductors.length; i++)
        for (let j = i + 1; j < imp.conductors.length; j++)
          if (imp.conductors[i].xFt === imp.conductors[j].xFt && imp.conductors[i].yFt === imp.conductors[j].yFt) fail(el, `conductors ${names[i]} and ${names[j]} sit at the same position`);
      let z = carsonPrimitiveMatrix(imp.conductors, frequencyHz, imp.earthResistivityOhmM);
      let conductors = names;
      if (imp.kronReduceNeutral) {
        const k = names.indexOf('n');
        if (k < 0) fail(el, 'Kron reduction needs a neutral conductor "n"');
        z = kronReduce(z, k);
        conductors = names.filter((c) => c !== 'n');
      }
      return { conductors, z };
    }
  }
}

/** Expand a line into a coupled series branch and optional π shunt admittances. */
export function expandLine(el: LineElement, ctx: ExpandContext): Expansion {
  const { conductors, z } = linePerLengthMatrix(el, ctx.frequencyHz);
  for (const c of el.open) if (!conductors.includes(c)) fail(el, `cannot open conductor "${c}": the line has conductors ${conductors.join(', ')}`);
  const keep = conductors.map((_, i) => i).filter((i) => !el.open.includes(conductors[i] as (typeof el.open)[number]));
  const prims: TaggedPrimitive[] = [];
  if (keep.length > 0) {
    const zTot = keep.map((i) => keep.map((j) => scale(z[i][j], el.length)));
    keep.forEach((i) => {
      if (zTot[keep.indexOf(i)][keep.indexOf(i)].re === 0 && zTot[keep.indexOf(i)][keep.indexOf(i)].im === 0) fail(el, `conductor ${conductors[i]} has zero self impedance`);
    });
    prims.push({
      prim: { type: 'coupledBranch', id: `${el.id}/series`, from: keep.map((i) => busNode(el.from, conductors[i])), to: keep.map((i) => busNode(el.to, conductors[i])), ohms: zTot },
    });
  }
  if (el.shunt) {
    const y = el.shunt.siemensPerLength;
    const n = conductors.length;
    if (y.length !== n || y.some((r) => r.length !== n)) fail(el, `the shunt matrix must be ${n}×${n} in the order ${conductors.join(', ')}`);
    if (keep.length > 0) {
      // Shunt data per `perLengthUnit` (default `lengthUnit`); length in metres over metres per that unit.
      const lengthInPer = el.length * perLengthFactor(el.perLengthUnit ?? el.lengthUnit, el.lengthUnit);
      const half = keep.map((i) => keep.map((j) => scale(toCx(y[i][j]), lengthInPer / 2)));
      for (const [end, bus] of [['from', el.from], ['to', el.to]] as const) {
        prims.push({ prim: { type: 'admittanceMatrix', id: `${el.id}/shunt-${end}`, nodes: keep.map((i) => busNode(bus, conductors[i])), siemens: half } });
      }
    }
  }
  return {
    id: el.id,
    type: 'line',
    category: 'series',
    primitives: prims,
    ports: [
      { bus: el.from, conductors, nodes: conductors.map((c) => busNode(el.from, c)) },
      { bus: el.to, conductors, nodes: conductors.map((c) => busNode(el.to, c)) },
    ],
    currentDirection: 'into-element',
  };
}
