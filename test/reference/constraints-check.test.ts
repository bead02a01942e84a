/**
 * The constraint check against outside references:
 * - every margin of a random history against an independent computation with the npm
 *   `quaternion` package (2.2.0, its own Hamilton rotateVector; [w, x, y, z] order) and acos;
 * - violation intervals of a hand-built history whose angles are linear in time (a body axis
 *   turning at a constant rate in the plane of the sources), so the crossing times are known in
 *   closed form: angle(t) = |ω t − β| for a source at azimuth β (plane geometry, no source needed);
 * - the two interpolations of a sampled direction against their definitions (slerp moves at
 *   constant angle: Shoemake, SIGGRAPH 1985; the linear blend is normalised by hand here).
 */
import { describe, expect, it } from 'vitest';
import Quaternion from 'quaternion';
import { checkAttitudeHistory, checkReference } from '../../app/engine/constraints/check';
import { sourceAt } from '../../app/engine/constraints/source';
import { prepareConstraints } from '../../app/engine/constraints/validate';
import type { AttitudeConstraint, ConstraintCheck, HistoryCheck } from '../../app/engine/constraints/types';
import { makeRng } from '../../app/engine/math/prng';
import type { Result } from '../../app/engine/errors';

const D = Math.PI / 180;

function value(r: Result<HistoryCheck>): HistoryCheck {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

const unit = (v: ArrayLike<number>): [number, number, number] => {
  const n = Math.hypot(v[0]!, v[1]!, v[2]!);
  return [v[0]! / n, v[1]! / n, v[2]! / n];
};

describe('check margins vs npm quaternion rotateVector (independent rotation)', () => {
  it('series, minimum and its time match on a random 2,000-sample history against six constraints', () => {
    const rng = makeRng(7, 1);
    const n = 2000;
    const t = new Float64Array(n),
      q = new Float64Array(4 * n);
    for (let i = 0; i < n; i++) {
      t[i] = 0.1 * i + 0.05 * rng.next();
      // Non-unit quaternions on purpose: the check must rotate with q/|q|.
      const s = 0.5 + rng.next();
      for (let c = 0; c < 4; c++) q[4 * i + c] = s * rng.normal();
    }
    const sources: AttitudeConstraint['source'][] = [
      { kind: 'fixed', direction: [1, 2, 3] },
      { kind: 'fixed', direction: [-1, 0.5, 0.2], angularRadiusRad: 10 * D },
    ];
    const cs: AttitudeConstraint[] = [];
    for (let k = 0; k < 6; k++) {
      cs.push({
        name: `c${k}`,
        kind: k % 2 ? 'keep-in' : 'keep-out',
        bodyAxis: [rng.normal(), rng.normal(), rng.normal()],
        halfAngleRad: (20 + 60 * rng.next()) * D,
        marginRad: 2 * D * rng.next(),
        source: sources[k % 2]!,
      });
    }
    const res = value(checkAttitudeHistory({ timesS: t, qInertialFromBody: q }, cs, { series: true }));
    cs.forEach((c, k) => {
      const got = res.constraints[k]!;
      const b = unit(c.bodyAxis);
      const s = unit((c.source as { direction: ArrayLike<number> } & typeof c.source).direction);
      const r = (c.source.angularRadiusRad as number | undefined) ?? 0;
      let minM = Infinity,
        minAt = NaN;
      for (let i = 0; i < n; i++) {
        const lib = new Quaternion(q[4 * i + 3]!, q[4 * i]!, q[4 * i + 1]!, q[4 * i + 2]!).normalize();
        const v = lib.rotateVector(b) as number[];
        const ang = Math.acos(Math.max(-1, Math.min(1, v[0]! * s[0]! + v[1]! * s[1]! + v[2]! * s[2]!)));
        const m = c.kind === 'keep-out' ? ang - r - (c.halfAngleRad + c.marginRad) : c.halfAngleRad - c.marginRad - (ang - r);
        expect(got.marginRad![i]).toBeCloseTo(m, 9);
        if (m < minM) {
          minM = m;
          minAt = t[i]!;
        }
      }
      expect(got.minMarginRad).toBeCloseTo(minM, 9);
      expect(got.minAtS).toBe(minAt);
      expect(got.samplesChecked).toBe(n);
    });
  });
});

/**
 * Body +X turning about inertial +Z at ω = 4°/s from t = 0 to 45 s (0° … 180° of azimuth): the
 * angle to a source at azimuth β in the XY plane is |4t − β| degrees. Samples every 0.7 s.
 */
function turningHistory(): { timesS: Float64Array; qInertialFromBody: Float64Array } {
  const n = Math.floor(45 / 0.7) + 1;
  const t = new Float64Array(n),
    q = new Float64Array(4 * n);
  for (let i = 0; i < n; i++) {
    t[i] = 0.7 * i;
    const half = 0.5 * 4 * D * t[i]!;
    q[4 * i + 2] = Math.sin(half);
    q[4 * i + 3] = Math.cos(half);
  }
  return { timesS: t, qInertialFromBody: q };
}
const az = (deg: number): AttitudeConstraint['source'] => ({ kind: 'fixed', direction: [Math.cos(deg * D), Math.sin(deg * D), 0] });
const cone = (
  name: string,
  kind: 'keep-out' | 'keep-in',
  src: number,
  half: number,
  window?: { startS: number; endS: number },
): AttitudeConstraint => ({
  name,
  kind,
  bodyAxis: [1, 0, 0],
  halfAngleRad: half * D,
  marginRad: 0,
  source: az(src),
  ...(window ? { window } : {}),
});
const spans = (c: ConstraintCheck) => c.intervals.map((iv) => [iv.startS, iv.endS]);

describe('violation intervals of a hand-built history (angle linear in time: crossings in closed form)', () => {
  const h = turningHistory();
  const tEnd = h.timesS[h.timesS.length - 1]!;
  const res = value(
    checkAttitudeHistory(h, [
      cone('sun at 0°', 'keep-out', 0, 30), // 4t < 30 → [0, 7.5]
      cone('moon at 100°', 'keep-out', 100, 20), // |4t − 100| < 20 → (20, 30)
      cone('station at 90°', 'keep-in', 90, 60), // |4t − 90| > 60 → [0, 7.5) and (37.5, end]
      cone('windowed', 'keep-out', 100, 20, { startS: 10, endS: 26 }), // → (20, 26]
      cone('late window', 'keep-out', 100, 20, { startS: 22, endS: 40 }), // → [22, 30)
      cone('clear', 'keep-out', -90, 45),
    ]),
  );
  it('crossings at 7.5 s, 20 s, 30 s and 37.5 s; intervals open at the history start', () => {
    expect(spans(res.constraints[0]!)).toEqual([[0, expect.closeTo(7.5, 10)]]);
    const moon = spans(res.constraints[1]!);
    expect(moon).toHaveLength(1);
    expect(moon[0]![0]).toBeCloseTo(20, 10);
    expect(moon[0]![1]).toBeCloseTo(30, 10);
    const st = spans(res.constraints[2]!);
    expect(st).toHaveLength(2);
    expect(st[0]![0]).toBe(0);
    expect(st[0]![1]).toBeCloseTo(7.5, 10);
    expect(st[1]![0]).toBeCloseTo(37.5, 10);
    expect(st[1]![1]).toBe(tEnd);
    expect(res.constraints[1]!.violatedS).toBeCloseTo(10, 10);
    expect(res.constraints[5]!.intervals).toEqual([]);
    expect(res.clear).toBe(false);
  });
  it('windows clip the intervals, with the window edges between samples', () => {
    const w = spans(res.constraints[3]!);
    expect(w).toHaveLength(1);
    expect(w[0]![0]).toBeCloseTo(20, 10);
    expect(w[0]![1]).toBe(26);
    const late = spans(res.constraints[4]!);
    expect(late[0]![0]).toBe(22);
    expect(late[0]![1]).toBeCloseTo(30, 10);
    // Samples inside [10, 26]: t = 0.7 k for k = 15 … 37.
    expect(res.constraints[3]!.samplesChecked).toBe(23);
  });
  it('minimum margin: the sample nearest the source (t = 0.7 k nearest 25 s), −(20° − |4t − 100|°)', () => {
    const k = Math.round(25 / 0.7);
    const expected = Math.abs(4 * 0.7 * k - 100) * D - 20 * D;
    const m = res.constraints[1]!;
    expect(m.minMarginRad).toBeCloseTo(expected, 10);
    expect(m.minAtS).toBeCloseTo(0.7 * k, 12);
    expect(m.intervals[0]!.minMarginRad).toBeCloseTo(expected, 10);
    expect(res.minimumMarginRad).toBeCloseTo(Math.min(expected, -30 * D), 10);
  });
  it('checkReference samples a function of time the same way', () => {
    const r = value(
      checkReference(
        (t, out) => {
          out.set([0, 0, Math.sin(2 * D * t), Math.cos(2 * D * t)]);
        },
        0,
        45,
        0.7,
        [cone('moon at 100°', 'keep-out', 100, 20)],
      ),
    );
    expect(r.constraints[0]!.intervals[0]!.startS).toBeCloseTo(20, 10);
    expect(r.constraints[0]!.intervals[0]!.endS).toBeCloseTo(30, 10);
  });
});

describe('sampled directions', () => {
  const a = [1, 0, 0],
    b = [Math.cos(60 * D), Math.sin(60 * D), 0];
  const prep = (interpolation: 'linear' | 'great-circle') => {
    const r = prepareConstraints([
      {
        name: 's',
        kind: 'keep-out',
        bodyAxis: [1, 0, 0],
        halfAngleRad: 0.1,
        marginRad: 0,
        source: { kind: 'sampled', timesS: [0, 10], directions: [...a, ...b], interpolation, angularRadiusRad: [0.1, 0.3] },
      },
    ]);
    if (!r.ok) throw new Error('invalid');
    return r.value[0]!.source;
  };
  it('great-circle interpolation moves at constant angle (slerp: 15° at a quarter of 60°)', () => {
    const out = new Float64Array(3);
    const r = sourceAt(out, prep('great-circle'), 2.5);
    expect(Math.atan2(out[1]!, out[0]!)).toBeCloseTo(15 * D, 13);
    expect(r).toBeCloseTo(0.15, 14);
  });
  it('linear interpolation is the normalised blend 0.75 a + 0.25 b; ends held outside the span', () => {
    const out = new Float64Array(3);
    sourceAt(out, prep('linear'), 2.5);
    const x = 0.75 * a[0]! + 0.25 * b[0]!,
      y = 0.25 * b[1]!;
    expect(Math.atan2(out[1]!, out[0]!)).toBeCloseTo(Math.atan2(y, x), 13);
    sourceAt(out, prep('linear'), 99);
    expect(out[0]).toBeCloseTo(b[0]!, 15);
  });
  it('a history outside the sampled span is checked with the end direction held, with a warning', () => {
    const h = turningHistory();
    const r = checkAttitudeHistory(h, [
      {
        name: 'short table',
        kind: 'keep-out',
        bodyAxis: [1, 0, 0],
        halfAngleRad: 20 * D,
        marginRad: 0,
        source: { kind: 'sampled', timesS: [0, 5], directions: [...az100(), ...az100()], interpolation: 'linear' },
      },
    ]);
    expect(r.ok && r.warnings.map((w) => w.rule)).toEqual(['source-span']);
    expect(r.ok && r.value.constraints[0]!.intervals.length).toBe(1);
  });
});

function az100(): number[] {
  return [Math.cos(100 * D), Math.sin(100 * D), 0];
}

describe('the bisection scan changes no reported number', () => {
  it('2 h at 10 Hz against moving sources: the bisection scan equals the dense scan (series on evaluates every sample)', () => {
    // Self-consistency, no outside source: the bound behind the bisection is in motionBound.ts.
    const n = 72_000;
    const t = new Float64Array(n),
      q = new Float64Array(4 * n);
    const w = (2 * Math.PI) / 5700;
    for (let i = 0; i < n; i++) {
      const ti = i / 10;
      t[i] = ti;
      const a = 0.5 * w * ti,
        b = 0.5 * 0.3 * Math.sin(ti / 200);
      q.set([Math.cos(a) * Math.sin(b), Math.sin(a) * Math.cos(b), -Math.sin(a) * Math.sin(b), Math.cos(a) * Math.cos(b)], 4 * i);
    }
    const moving = (rate: number, interpolation: 'linear' | 'great-circle', radius?: number[]) => {
      const times: number[] = [],
        dirs: number[] = [];
      for (let k = 0; k <= 720; k++) {
        times.push(10 * k);
        dirs.push(Math.cos(rate * 10 * k), Math.sin(rate * 10 * k), 0.2);
      }
      return { kind: 'sampled' as const, timesS: times, directions: dirs, interpolation, ...(radius ? { angularRadiusRad: radius } : {}) };
    };
    const earth = moving(
      w,
      'great-circle',
      Array.from({ length: 721 }, (_, k) => 1.1 + 0.05 * Math.sin(k / 50)),
    );
    const station = moving(1.5 * w, 'linear');
    const cs: AttitudeConstraint[] = [
      { name: 'limb', kind: 'keep-out', bodyAxis: [0, 0.5, 0.866], halfAngleRad: 20 * D, marginRad: D, source: earth },
      { name: 'antenna', kind: 'keep-in', bodyAxis: [1, 0, 0], halfAngleRad: 70 * D, marginRad: 0, source: station },
      {
        name: 'star',
        kind: 'keep-out',
        bodyAxis: [0, 0, 1],
        halfAngleRad: 10 * D,
        marginRad: 0,
        source: { kind: 'fixed', direction: [0.3, 0.2, 0.9] },
      },
      {
        name: 'windowed',
        kind: 'keep-out',
        bodyAxis: [0, -1, 0],
        halfAngleRad: 50 * D,
        marginRad: 0,
        source: station,
        window: { startS: 1000.05, endS: 5000.05 },
      },
    ];
    const fast = value(checkAttitudeHistory({ timesS: t, qInertialFromBody: q }, cs));
    const dense = value(checkAttitudeHistory({ timesS: t, qInertialFromBody: q }, cs, { series: true }));
    expect(dense.constraints.some((c) => c.intervals.length > 0)).toBe(true);
    fast.constraints.forEach((c, k) => {
      const d = dense.constraints[k]!;
      expect(c.minMarginRad).toBe(d.minMarginRad);
      expect(c.minAtS).toBe(d.minAtS);
      expect(c.intervals).toEqual(d.intervals);
      expect(c.samplesChecked).toBe(d.samplesChecked);
    });
  });
});
