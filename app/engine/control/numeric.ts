/**
 * Small numerical tools for the synergy-gap certificate: a bracketed scalar root finder, a
 * derivative-free minimiser and a damped Newton (Levenberg–Marquardt) solver for 3 equations in
 * 3 unknowns. They run once per certificate, not per integration step, so closures are fine here.
 */
import { allFinite } from '../math/arrays';

export interface RootResult {
  x: number;
  fx: number;
  iterations: number;
  converged: boolean;
}

/**
 * Brent's root finder on a bracket [a, b] with f(a)·f(b) ≤ 0 (R. P. Brent, "Algorithms for
 * Minimization without Derivatives", Prentice-Hall 1973, ch. 4: inverse quadratic interpolation,
 * secant and bisection with the safeguards of the original zero routine).
 */
function brentRoot(f: (x: number) => number, a: number, b: number, xtol = 1e-15, maxIter = 200): RootResult {
  let fa = f(a),
    fb = f(b);
  if (fa === 0) return { x: a, fx: 0, iterations: 0, converged: true };
  if (fb === 0) return { x: b, fx: 0, iterations: 0, converged: true };
  if (!(fa * fb < 0)) return { x: NaN, fx: NaN, iterations: 0, converged: false };
  let c = a,
    fc = fa,
    d = b - a,
    e = d;
  for (let it = 1; it <= maxIter; it++) {
    if (fb * fc > 0) {
      c = a;
      fc = fa;
      d = e = b - a;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * xtol;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return { x: b, fx: fb, iterations: it, converged: true };
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      let p: number, q: number;
      const s = fb / fa;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qq = fa / fc,
          r = fb / fc;
        p = s * (2 * m * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return { x: b, fx: fb, iterations: maxIter, converged: false };
}

export interface MinResult {
  x: number[];
  fx: number;
  iterations: number;
}

/**
 * Nelder–Mead simplex minimisation (Nelder & Mead, The Computer Journal 7(4):308–313, 1965) with
 * the standard coefficients (reflection 1, expansion 2, contraction ½, shrink ½).
 */
export function nelderMead(f: (x: number[]) => number, x0: number[], step: number, ftol = 1e-14, maxIter = 2000): MinResult {
  const n = x0.length;
  const pts: number[][] = [x0.slice()];
  for (let i = 0; i < n; i++) {
    const p = x0.slice();
    p[i]! += step;
    pts.push(p);
  }
  let vals = pts.map(f);
  let it = 0;
  for (; it < maxIter; it++) {
    const order = vals.map((_, i) => i).sort((i, j) => vals[i]! - vals[j]!);
    const P = order.map((i) => pts[i]!);
    const F = order.map((i) => vals[i]!);
    pts.splice(0, pts.length, ...P);
    vals = F;
    if (Math.abs(vals[n]! - vals[0]!) <= ftol * (1 + Math.abs(vals[0]!))) {
      let size = 0;
      for (let i = 1; i <= n; i++) for (let j = 0; j < n; j++) size = Math.max(size, Math.abs(pts[i]![j]! - pts[0]![j]!));
      if (size < 1e-9) break;
    }
    const cen = new Array(n).fill(0);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) cen[j] += pts[i]![j]! / n;
    const along = (t: number) => cen.map((c, j) => c + t * (pts[n]![j]! - c));
    const xr = along(-1);
    const fr = f(xr);
    if (fr < vals[0]!) {
      const xe = along(-2);
      const fe = f(xe);
      if (fe < fr) {
        pts[n] = xe;
        vals[n] = fe;
      } else {
        pts[n] = xr;
        vals[n] = fr;
      }
    } else if (fr < vals[n - 1]!) {
      pts[n] = xr;
      vals[n] = fr;
    } else {
      const outside = fr < vals[n]!;
      const xc = along(outside ? -0.5 : 0.5);
      const fcv = f(xc);
      if (fcv < (outside ? fr : vals[n]!)) {
        pts[n] = xc;
        vals[n] = fcv;
      } else {
        for (let i = 1; i <= n; i++) {
          pts[i] = pts[i]!.map((v, j) => pts[0]![j]! + 0.5 * (v - pts[0]![j]!));
          vals[i] = f(pts[i]!);
        }
      }
    }
  }
  let best = 0;
  for (let i = 1; i <= n; i++) if (vals[i]! < vals[best]!) best = i;
  return { x: pts[best]!, fx: vals[best]!, iterations: it };
}

export interface SolveResult {
  x: number[];
  residualNorm: number;
  iterations: number;
  converged: boolean;
}

/**
 * Solve r(x) = 0 for r: ℝ³ → ℝ³ by Levenberg–Marquardt steps (Levenberg, Q. Appl. Math. 2(2), 1944;
 * Marquardt, J. SIAM 11(2), 1963) with a central-difference Jacobian. Converges to zeros of any
 * kind (minima, saddles, maxima of the potential whose gradient r is), which is what a
 * critical-point search needs.
 */
export function solve3(r: (x: number[]) => number[], x0: number[], tol = 1e-13, maxIter = 200, fdStep = 1e-6): SolveResult {
  let x = x0.slice();
  let res = r(x);
  let nrm = Math.hypot(res[0]!, res[1]!, res[2]!);
  let lambda = 1e-3;
  let it = 0;
  for (; it < maxIter && nrm > tol; it++) {
    const J: number[][] = [
      [0, 0, 0],
      [0, 0, 0],
      [0, 0, 0],
    ];
    for (let j = 0; j < 3; j++) {
      const xp = x.slice(),
        xm = x.slice();
      xp[j]! += fdStep;
      xm[j]! -= fdStep;
      const rp = r(xp),
        rm = r(xm);
      for (let i = 0; i < 3; i++) J[i]![j] = (rp[i]! - rm[i]!) / (2 * fdStep);
    }
    // (JᵀJ + λ diag(JᵀJ)) dx = −Jᵀr
    const JtJ = [0, 1, 2].map((a) => [0, 1, 2].map((b) => J[0]![a]! * J[0]![b]! + J[1]![a]! * J[1]![b]! + J[2]![a]! * J[2]![b]!));
    const Jtr = [0, 1, 2].map((a) => J[0]![a]! * res[0]! + J[1]![a]! * res[1]! + J[2]![a]! * res[2]!);
    let accepted = false;
    for (let tries = 0; tries < 12 && !accepted; tries++) {
      const M = JtJ.map((row, a) => row.map((v, b) => (a === b ? v * (1 + lambda) + 1e-300 : v)));
      const dx = solveLinear3(
        M,
        Jtr.map((v) => -v),
      );
      if (!dx) {
        lambda *= 10;
        continue;
      }
      const xn = [x[0]! + dx[0]!, x[1]! + dx[1]!, x[2]! + dx[2]!];
      const rn = r(xn);
      const nn = Math.hypot(rn[0]!, rn[1]!, rn[2]!);
      if (nn < nrm) {
        x = xn;
        res = rn;
        nrm = nn;
        lambda = Math.max(lambda / 10, 1e-12);
        accepted = true;
      } else lambda *= 10;
    }
    if (!accepted || lambda > 1e12) break;
  }
  return { x, residualNorm: nrm, iterations: it, converged: nrm <= tol };
}

/** Gaussian elimination with partial pivoting; null when singular. */
function solveLinear3(M: number[][], b: number[]): number[] | null {
  const a = M.map((row, i) => [...row, b[i]!]);
  for (let c = 0; c < 3; c++) {
    let piv = c;
    for (let r = c + 1; r < 3; r++) if (Math.abs(a[r]![c]!) > Math.abs(a[piv]![c]!)) piv = r;
    if (!(Math.abs(a[piv]![c]!) > 1e-300)) return null;
    [a[c], a[piv]] = [a[piv]!, a[c]!];
    for (let r = c + 1; r < 3; r++) {
      const f = a[r]![c]! / a[c]![c]!;
      for (let k = c; k < 4; k++) a[r]![k]! -= f * a[c]![k]!;
    }
  }
  const x = [0, 0, 0];
  for (let r = 2; r >= 0; r--) {
    let s = a[r]![3]!;
    for (let k = r + 1; k < 3; k++) s -= a[r]![k]! * x[k]!;
    x[r] = s / a[r]![r]!;
  }
  return allFinite(x) ? x : null;
}

/**
 * All roots of f on [lo, hi]: sign changes on an n-point scan refined by Brent, plus tangential
 * zeros (|f| local minima that are ~0 without a sign change), refined by golden-section search.
 */
export function scalarRoots(f: (t: number) => number, lo: number, hi: number, n: number, xtol: number): number[] {
  const roots: number[] = [];
  const xs: number[] = [],
    fs: number[] = [];
  for (let i = 0; i <= n; i++) {
    const x = lo + ((hi - lo) * i) / n;
    xs.push(x);
    fs.push(f(x));
  }
  for (let i = 0; i < n; i++) {
    if (fs[i] === 0) roots.push(xs[i]!);
    else if (fs[i]! * fs[i + 1]! < 0) {
      const r = brentRoot(f, xs[i]!, xs[i + 1]!, xtol);
      if (r.converged) roots.push(r.x);
    }
  }
  if (fs[n] === 0) roots.push(xs[n]!);
  for (let i = 1; i < n; i++) {
    const a = Math.abs(fs[i]!);
    if (a < Math.abs(fs[i - 1]!) && a <= Math.abs(fs[i + 1]!) && fs[i - 1]! * fs[i + 1]! > 0 && fs[i]! * fs[i - 1]! > 0) {
      const m = nelderMead((x) => Math.abs(f(Math.min(xs[i + 1]!, Math.max(xs[i - 1]!, x[0]!)))), [xs[i]!], (hi - lo) / n / 4, 1e-16, 400);
      if (m.fx < 1e-12) roots.push(Math.min(xs[i + 1]!, Math.max(xs[i - 1]!, m.x[0]!)));
    }
  }
  return roots.sort((a, b) => a - b);
}
