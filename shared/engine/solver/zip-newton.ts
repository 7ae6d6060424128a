/**
 * Newton's method for voltage-dependent (zip) loads, on the loads' terminal voltages only, with
 * natural-parameter continuation in the load level when Newton alone does not converge.
 *
 * Reduction (why): with the network factor M (loads at their rated admittance y0, as the chord
 * iteration uses) the node voltages are x = M⁻¹(b − E·c), where E is the loads' incidence and
 * c_a = I_a(u_a) − y0_a·u_a each load's departure from y0. Its terminal voltages u = Eᵀx + offsets
 * therefore satisfy F(u) = u − u⁰ + G·c(u) = 0 with u⁰ the terminal voltages of the plain solve
 * and G = Eᵀ·M⁻¹·E (m × m, m = number of loads; one forward/back substitution per load). A
 * constant-power load's current depends on conj(u), so F is not complex-differentiable: Newton
 * runs on the real 2m × 2m Jacobian I + G·∂c/∂u (dense, LU with partial pivoting), with a
 * backtracking line search on ‖F‖ so that a step never makes the mismatch worse.
 * Continuation (when Newton from the plain solve stalls): λ grows while Newton converges from the
 * previous solution and the step halves when it does not. Two homotopies (`Homotopy`): "blend"
 * morphs every load from its rated impedance to its law, to reach the solution; "level" scales
 * the loads from light load, and a step that shrinks below `MIN_STEP` with λ < 1 is the nose of
 * the λ–V curve: the loads cannot be served beyond λ times their rating (voltage collapse).
 */

/** The reduced problem: m loads, their plain-solve voltages, G, and each load's law. */
export interface ZipReduced {
  m: number;
  u0Re: Float64Array;
  u0Im: Float64Array;
  /** G = Eᵀ·M⁻¹·E, row-major m × m. */
  gRe: Float64Array;
  gIm: Float64Array;
  /** Rated voltage per load (scales the tolerance). */
  vRated: Float64Array;
  /**
   * Law of load a at terminal voltage u: writes into out
   * [I_re, I_im, ∂I_re/∂u_re, ∂I_re/∂u_im, ∂I_im/∂u_re, ∂I_im/∂u_im, y0_re, y0_im].
   */
  law(a: number, ur: number, ui: number, out: Float64Array): void;
}

/**
 * How λ enters: "blend" morphs each load from its rated impedance y0 (λ = 0, where the plain
 * solve is the solution) to its law (c = λ·(I − y0·u)); "level" scales the load itself
 * (c = λ·I − y0·u; λ = 0 is no load), whose nose is the loadability limit.
 */
export type Homotopy = 'blend' | 'level';

/** c and its 2×2 Jacobian at λ into out[0..5] from the law's 8 values. */
function compose(law: Float64Array, ur: number, ui: number, lambda: number, h: Homotopy, out: Float64Array, o: number): void {
  const y0r = law[6];
  const y0i = law[7];
  const kz = h === 'blend' ? lambda : 1;
  out[o] = lambda * law[0] - kz * (y0r * ur - y0i * ui);
  out[o + 1] = lambda * law[1] - kz * (y0r * ui + y0i * ur);
  out[o + 2] = lambda * law[2] - kz * y0r;
  out[o + 3] = lambda * law[3] + kz * y0i;
  out[o + 4] = lambda * law[4] - kz * y0i;
  out[o + 5] = lambda * law[5] - kz * y0r;
}

export type NewtonStatus = 'converged' | 'iteration-limit' | 'stalled';

/** Smallest continuation step before the last converged λ is taken as the nose. */
const MIN_STEP = 1e-4;
/** Newton iterations allowed per continuation step. */
const STEP_ITERATIONS = 25;

/** Residual F(u) = u − u⁰ + G·c(u) into fRe/fIm; returns max |F_a| / V_rated,a. Also leaves the laws in `laws` (6 per load). */
function residual(p: ZipReduced, uRe: Float64Array, uIm: Float64Array, lambda: number, h: Homotopy, laws: Float64Array, fRe: Float64Array, fIm: Float64Array): number {
  const m = p.m;
  const out = new Float64Array(8);
  for (let a = 0; a < m; a++) {
    p.law(a, uRe[a], uIm[a], out);
    compose(out, uRe[a], uIm[a], lambda, h, laws, 6 * a);
  }
  let worst = 0;
  for (let a = 0; a < m; a++) {
    let sr = uRe[a] - p.u0Re[a];
    let si = uIm[a] - p.u0Im[a];
    const row = a * m;
    for (let b = 0; b < m; b++) {
      const gr = p.gRe[row + b];
      const gi = p.gIm[row + b];
      const cr = laws[6 * b];
      const ci = laws[6 * b + 1];
      sr += gr * cr - gi * ci;
      si += gr * ci + gi * cr;
    }
    fRe[a] = sr;
    fIm[a] = si;
    const r = Math.hypot(sr, si) / p.vRated[a];
    if (!(r <= worst)) worst = Number.isFinite(r) ? Math.max(worst, r) : Infinity;
  }
  return worst;
}

/** Solve the dense real system A·x = b (n × n, row-major) in place by LU with partial pivoting; false if singular. */
function denseSolve(A: Float64Array, b: Float64Array, n: number): boolean {
  for (let k = 0; k < n; k++) {
    let piv = k;
    let best = Math.abs(A[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(A[i * n + k]);
      if (v > best) {
        best = v;
        piv = i;
      }
    }
    if (!(best > 0) || !Number.isFinite(best)) return false;
    if (piv !== k) {
      for (let j = 0; j < n; j++) {
        const t = A[k * n + j];
        A[k * n + j] = A[piv * n + j];
        A[piv * n + j] = t;
      }
      const t = b[k];
      b[k] = b[piv];
      b[piv] = t;
    }
    const d = A[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const f = A[i * n + k] / d;
      if (f === 0) continue;
      A[i * n + k] = 0;
      for (let j = k + 1; j < n; j++) A[i * n + j] -= f * A[k * n + j];
      b[i] -= f * b[k];
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let j = i + 1; j < n; j++) s -= A[i * n + j] * b[j];
    b[i] = s / A[i * n + i];
  }
  for (let i = 0; i < n; i++) if (!Number.isFinite(b[i])) return false;
  return true;
}

/**
 * Newton from (uRe, uIm), updated in place, at load level λ. Converged when the largest step
 * and the largest residual are both below `tol` per unit of rated voltage.
 */
export function zipNewton(p: ZipReduced, uRe: Float64Array, uIm: Float64Array, lambda: number, h: Homotopy, tol: number, maxIter: number, lastStep?: Float64Array): { status: NewtonStatus; iterations: number } {
  const m = p.m;
  const n2 = 2 * m;
  const laws = new Float64Array(6 * m);
  const fRe = new Float64Array(m);
  const fIm = new Float64Array(m);
  const J = new Float64Array(n2 * n2);
  const rhs = new Float64Array(n2);
  const tRe = new Float64Array(m);
  const tIm = new Float64Array(m);
  const tLaws = new Float64Array(6 * m);
  const tfRe = new Float64Array(m);
  const tfIm = new Float64Array(m);
  let fNorm = residual(p, uRe, uIm, lambda, h, laws, fRe, fIm);
  for (let it = 0; it < maxIter; it++) {
    // J = I + G·C, C block-diagonal 2×2 (∂c_b/∂u_b); G_ab as the real 2×2 [[gr, −gi], [gi, gr]]
    J.fill(0);
    for (let a = 0; a < m; a++) {
      const r0 = 2 * a * n2;
      const r1 = (2 * a + 1) * n2;
      for (let b = 0; b < m; b++) {
        const gr = p.gRe[a * m + b];
        const gi = p.gIm[a * m + b];
        const c00 = laws[6 * b + 2];
        const c01 = laws[6 * b + 3];
        const c10 = laws[6 * b + 4];
        const c11 = laws[6 * b + 5];
        J[r0 + 2 * b] = gr * c00 - gi * c10;
        J[r0 + 2 * b + 1] = gr * c01 - gi * c11;
        J[r1 + 2 * b] = gi * c00 + gr * c10;
        J[r1 + 2 * b + 1] = gi * c01 + gr * c11;
      }
      J[r0 + 2 * a] += 1;
      J[r1 + 2 * a + 1] += 1;
      rhs[2 * a] = -fRe[a];
      rhs[2 * a + 1] = -fIm[a];
    }
    if (!denseSolve(J, rhs, n2)) return { status: 'stalled', iterations: it + 1 };
    let step = 0;
    for (let a = 0; a < m; a++) step = Math.max(step, Math.hypot(rhs[2 * a], rhs[2 * a + 1]) / p.vRated[a]);
    // backtracking line search on the largest scaled residual
    let t = 1;
    let accepted = false;
    for (let k = 0; k < 30; k++) {
      for (let a = 0; a < m; a++) {
        tRe[a] = uRe[a] + t * rhs[2 * a];
        tIm[a] = uIm[a] + t * rhs[2 * a + 1];
      }
      const tn = residual(p, tRe, tIm, lambda, h, tLaws, tfRe, tfIm);
      if (tn < fNorm || (tn <= fNorm && tn < tol)) {
        uRe.set(tRe);
        uIm.set(tIm);
        laws.set(tLaws);
        fRe.set(tfRe);
        fIm.set(tfIm);
        fNorm = tn;
        accepted = true;
        break;
      }
      t /= 2;
    }
    if (lastStep) for (let a = 0; a < m; a++) lastStep[a] = accepted ? (t * Math.hypot(rhs[2 * a], rhs[2 * a + 1])) / p.vRated[a] : 0;
    if (step * t < tol && fNorm < tol) return { status: 'converged', iterations: it + 1 };
    if (!accepted) return { status: fNorm < tol ? 'converged' : 'stalled', iterations: it + 1 };
  }
  return { status: fNorm < tol ? 'converged' : 'iteration-limit', iterations: maxIter };
}

/** Result of continuation: the solution at λ = 1, or the nose λ* < 1 and the voltages there. */
export interface ContinuationResult {
  lambda: number;
  uRe: Float64Array;
  uIm: Float64Array;
  iterations: number;
}

/**
 * Natural-parameter continuation in λ up to 1 (see the file header), from the plain solve
 * ("blend", starting at λ = 0) or from light load ("level", starting at λ = `LIGHT`, where the
 * plain solve is a close first guess and every load still fixes its own star point).
 */
export function zipContinuation(p: ZipReduced, h: Homotopy, tol: number): ContinuationResult {
  const m = p.m;
  const uRe = Float64Array.from(p.u0Re);
  const uIm = Float64Array.from(p.u0Im);
  let iterations = 0;
  let lambda = 0;
  if (h === 'level') {
    const r = zipNewton(p, uRe, uIm, LIGHT, h, tol, STEP_ITERATIONS);
    iterations += r.iterations;
    if (r.status !== 'converged') return { lambda: 0, uRe, uIm, iterations };
    lambda = LIGHT;
  }
  let dl = 0.25;
  const sRe = new Float64Array(m);
  const sIm = new Float64Array(m);
  while (lambda < 1 && dl >= MIN_STEP) {
    const next = Math.min(1, lambda + dl);
    sRe.set(uRe);
    sIm.set(uIm);
    const r = zipNewton(p, sRe, sIm, next, h, tol, STEP_ITERATIONS);
    iterations += r.iterations;
    if (r.status === 'converged') {
      uRe.set(sRe);
      uIm.set(sIm);
      lambda = next;
      dl = Math.min(dl * 1.5, 0.5);
    } else {
      dl /= 2;
    }
  }
  return { lambda, uRe, uIm, iterations };
}

/** Load level of the first "level" continuation step (fraction of the rated load). */
const LIGHT = 1e-3;
