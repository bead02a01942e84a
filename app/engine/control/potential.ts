/**
 * Modified trace potential on SO(3) and its synergistic family by angular warping, evaluated on
 * quaternions without allocation.
 *
 * Φ(R) = tr(A(I − R)), A symmetric positive definite with distinct eigenvalues (methods §1.2).
 * Warp (Berkane & Tayebi, "Construction of synergistic potential functions on SO(3) via angular
 * warping", IEEE TAC 62(1):495–501, 2017; family idea: Mayhew & Teel, IEEE TAC 58(11):2730–2742,
 * 2013): Γ_q(R) = R · R_a(θ(R), u_q) with θ(R) = k Φ(R), and V_q = Φ ∘ Γ_q.
 * Body-frame gradient (V̇_q = b_qᵀω along Ṙ = Rω^×): b_q = 2 Θ_qᵀ ψ(A Γ_q),
 * Θ_q = R_a(θ, u_q)ᵀ + u_q gᵀ, g = 2k ψ(AR)  (methods §4.2).
 *
 * Quaternion forms used here (derived from R = (η² − εᵀε)I + 2εεᵀ + 2ηε^×, checked against the
 * matrix definitions in the tests), with Ā = ½(tr(A) I − A):
 *   Φ(R(q)) = 4 εᵀĀε,       ψ(A R(q)) = 2η Āε + ε × Aε.
 * Both are even in q, so ±q give the same values. Quaternions are [x, y, z, w] (rotation.ts).
 * Member indices are 0-based here; controllers show them 1-based.
 */
import type { Vec3 } from '../math/mat3';
import { symmetricEigen3 } from '../math/mat3';

export interface WarpFamily {
  /** Potential weight A (column-major; symmetric so the layout does not matter). */
  readonly A: Float64Array;
  /** Ā = ½(tr(A) I − A). */
  readonly Abar: Float64Array;
  readonly traceA: number;
  /** Eigenvalues of A, ascending, and the matching unit eigenvectors as columns. */
  readonly eigenvalues: Float64Array;
  readonly eigenvectors: Float64Array;
  /** Warp gain k in θ(R) = k Φ(R). */
  readonly k: number;
  /** Number of members M. */
  readonly members: number;
  /** Unit warp directions u_q, 3 per member. */
  readonly directions: Float64Array;
}

/**
 * Build a family from a symmetric A (9 numbers, column-major), the warp gain and the unit warp
 * directions (3 per member). No validation here: spec.ts validates user input first.
 */
export function makeWarpFamily(A: ArrayLike<number>, k: number, directions: ArrayLike<number>): WarpFamily {
  const a = new Float64Array(9);
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) a[3 * c + r] = 0.5 * (A[3 * c + r]! + A[3 * r + c]!);
  const tr = a[0]! + a[4]! + a[8]!;
  const abar = new Float64Array(9);
  for (let i = 0; i < 9; i++) abar[i] = -0.5 * a[i]!;
  abar[0]! += 0.5 * tr;
  abar[4]! += 0.5 * tr;
  abar[8]! += 0.5 * tr;
  const eig = symmetricEigen3(a);
  const dirs = new Float64Array(directions.length);
  for (let i = 0; i < dirs.length; i++) dirs[i] = directions[i]!;
  return {
    A: a,
    Abar: abar,
    traceA: tr,
    eigenvalues: eig.values,
    eigenvectors: eig.vectors,
    k,
    members: Math.floor(dirs.length / 3),
    directions: dirs,
  };
}

/** Largest value of Φ over SO(3): 2(tr A − λ_min) (methods §1.2). */
export function phiMax(fam: WarpFamily): number {
  return 2 * (fam.traceA - fam.eigenvalues[0]!);
}

/** Φ(R(q)) = 4 εᵀĀε. */
export function phiQuat(fam: WarpFamily, q: ArrayLike<number>): number {
  const B = fam.Abar;
  const x = q[0]!,
    y = q[1]!,
    z = q[2]!;
  const bx = B[0]! * x + B[3]! * y + B[6]! * z;
  const by = B[1]! * x + B[4]! * y + B[7]! * z;
  const bz = B[2]! * x + B[5]! * y + B[8]! * z;
  return 4 * (x * bx + y * by + z * bz);
}

/** out = ψ(A R(q)) = 2η Āε + ε × Aε. */
export function psiAQuat(out: Vec3, fam: WarpFamily, q: ArrayLike<number>): Vec3 {
  const B = fam.Abar,
    A = fam.A;
  const x = q[0]!,
    y = q[1]!,
    z = q[2]!,
    w = q[3]!;
  const bx = B[0]! * x + B[3]! * y + B[6]! * z;
  const by = B[1]! * x + B[4]! * y + B[7]! * z;
  const bz = B[2]! * x + B[5]! * y + B[8]! * z;
  const ax = A[0]! * x + A[3]! * y + A[6]! * z;
  const ay = A[1]! * x + A[4]! * y + A[7]! * z;
  const az = A[2]! * x + A[5]! * y + A[8]! * z;
  out[0] = 2 * w * bx + (y * az - z * ay);
  out[1] = 2 * w * by + (z * ax - x * az);
  out[2] = 2 * w * bz + (x * ay - y * ax);
  return out;
}

/**
 * Reusable evaluation state for one attitude: Φ, the warp angle, every warped quaternion Γ_p and
 * every V_p. Create once per user (controller, certificate, benchmark), then reuse.
 */
export interface FamilyWorkspace {
  /** The attitude last evaluated (copied). */
  readonly q: Float64Array;
  phi: number;
  /** θ = kΦ and its cosine/sine (full angle) for the warp rotation R_a(θ, u). */
  theta: number;
  cosTheta: number;
  sinTheta: number;
  /** ψ(AR) at the attitude (g = 2kψ(AR) is the gradient of the warp angle). */
  readonly psiR: Float64Array;
  /** Γ_p quaternions, 4 per member. */
  readonly gamma: Float64Array;
  /** V_p = Φ(Γ_p), one per member. */
  readonly V: Float64Array;
  /** Index of the smallest V_p (lowest index among ties, see `argminMember`). */
  minIndex: number;
  minValue: number;
}

export function makeFamilyWorkspace(fam: WarpFamily): FamilyWorkspace {
  return {
    q: new Float64Array(4),
    phi: 0,
    theta: 0,
    cosTheta: 1,
    sinTheta: 0,
    psiR: new Float64Array(3),
    gamma: new Float64Array(4 * fam.members),
    V: new Float64Array(fam.members),
    minIndex: 0,
    minValue: 0,
  };
}

/**
 * Relative tolerance under which two potential values count as a tie. Exact ties (e.g. V₂ = V₃
 * at R_a(π/2, e₁) for methods §4.3) come out of floating point a few ulps apart; treating them as
 * ties makes the choice deterministic: the LOWEST index among the tied minimisers wins.
 */
const TIE_RELATIVE_TOLERANCE = 1e-12;

/** Lowest index p with V_p within the tie tolerance of min V. */
export function argminMember(V: ArrayLike<number>, n: number): number {
  let m = Infinity;
  for (let p = 0; p < n; p++) if (V[p]! < m) m = V[p]!;
  const tol = TIE_RELATIVE_TOLERANCE * (1 + Math.abs(m));
  for (let p = 0; p < n; p++) if (V[p]! <= m + tol) return p;
  return 0;
}

/** Evaluate Φ, the warp and every V_p at attitude q (unit). Returns ws. */
export function evaluateFamily(ws: FamilyWorkspace, fam: WarpFamily, q: ArrayLike<number>): FamilyWorkspace {
  const x = q[0]!,
    y = q[1]!,
    z = q[2]!,
    w = q[3]!;
  ws.q[0] = x;
  ws.q[1] = y;
  ws.q[2] = z;
  ws.q[3] = w;
  // Φ = 4εᵀĀε and ψ(AR) = 2ηĀε + ε × Aε share Āε.
  const B = fam.Abar,
    A = fam.A;
  const bx = B[0]! * x + B[3]! * y + B[6]! * z;
  const by = B[1]! * x + B[4]! * y + B[7]! * z;
  const bz = B[2]! * x + B[5]! * y + B[8]! * z;
  const ax = A[0]! * x + A[3]! * y + A[6]! * z;
  const ay = A[1]! * x + A[4]! * y + A[7]! * z;
  const az = A[2]! * x + A[5]! * y + A[8]! * z;
  ws.psiR[0] = 2 * w * bx + (y * az - z * ay);
  ws.psiR[1] = 2 * w * by + (z * ax - x * az);
  ws.psiR[2] = 2 * w * bz + (x * ay - y * ax);
  const phi = 4 * (x * bx + y * by + z * bz);
  const theta = fam.k * phi;
  ws.phi = phi;
  ws.theta = theta;
  const ch = Math.cos(0.5 * theta),
    sh = Math.sin(0.5 * theta);
  // full-angle cosine and sine from the half angle (two fewer transcendental calls)
  ws.cosTheta = 1 - 2 * sh * sh;
  ws.sinTheta = 2 * sh * ch;
  const U = fam.directions,
    G = ws.gamma,
    V = ws.V;
  const n = fam.members;
  for (let p = 0; p < n; p++) {
    // Γ_p = q ⊗ (sh u_p, ch)
    const ux = sh * U[3 * p]!,
      uy = sh * U[3 * p + 1]!,
      uz = sh * U[3 * p + 2]!;
    const gx = w * ux + ch * x + (y * uz - z * uy);
    const gy = w * uy + ch * y + (z * ux - x * uz);
    const gz = w * uz + ch * z + (x * uy - y * ux);
    const gw = w * ch - (x * ux + y * uy + z * uz);
    G[4 * p] = gx;
    G[4 * p + 1] = gy;
    G[4 * p + 2] = gz;
    G[4 * p + 3] = gw;
    const cx = B[0]! * gx + B[3]! * gy + B[6]! * gz;
    const cy = B[1]! * gx + B[4]! * gy + B[7]! * gz;
    const cz = B[2]! * gx + B[5]! * gy + B[8]! * gz;
    V[p] = 4 * (gx * cx + gy * cy + gz * cz);
  }
  const mi = argminMember(V, n);
  ws.minIndex = mi;
  ws.minValue = V[mi]!;
  return ws;
}

const sPsiR = new Float64Array(3);

/**
 * b_p = 2[R_a(θ, u_p) ψ(AΓ_p) + g (u_pᵀψ(AΓ_p))], g = 2kψ(AR): the body-frame gradient of V_p at
 * the attitude last passed to `evaluateFamily(ws, …)`.
 */
export function memberGradient(out: Vec3, fam: WarpFamily, ws: FamilyWorkspace, p: number): Vec3 {
  const G = ws.gamma;
  const gq0 = G[4 * p]!,
    gq1 = G[4 * p + 1]!,
    gq2 = G[4 * p + 2]!,
    gq3 = G[4 * p + 3]!;
  // ψ(AΓ_p) from the warped quaternion
  const B = fam.Abar,
    A = fam.A;
  const bx = B[0]! * gq0 + B[3]! * gq1 + B[6]! * gq2;
  const by = B[1]! * gq0 + B[4]! * gq1 + B[7]! * gq2;
  const bz = B[2]! * gq0 + B[5]! * gq1 + B[8]! * gq2;
  const ax = A[0]! * gq0 + A[3]! * gq1 + A[6]! * gq2;
  const ay = A[1]! * gq0 + A[4]! * gq1 + A[7]! * gq2;
  const az = A[2]! * gq0 + A[5]! * gq1 + A[8]! * gq2;
  const px = 2 * gq3 * bx + (gq1 * az - gq2 * ay);
  const py = 2 * gq3 * by + (gq2 * ax - gq0 * az);
  const pz = 2 * gq3 * bz + (gq0 * ay - gq1 * ax);
  const U = fam.directions;
  const ux = U[3 * p]!,
    uy = U[3 * p + 1]!,
    uz = U[3 * p + 2]!;
  const c = ws.cosTheta,
    s = ws.sinTheta;
  // R_a(θ, u) v = c v + s (u × v) + (1 − c)(u·v) u   (Rodrigues)
  const ud = ux * px + uy * py + uz * pz;
  const rx = c * px + s * (uy * pz - uz * py) + (1 - c) * ud * ux;
  const ry = c * py + s * (uz * px - ux * pz) + (1 - c) * ud * uy;
  const rz = c * pz + s * (ux * py - uy * px) + (1 - c) * ud * uz;
  const gs = 2 * fam.k * ud;
  const pr = ws.psiR;
  out[0] = 2 * (rx + gs * pr[0]!);
  out[1] = 2 * (ry + gs * pr[1]!);
  out[2] = 2 * (rz + gs * pr[2]!);
  return out;
}

/**
 * Diffeomorphism indicator det Θ_p = 1 + g_pᵀu_p = 1 + 2k u_pᵀψ(AR) at attitude q (methods §4.2);
 * Γ_p is a diffeomorphism of SO(3) when this stays positive everywhere.
 */
export function warpJacobianDet(fam: WarpFamily, q: ArrayLike<number>, p: number): number {
  psiAQuat(sPsiR, fam, q);
  const U = fam.directions;
  return 1 + 2 * fam.k * (U[3 * p]! * sPsiR[0]! + U[3 * p + 1]! * sPsiR[1]! + U[3 * p + 2]! * sPsiR[2]!);
}
