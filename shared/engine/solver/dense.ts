/**
 * Small dense complex matrices (a few rows: coupled-branch impedance matrices, the border of
 * deferred pivots). Stored as separate re/im Float64Arrays, row-major.
 */

/** A dense n×n complex matrix, row-major, separate real and imaginary parts. */
export interface DenseCx {
  n: number;
  re: Float64Array;
  im: Float64Array;
}

/** Make an n×n zero complex matrix. */
export function denseZeros(n: number): DenseCx {
  return { n, re: new Float64Array(n * n), im: new Float64Array(n * n) };
}

/**
 * Invert a small complex matrix by Gauss–Jordan elimination with partial pivoting.
 * Returns null when a pivot falls below `relTol` × the largest entry (numerically singular).
 */
export function denseInverse(a: DenseCx, relTol = 1e-13): DenseCx | null {
  const n = a.n;
  const m = 2 * n; // augmented [A | I]
  const re = new Float64Array(n * m);
  const im = new Float64Array(n * m);
  let scale = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      re[i * m + j] = a.re[i * n + j];
      im[i * m + j] = a.im[i * n + j];
      scale = Math.max(scale, Math.hypot(a.re[i * n + j], a.im[i * n + j]));
    }
    re[i * m + n + i] = 1;
  }
  if (!(scale > 0)) return null;
  for (let k = 0; k < n; k++) {
    // partial pivoting: largest magnitude in column k at or below row k
    let piv = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      const mag = Math.hypot(re[i * m + k], im[i * m + k]);
      if (mag > best) {
        best = mag;
        piv = i;
      }
    }
    if (best <= relTol * scale) return null;
    if (piv !== k) {
      for (let j = 0; j < m; j++) {
        let t = re[k * m + j];
        re[k * m + j] = re[piv * m + j];
        re[piv * m + j] = t;
        t = im[k * m + j];
        im[k * m + j] = im[piv * m + j];
        im[piv * m + j] = t;
      }
    }
    // scale pivot row by 1/pivot
    const pr = re[k * m + k];
    const pi = im[k * m + k];
    const d = pr * pr + pi * pi;
    const ir = pr / d;
    const ii = -pi / d;
    for (let j = 0; j < m; j++) {
      const xr = re[k * m + j];
      const xi = im[k * m + j];
      re[k * m + j] = xr * ir - xi * ii;
      im[k * m + j] = xr * ii + xi * ir;
    }
    // eliminate column k from every other row
    for (let i = 0; i < n; i++) {
      if (i === k) continue;
      const fr = re[i * m + k];
      const fi = im[i * m + k];
      if (fr === 0 && fi === 0) continue;
      for (let j = 0; j < m; j++) {
        const xr = re[k * m + j];
        const xi = im[k * m + j];
        re[i * m + j] -= fr * xr - fi * xi;
        im[i * m + j] -= fr * xi + fi * xr;
      }
    }
  }
  const out = denseZeros(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      out.re[i * n + j] = re[i * m + n + j];
      out.im[i * n + j] = im[i * m + n + j];
    }
  }
  return out;
}

let scratchRe = new Float64Array(64);
let scratchIm = new Float64Array(64);

/**
 * Invert the n×n complex matrix stored row-major at offset `aOff` of (aRe, aIm) into (outRe, outIm)
 * at `outOff`, by Gauss–Jordan elimination with partial pivoting, without allocating (the hot path
 * of coupled-branch stamps). Returns false when a pivot falls below `relTol` × the largest entry.
 */
export function denseInverseInto(
  n: number,
  aRe: Float64Array,
  aIm: Float64Array,
  aOff: number,
  outRe: Float64Array,
  outIm: Float64Array,
  outOff: number,
  relTol = 1e-13,
): boolean {
  const m = 2 * n;
  if (scratchRe.length < n * m) {
    scratchRe = new Float64Array(n * m);
    scratchIm = new Float64Array(n * m);
  }
  const re = scratchRe;
  const im = scratchIm;
  let scale = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const xr = aRe[aOff + i * n + j];
      const xi = aIm[aOff + i * n + j];
      re[i * m + j] = xr;
      im[i * m + j] = xi;
      re[i * m + n + j] = i === j ? 1 : 0;
      im[i * m + n + j] = 0;
      const mag = Math.abs(xr) + Math.abs(xi);
      if (mag > scale) scale = mag;
    }
  }
  if (!(scale > 0)) return false;
  for (let k = 0; k < n; k++) {
    let piv = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      const mag = Math.abs(re[i * m + k]) + Math.abs(im[i * m + k]);
      if (mag > best) {
        best = mag;
        piv = i;
      }
    }
    if (best <= relTol * scale) return false;
    if (piv !== k) {
      for (let j = 0; j < m; j++) {
        let t = re[k * m + j];
        re[k * m + j] = re[piv * m + j];
        re[piv * m + j] = t;
        t = im[k * m + j];
        im[k * m + j] = im[piv * m + j];
        im[piv * m + j] = t;
      }
    }
    const pr = re[k * m + k];
    const pi = im[k * m + k];
    const d = pr * pr + pi * pi;
    const ir = pr / d;
    const ii = -pi / d;
    for (let j = 0; j < m; j++) {
      const xr = re[k * m + j];
      const xi = im[k * m + j];
      re[k * m + j] = xr * ir - xi * ii;
      im[k * m + j] = xr * ii + xi * ir;
    }
    for (let i = 0; i < n; i++) {
      if (i === k) continue;
      const fr = re[i * m + k];
      const fi = im[i * m + k];
      if (fr === 0 && fi === 0) continue;
      for (let j = 0; j < m; j++) {
        const xr = re[k * m + j];
        const xi = im[k * m + j];
        re[i * m + j] -= fr * xr - fi * xi;
        im[i * m + j] -= fr * xi + fi * xr;
      }
    }
  }
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      outRe[outOff + i * n + j] = re[i * m + n + j];
      outIm[outOff + i * n + j] = im[i * m + n + j];
    }
  return true;
}

/**
 * LU with complete pivoting of a small complex matrix, revealing its numerical rank.
 * Pivots below `absTol` are treated as zero; the columns left without a pivot span the null space.
 */
export interface RankRevealingLu {
  n: number;
  rank: number;
  /** Row permutation: row k of the factor is original row rowPerm[k]. */
  rowPerm: Int32Array;
  /** Column permutation: column k of the factor is original column colPerm[k]. */
  colPerm: Int32Array;
  /** Factor in place: strictly lower part L (unit diagonal), upper part U; row-major over permuted indices. */
  re: Float64Array;
  im: Float64Array;
}

/** Factor P·A·Q = L·U with complete pivoting, stopping at the first pivot ≤ absTol (numerical rank). */
export function rankRevealingLu(a: DenseCx, absTol: number): RankRevealingLu {
  const n = a.n;
  const re = Float64Array.from(a.re);
  const im = Float64Array.from(a.im);
  const rowPerm = Int32Array.from({ length: n }, (_, i) => i);
  const colPerm = Int32Array.from({ length: n }, (_, i) => i);
  let rank = 0;
  for (let k = 0; k < n; k++) {
    let bi = k;
    let bj = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      for (let j = k; j < n; j++) {
        const mag = Math.hypot(re[i * n + j], im[i * n + j]);
        if (mag > best) {
          best = mag;
          bi = i;
          bj = j;
        }
      }
    }
    if (!(best > absTol)) break;
    swapRows(re, im, n, k, bi);
    swapCols(re, im, n, k, bj);
    [rowPerm[k], rowPerm[bi]] = [rowPerm[bi], rowPerm[k]];
    [colPerm[k], colPerm[bj]] = [colPerm[bj], colPerm[k]];
    const pr = re[k * n + k];
    const pi = im[k * n + k];
    const d = pr * pr + pi * pi;
    for (let i = k + 1; i < n; i++) {
      // l = a[i,k] / pivot
      const xr = re[i * n + k];
      const xi = im[i * n + k];
      const lr = (xr * pr + xi * pi) / d;
      const li = (xi * pr - xr * pi) / d;
      re[i * n + k] = lr;
      im[i * n + k] = li;
      for (let j = k + 1; j < n; j++) {
        const ur = re[k * n + j];
        const ui = im[k * n + j];
        re[i * n + j] -= lr * ur - li * ui;
        im[i * n + j] -= lr * ui + li * ur;
      }
    }
    rank++;
  }
  return { n, rank, rowPerm, colPerm, re, im };
}

function swapRows(re: Float64Array, im: Float64Array, n: number, a: number, b: number): void {
  if (a === b) return;
  for (let j = 0; j < n; j++) {
    let t = re[a * n + j];
    re[a * n + j] = re[b * n + j];
    re[b * n + j] = t;
    t = im[a * n + j];
    im[a * n + j] = im[b * n + j];
    im[b * n + j] = t;
  }
}

function swapCols(re: Float64Array, im: Float64Array, n: number, a: number, b: number): void {
  if (a === b) return;
  for (let i = 0; i < n; i++) {
    let t = re[i * n + a];
    re[i * n + a] = re[i * n + b];
    re[i * n + b] = t;
    t = im[i * n + a];
    im[i * n + a] = im[i * n + b];
    im[i * n + b] = t;
  }
}

/**
 * Solve A·x = b on the rank-r leading block of a rank-revealing LU; the unknowns of the columns
 * without a pivot are set to 0 (they are the grounded directions). b and the result are in original indexing.
 */
export function rankRevealingSolve(f: RankRevealingLu, bRe: Float64Array, bIm: Float64Array): { re: Float64Array; im: Float64Array } {
  const { n, rank, re, im } = f;
  const yr = new Float64Array(n);
  const yi = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    yr[k] = bRe[f.rowPerm[k]];
    yi[k] = bIm[f.rowPerm[k]];
  }
  // forward substitution L·y = P·b (only the first `rank` rows matter)
  for (let k = 0; k < rank; k++) {
    for (let i = k + 1; i < rank; i++) {
      const lr = re[i * n + k];
      const li = im[i * n + k];
      yr[i] -= lr * yr[k] - li * yi[k];
      yi[i] -= lr * yi[k] + li * yr[k];
    }
  }
  // back substitution U11·z = y, free part of z = 0
  const zr = new Float64Array(n);
  const zi = new Float64Array(n);
  for (let k = rank - 1; k >= 0; k--) {
    let sr = yr[k];
    let si = yi[k];
    for (let j = k + 1; j < rank; j++) {
      const ur = re[k * n + j];
      const ui = im[k * n + j];
      sr -= ur * zr[j] - ui * zi[j];
      si -= ur * zi[j] + ui * zr[j];
    }
    const pr = re[k * n + k];
    const pi = im[k * n + k];
    const d = pr * pr + pi * pi;
    zr[k] = (sr * pr + si * pi) / d;
    zi[k] = (si * pr - sr * pi) / d;
  }
  const outRe = new Float64Array(n);
  const outIm = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    outRe[f.colPerm[k]] = zr[k];
    outIm[f.colPerm[k]] = zi[k];
  }
  return { re: outRe, im: outIm };
}

/**
 * A basis of the null space of A from its rank-revealing LU: one vector per column without a pivot
 * (that column's entry is 1, the other free entries 0). Vectors in original column indexing; `free`
 * is the original column index each vector was built on.
 */
export function rankRevealingNullSpace(f: RankRevealingLu): { free: number; re: Float64Array; im: Float64Array }[] {
  const { n, rank, re, im } = f;
  const out: { free: number; re: Float64Array; im: Float64Array }[] = [];
  for (let fcol = rank; fcol < n; fcol++) {
    const zr = new Float64Array(n);
    const zi = new Float64Array(n);
    zr[fcol] = 1;
    // U11·z1 = −U12·e_f
    for (let k = rank - 1; k >= 0; k--) {
      let sr = -re[k * n + fcol];
      let si = -im[k * n + fcol];
      for (let j = k + 1; j < rank; j++) {
        const ur = re[k * n + j];
        const ui = im[k * n + j];
        sr -= ur * zr[j] - ui * zi[j];
        si -= ur * zi[j] + ui * zr[j];
      }
      const pr = re[k * n + k];
      const pi = im[k * n + k];
      const d = pr * pr + pi * pi;
      zr[k] = (sr * pr + si * pi) / d;
      zi[k] = (si * pr - sr * pi) / d;
    }
    const vr = new Float64Array(n);
    const vi = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      vr[f.colPerm[k]] = zr[k];
      vi[f.colPerm[k]] = zi[k];
    }
    out.push({ free: f.colPerm[fcol], re: vr, im: vi });
  }
  return out;
}
