/**
 * Visibility windows of a ground site above its elevation mask, and eclipse windows, over plan
 * times [t0, t1] inside an ephemeris span (plain data out).
 *
 * Method: a coarse scan at `scanStepS` (default 10 s) of a continuous event function, then
 * bisection on each sign change until the bracket is ≤ `toleranceS` (default 1 ms; the edge is the
 * bracket midpoint). Event functions:
 * - visibility: g(t) = sin ε − sin ε_mask with sin ε = ℓ·û/|ℓ|, ℓ = r_sc − r_site, û the site's
 *   geodetic up (sites.ts), all EME2000 from the ephemeris. Its time derivative (analytic, from
 *   ℓ̇ and û̇ = ω⊕ × û) is scanned too: a maximum between two samples that are both below the mask is
 *   located by bisection on g′ and checked, so a pass shorter than the scan step is still found as
 *   long as the elevation has at most one maximum per step (true for LEO passes). The time of
 *   maximum elevation is the zero of g′ inside the window (bisection, same tolerance).
 * - eclipse: with the conical-shadow angles of sky.ts (a Sun, b Earth, c separation),
 *   g_pen = a + b − c > 0 in penumbra or umbra, g_umb = b − a − c > 0 in umbra. An eclipse window
 *   runs from penumbra entry to penumbra exit; its umbra interval is nested (NaN when the
 *   spacecraft only grazes the penumbra). An umbra shorter than the scan step may be missed.
 * Windows open at t0 or still open at t1 are clipped there and flagged.
 */
import { fail, issue, ok, type Issue, type Result } from '../errors';
import type { Ephemeris } from './ephemeris';
import { earthFixedDirectionAt, orbitStateAt, siteStateAt, sunStateAt } from './ephemerisEval';
import type { Site } from './sites';
import { SHADOW_EARTH_RADIUS_M, SUN_RADIUS_M } from './sky';

export interface VisibilityWindow {
  startS: number;
  endS: number;
  maxElevationRad: number;
  tMaxS: number;
  startClipped: boolean;
  endClipped: boolean;
}

export interface EclipseWindow {
  /** Penumbra entry and exit (any part of the Sun hidden). */
  startS: number;
  endS: number;
  /** Umbra entry and exit; NaN when there is no umbra in this window. */
  umbraStartS: number;
  umbraEndS: number;
  startClipped: boolean;
  endClipped: boolean;
}

export interface WindowOptions {
  scanStepS?: number;
  toleranceS?: number;
}

const rs = new Float64Array(3),
  vs = new Float64Array(3),
  rg = new Float64Array(3),
  vg = new Float64Array(3),
  up = new Float64Array(3),
  upDot = new Float64Array(3),
  sun = new Float64Array(3);

/** sin(elevation) of the spacecraft from the site and its time derivative, at plan time t. */
function elevationSine(eph: Ephemeris, site: Site, t: number, out: { g: number; dg: number }): void {
  orbitStateAt(rs, vs, null, null, eph, t);
  siteStateAt(rg, vg, null, eph, site, t);
  earthFixedDirectionAt(up, upDot, eph, site.upEcef, t);
  const lx = rs[0]! - rg[0]!,
    ly = rs[1]! - rg[1]!,
    lz = rs[2]! - rg[2]!;
  const dx = vs[0]! - vg[0]!,
    dy = vs[1]! - vg[1]!,
    dz = vs[2]! - vg[2]!;
  const n = Math.sqrt(lx * lx + ly * ly + lz * lz);
  const lu = lx * up[0]! + ly * up[1]! + lz * up[2]!;
  const ldot = lx * dx + ly * dy + lz * dz;
  out.g = lu / n;
  out.dg = (dx * up[0]! + dy * up[1]! + dz * up[2]! + lx * upDot[0]! + ly * upDot[1]! + lz * upDot[2]!) / n - (lu * ldot) / (n * n * n);
}

/** Bisection for a sign change of f on [a, b] (f(a) and f(b) of opposite sign) to width ≤ tol. */
function bisect(f: (t: number) => number, a: number, b: number, tol: number): number {
  let fa = f(a);
  while (b - a > tol) {
    const m = 0.5 * (a + b);
    const fm = f(m);
    if (fm === 0) return m;
    if (fm > 0 === fa > 0) {
      a = m;
      fa = fm;
    } else b = m;
  }
  return 0.5 * (a + b);
}

function checkSpan(eph: Ephemeris, t0: number, t1: number, o: Required<WindowOptions>, path: string): Issue[] {
  const errors: Issue[] = [];
  if (!(t1 > t0) || t0 < eph.startS || t1 > eph.endS)
    errors.push(
      issue(
        `${path}.span`,
        'span',
        `${path}: [${t0}, ${t1}] s must be non-empty and inside the ephemeris span [${eph.startS}, ${eph.endS}] s`,
      ),
    );
  if (!(o.scanStepS > 0)) errors.push(issue(`${path}.scanStepS`, 'positive', `${path}.scanStepS must be > 0 (got ${o.scanStepS})`));
  if (!(o.toleranceS > 0 && o.toleranceS <= 1e-3))
    errors.push(issue(`${path}.toleranceS`, 'range', `${path}.toleranceS must be in (0, 0.001] s (got ${o.toleranceS})`));
  return errors;
}

function options(o: WindowOptions): Required<WindowOptions> {
  return { scanStepS: o.scanStepS ?? 10, toleranceS: o.toleranceS ?? 1e-3 };
}

/** Visibility windows of the spacecraft from `site` above its elevation mask over [t0, t1]. */
export function visibilityWindows(
  eph: Ephemeris,
  site: Site,
  t0: number,
  t1: number,
  opts: WindowOptions = {},
  path = 'visibility',
): Result<VisibilityWindow[]> {
  const o = options(opts);
  const errors = checkSpan(eph, t0, t1, o, path);
  if (errors.length) return fail(errors);
  const sMask = Math.sin(site.elevationMaskRad);
  const e = { g: 0, dg: 0 };
  const g = (t: number) => (elevationSine(eph, site, t, e), e.g - sMask);
  const dg = (t: number) => (elevationSine(eph, site, t, e), e.dg);
  const out: VisibilityWindow[] = [];
  const finish = (start: number, end: number, startClipped: boolean, endClipped: boolean) => {
    // Maximum: zero of g′ (positive before, negative after); at an edge when g′ keeps its sign.
    const d0 = dg(start),
      d1 = dg(end);
    const tMax = d0 <= 0 ? start : d1 >= 0 ? end : bisect(dg, start, end, o.toleranceS);
    g(tMax);
    out.push({
      startS: start,
      endS: end,
      maxElevationRad: Math.asin(Math.max(-1, Math.min(1, e.g))),
      tMaxS: tMax,
      startClipped,
      endClipped,
    });
  };
  let ta = t0;
  elevationSine(eph, site, ta, e);
  let ga = e.g - sMask,
    da = e.dg;
  let open = ga >= 0 ? t0 : NaN;
  const clippedStart = ga >= 0;
  while (ta < t1) {
    const tb = Math.min(ta + o.scanStepS, t1);
    elevationSine(eph, site, tb, e);
    const gb = e.g - sMask,
      db = e.dg;
    if (ga < 0 && gb >= 0) open = bisect(g, ta, tb, o.toleranceS);
    else if (ga >= 0 && gb < 0) {
      finish(open, bisect(g, ta, tb, o.toleranceS), open === t0 && clippedStart, false);
      open = NaN;
    } else if (ga < 0 && gb < 0 && da > 0 && db < 0) {
      // A maximum between two samples below the mask: a short pass if the maximum clears it.
      const tm = bisect(dg, ta, tb, o.toleranceS);
      if (g(tm) >= 0) finish(bisect(g, ta, tm, o.toleranceS), bisect(g, tm, tb, o.toleranceS), false, false);
    }
    ta = tb;
    ga = gb;
    da = db;
  }
  if (!Number.isNaN(open)) finish(open, t1, open === t0 && clippedStart, true);
  return ok(out);
}

const ecl = { pen: 0, umb: 0 };

/** Penumbra and umbra event functions at plan time t (sky.ts conical model). */
function shadowFunctions(eph: Ephemeris, t: number): void {
  orbitStateAt(rs, null, null, null, eph, t);
  sunStateAt(sun, null, eph, t);
  const rx = rs[0]!,
    ry = rs[1]!,
    rz = rs[2]!;
  const dx = sun[0]! - rx,
    dy = sun[1]! - ry,
    dz = sun[2]! - rz;
  const rn = Math.sqrt(rx * rx + ry * ry + rz * rz),
    dn = Math.sqrt(dx * dx + dy * dy + dz * dz);
  const a = Math.asin(SUN_RADIUS_M / dn);
  const b = Math.asin(Math.min(1, SHADOW_EARTH_RADIUS_M / rn));
  const c = Math.acos(Math.max(-1, Math.min(1, -(rx * dx + ry * dy + rz * dz) / (rn * dn))));
  ecl.pen = a + b - c;
  ecl.umb = b - a - c;
}

/** Eclipse (penumbra ⊇ umbra) windows over [t0, t1]. */
export function eclipseWindows(
  eph: Ephemeris,
  t0: number,
  t1: number,
  opts: WindowOptions = {},
  path = 'eclipses',
): Result<EclipseWindow[]> {
  const o = options(opts);
  const errors = checkSpan(eph, t0, t1, o, path);
  if (errors.length) return fail(errors);
  const pen = (t: number) => (shadowFunctions(eph, t), ecl.pen);
  const umb = (t: number) => (shadowFunctions(eph, t), ecl.umb);
  const out: EclipseWindow[] = [];
  let cur: EclipseWindow | null = null;
  shadowFunctions(eph, t0);
  let pa = ecl.pen,
    ua = ecl.umb;
  if (pa > 0) cur = { startS: t0, endS: NaN, umbraStartS: ua > 0 ? t0 : NaN, umbraEndS: NaN, startClipped: true, endClipped: false };
  for (let ta = t0; ta < t1;) {
    const tb = Math.min(ta + o.scanStepS, t1);
    shadowFunctions(eph, tb);
    const pb = ecl.pen,
      ub = ecl.umb;
    if (pa <= 0 && pb > 0)
      cur = {
        startS: bisect(pen, ta, tb, o.toleranceS),
        endS: NaN,
        umbraStartS: NaN,
        umbraEndS: NaN,
        startClipped: false,
        endClipped: false,
      };
    if (cur && ua <= 0 && ub > 0) cur.umbraStartS = bisect(umb, ta, tb, o.toleranceS);
    if (cur && ua > 0 && ub <= 0) cur.umbraEndS = bisect(umb, ta, tb, o.toleranceS);
    if (cur && pa > 0 && pb <= 0) {
      cur.endS = bisect(pen, ta, tb, o.toleranceS);
      out.push(cur);
      cur = null;
    }
    ta = tb;
    pa = pb;
    ua = ub;
  }
  if (cur) {
    cur.endS = t1;
    cur.endClipped = true;
    if (ua > 0) cur.umbraEndS = t1;
    out.push(cur);
  }
  return ok(out);
}
