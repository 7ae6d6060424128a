/** Modified Carson equations and Kron reduction (REFERENCES.md constants; Kersting ch. 4 example). */
import { describe, expect, it } from 'vitest';
import { carsonPrimitiveMatrix, kronReduce, solveCircuit } from '../../../../shared/engine/index.ts';

// Kersting, Distribution System Modeling and Analysis, ch. 4, Example 4.1 configuration (M: recalled):
// a, b, c at 29 ft on a crossarm at x = 0, 2.5, 7 ft; neutral at (4, 25) ft; 336,400 26/7 ACSR phases
// (GMR 0.0244 ft, 0.306 Ω/mile), 4/0 6/1 ACSR neutral (GMR 0.00814 ft, 0.592 Ω/mile); 60 Hz, 100 Ω·m.
const conductors = [
  { conductor: 'a', xFt: 0, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
  { conductor: 'b', xFt: 2.5, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
  { conductor: 'c', xFt: 7, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
  { conductor: 'n', xFt: 4, yFt: 25, gmrFt: 0.00814, rOhmsPerMile: 0.592 },
];

describe('modified Carson equations', () => {
  const z = carsonPrimitiveMatrix(conductors, 60, 100);
  it('60 Hz, 100 Ω·m constants: z_ii = r + 0.09530 + j0.12134·[ln(1/GMR) + 7.93402] (V: Kersting ch. 4 via REFERENCES.md)', () => {
    expect(z[0][0].re).toBeCloseTo(0.306 + 0.0953, 4);
    expect(z[0][0].im).toBeCloseTo(0.12134 * (Math.log(1 / 0.0244) + 7.93402), 4);
    expect(z[0][1].im).toBeCloseTo(0.12134 * (Math.log(1 / 2.5) + 7.93402), 4);
  });
  it('primitive terms z_aa 0.4013 + j1.4133, z_ab 0.0953 + j0.8515, z_nn 0.6873 + j1.5465 Ω/mile (M: Kersting Example 4.1)', () => {
    expect(z[0][0].re).toBeCloseTo(0.4013, 4);
    expect(z[0][0].im).toBeCloseTo(1.4133, 4);
    expect(z[0][1].re).toBeCloseTo(0.0953, 4);
    expect(z[0][1].im).toBeCloseTo(0.8515, 4);
    expect(z[3][3].re).toBeCloseTo(0.6873, 4);
    expect(z[3][3].im).toBeCloseTo(1.5465, 4);
  });
  it('Kron-reduced z_abc: aa 0.4576 + j1.0780, ab 0.1560 + j0.5017, ac 0.1535 + j0.3849, bb 0.4666 + j1.0482, bc 0.1580 + j0.4236, cc 0.4615 + j1.0651 Ω/mile (M: Kersting Example 4.1)', () => {
    const zr = kronReduce(z, 3);
    const expected = [
      [0, 0, 0.4576, 1.078],
      [0, 1, 0.156, 0.5017],
      [0, 2, 0.1535, 0.3849],
      [1, 1, 0.4666, 1.0482],
      [1, 2, 0.158, 0.4236],
      [2, 2, 0.4615, 1.0651],
    ];
    for (const [i, j, re, im] of expected) {
      // 4 printed decimals: tolerance 1e-4 (recalled values, M)
      expect(Math.abs(zr[i][j].re - re), `re z${i}${j}`).toBeLessThanOrEqual(1e-4);
      expect(Math.abs(zr[i][j].im - im), `im z${i}${j}`).toBeLessThanOrEqual(1e-4);
      expect(zr[j][i]).toEqual(zr[i][j]);
    }
  });
  it('a line built from Carson data matches the same matrix given explicitly (P)', () => {
    const file = (impedance: object) => ({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 60,
      elements: [
        { type: 'source', id: 'S', bus: 'A', kvLL: 12.47 },
        { type: 'line', id: 'L', from: 'A', to: 'B', length: 1, lengthUnit: 'mi', impedance },
        { type: 'load', id: 'LD', bus: 'B', connection: 'wye', phases: { a: { kw: 1000, kvar: 400 }, b: { kw: 700, kvar: 300 }, c: { kw: 900, kvar: 200 } } },
        { type: 'earthing', id: 'E', node: 'B.n', ohms: 10 },
      ],
    });
    const a = solveCircuit(file({ kind: 'carson', conductors }));
    const b = solveCircuit(file({ kind: 'matrix', conductors: ['a', 'b', 'c', 'n'], ohmsPerLength: z }));
    for (const node of ['B.a', 'B.b', 'B.c', 'B.n']) {
      expect(Math.hypot(a.nodes[node].re - b.nodes[node].re, a.nodes[node].im - b.nodes[node].im)).toBeLessThan(1e-9 * 7200);
    }
  });
});
