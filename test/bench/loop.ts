/**
 * Closed-loop cost against a bare integrator (printed, never asserted). Issue 12's two ratios:
 *
 *  1. like for like: the engine's closed loop (runClosedLoop) flying the demo vehicle with its
 *     quaternion PD law, no sensor noise, no wheel friction, min-norm allocation, held torque, a
 *     600 s run at 10 Hz with one RK4 step per control period — against a bare Float64Array RK4
 *     loop of the same gyrostat equations and the same PD gains written in this file (no engine
 *     import in the loop; only the gains, inertias and wheel axes are read from the engine's
 *     prepared vehicle), recording attitude, rate and wheel momentum per sample. Goal ≤ 1.5×.
 *  2. the full loop: the demo as flown (noise, friction, torque and momentum limits, min-max
 *     allocation, the hysteretic law's logic, diagnostics and the full trace) against the same
 *     bare loop. Goal ≤ 3×.
 *
 * The bare loop's end state is compared with the engine's like-for-like run (same equations, same
 * law, same step), so the ratio compares the same computation. Median and min of repeated runs in
 * one process, after a warm-up.
 *
 * Run: `node --import tsx test/bench/loop.ts` or `npm run bench loop`.
 */
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { preparePipeline, type Prepared } from '../../app/engine/pipeline/run';
import { runClosedLoop, type ClosedLoopConfig, type ReferenceSource } from '../../app/engine/sim/closedLoop';

const DEMO = new URL('../../assets/lumen6-imaging.scenario.json', import.meta.url);
const T_END = 600;
const RATE_HZ = 10;

const median = (v: number[]): number => {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
};

/** Wall-clock ms of each call; the process's CPU ms (user + system) of each call go to `cpu`. */
function timeIt(fn: () => void, reps: number, cpu: number[]): number[] {
  const out: number[] = [];
  for (let r = 0; r < reps; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    fn();
    out.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  return out;
}

/** A fixed target (the scenario's first one) from t = 0: the same regulation problem for both loops. */
function fixedReference(target: ArrayLike<number>): ReferenceSource {
  return {
    at: (_t, q, w, wd) => {
      for (let i = 0; i < 4; i++) q[i] = target[i]!;
      w.fill(0);
      wd.fill(0);
      return 0;
    },
  };
}

interface BareInputs {
  n: number;
  Jperp: ArrayLike<number>; // column-major 3×3
  JperpInv: ArrayLike<number>;
  axes: ArrayLike<number>; // 3n
  pinv: ArrayLike<number>; // n×3 row-major
  maxTorque: ArrayLike<number>;
  kp: number;
  Kd: ArrayLike<number>; // column-major 3×3
  target: ArrayLike<number>; // x y z w
  q0: ArrayLike<number>;
  w0: ArrayLike<number>;
  h0: ArrayLike<number>;
}

/**
 * The bare loop: x = [q (x y z w), ω, h]; J⊥ω̇ = −ω×(J⊥ω + Gh) − Gτ, ḣ = τ, q̇ = ½ q⊗(ω, 0) (the
 * gyrostat equations as in the methods note §6); per control period τ_body = −kp·sgn-free ε − Kd ω
 * with ε the vector part of q_target* ⊗ q, wheel torques −G⁺τ_body clipped to their limits and
 * held, one classical RK4 step, quaternion renormalised; q, ω, h recorded per sample.
 */
function bareLoop(b: BareInputs, record: Float64Array): Float64Array {
  const n = b.n;
  const dim = 7 + n;
  const x = new Float64Array(dim);
  for (let i = 0; i < 4; i++) x[i] = b.q0[i]!;
  for (let i = 0; i < 3; i++) x[4 + i] = b.w0[i]!;
  for (let i = 0; i < n; i++) x[7 + i] = b.h0[i]!;
  const k1 = new Float64Array(dim),
    k2 = new Float64Array(dim),
    k3 = new Float64Array(dim),
    k4 = new Float64Array(dim),
    xs = new Float64Array(dim);
  const tau = new Float64Array(n);
  const Gt = new Float64Array(3);
  const J = b.Jperp,
    Ji = b.JperpInv,
    G = b.axes;
  const deriv = (d: Float64Array, s: Float64Array): void => {
    const qx = s[0]!,
      qy = s[1]!,
      qz = s[2]!,
      qw = s[3]!,
      wx = s[4]!,
      wy = s[5]!,
      wz = s[6]!;
    d[0] = 0.5 * (qw * wx + qy * wz - qz * wy);
    d[1] = 0.5 * (qw * wy + qz * wx - qx * wz);
    d[2] = 0.5 * (qw * wz + qx * wy - qy * wx);
    d[3] = -0.5 * (qx * wx + qy * wy + qz * wz);
    let Hx = J[0]! * wx + J[3]! * wy + J[6]! * wz,
      Hy = J[1]! * wx + J[4]! * wy + J[7]! * wz,
      Hz = J[2]! * wx + J[5]! * wy + J[8]! * wz;
    for (let i = 0; i < n; i++) {
      const h = s[7 + i]!;
      Hx += G[3 * i]! * h;
      Hy += G[3 * i + 1]! * h;
      Hz += G[3 * i + 2]! * h;
    }
    const rx = -(wy * Hz - wz * Hy) - Gt[0]!,
      ry = -(wz * Hx - wx * Hz) - Gt[1]!,
      rz = -(wx * Hy - wy * Hx) - Gt[2]!;
    d[4] = Ji[0]! * rx + Ji[3]! * ry + Ji[6]! * rz;
    d[5] = Ji[1]! * rx + Ji[4]! * ry + Ji[7]! * rz;
    d[6] = Ji[2]! * rx + Ji[5]! * ry + Ji[8]! * rz;
    for (let i = 0; i < n; i++) d[7 + i] = tau[i]!;
  };
  const dt = 1 / RATE_HZ;
  const N = Math.round(T_END * RATE_HZ);
  const tx = b.target[0]!,
    ty = b.target[1]!,
    tz = b.target[2]!,
    tw = b.target[3]!;
  const K = b.Kd;
  for (let k = 0; k <= N; k++) {
    const o = (7 + n) * k;
    for (let i = 0; i < dim; i++) record[o + i] = x[i]!;
    if (k === N) break;
    // ε = vec(q_t* ⊗ q)
    const qx = x[0]!,
      qy = x[1]!,
      qz = x[2]!,
      qw = x[3]!;
    const ex = tw * qx - tx * qw - ty * qz + tz * qy;
    const ey = tw * qy - ty * qw - tz * qx + tx * qz;
    const ez = tw * qz - tz * qw - tx * qy + ty * qx;
    const wx = x[4]!,
      wy = x[5]!,
      wz = x[6]!;
    const cx = -b.kp * ex - (K[0]! * wx + K[3]! * wy + K[6]! * wz);
    const cy = -b.kp * ey - (K[1]! * wx + K[4]! * wy + K[7]! * wz);
    const cz = -b.kp * ez - (K[2]! * wx + K[5]! * wy + K[8]! * wz);
    Gt[0] = Gt[1] = Gt[2] = 0;
    for (let i = 0; i < n; i++) {
      let t = -(b.pinv[3 * i]! * cx + b.pinv[3 * i + 1]! * cy + b.pinv[3 * i + 2]! * cz);
      const m = b.maxTorque[i]!;
      t = t > m ? m : t < -m ? -m : t;
      tau[i] = t;
      Gt[0] += G[3 * i]! * t;
      Gt[1] += G[3 * i + 1]! * t;
      Gt[2] += G[3 * i + 2]! * t;
    }
    deriv(k1, x);
    for (let i = 0; i < dim; i++) xs[i] = x[i]! + 0.5 * dt * k1[i]!;
    deriv(k2, xs);
    for (let i = 0; i < dim; i++) xs[i] = x[i]! + 0.5 * dt * k2[i]!;
    deriv(k3, xs);
    for (let i = 0; i < dim; i++) xs[i] = x[i]! + dt * k3[i]!;
    deriv(k4, xs);
    for (let i = 0; i < dim; i++) x[i] = x[i]! + (dt / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!);
    const nq = Math.sqrt(x[0]! * x[0]! + x[1]! * x[1]! + x[2]! * x[2]! + x[3]! * x[3]!);
    for (let i = 0; i < 4; i++) x[i] = x[i]! / nq;
  }
  return x;
}

function loopConfig(p: Prepared, lawId: string, target: Float64Array, likeForLike: boolean): ClosedLoopConfig {
  const s = p.scenario;
  const c = p.controllers.find((x) => x.id === lawId)!;
  return {
    plant: p.vehicle.plant,
    wheels: p.vehicle.wheels,
    controller: c.controller,
    reference: fixedReference(target),
    q0: s.initial.qInertialFromBody,
    omega0: s.initial.omegaBody,
    hWheel0: s.initial.hWheelNms,
    tEnd: T_END,
    timing: 'sampled',
    controlRateHz: RATE_HZ,
    rk4StepsPerSample: 1,
    sensors: likeForLike
      ? { attitudeSigmaRad: 0, rateSigmaRadPerS: 0, rateBiasRadPerS: [0, 0, 0], adversarialEta: 0 }
      : {
          attitudeSigmaRad: s.vehicle.sensors.attitudeNoiseRad,
          rateSigmaRadPerS: s.vehicle.sensors.rateNoiseRadPerS,
          rateBiasRadPerS: s.vehicle.sensors.rateBiasRadPerS,
          adversarialEta: 0,
        },
    seed: s.simulation.seed,
    actuation: { mode: 'hold' },
    allocation: likeForLike ? 'min-norm' : 'min-max',
    frictionFeedforward: likeForLike ? 0 : p.vehicle.frictionFeedforward,
  };
}

export async function benchLoop(): Promise<void> {
  const json = JSON.parse(readFileSync(DEMO, 'utf8')) as Record<string, any>;
  const full = preparePipeline(json);
  const bareJson = structuredClone(json);
  delete bareJson.vehicle.wheelFriction;
  const plain = preparePipeline(bareJson);
  if (!full.ok || !plain.ok) throw new Error('demo does not load');
  const pf = full.value,
    pp = plain.value;
  const target = pp.targets.subarray(0, 4) as Float64Array;
  const pd = pp.controllers.find((c) => c.law === 'quaternion-pd')!;
  const law = pd.controller as unknown as { kp: number; Kd: Float64Array };
  const g = pp.vehicle.plant;
  const w = pp.vehicle.wheels;
  const s = pp.scenario;
  const inputs: BareInputs = {
    n: w.n,
    Jperp: g.Jperp,
    JperpInv: g.JperpInv,
    axes: w.axes,
    pinv: w.pinv,
    maxTorque: w.maxTorqueNm,
    kp: law.kp,
    Kd: law.Kd,
    target,
    q0: s.initial.qInertialFromBody,
    w0: s.initial.omegaBody,
    h0: s.initial.hWheelNms,
  };
  const N = Math.round(T_END * RATE_HZ) + 1;
  const record = new Float64Array((7 + w.n) * N);

  const like = loopConfig(pp, pd.id, target, true);
  const hyst = pf.controllers.find((c) => c.law === 'hysteretic') ?? pf.controllers[0]!;
  const fullCfg = loopConfig(pf, hyst.id, pf.targets.subarray(0, 4) as Float64Array, false);

  // Same computation? End states of the bare loop and the like-for-like engine run.
  const xb = bareLoop(inputs, record);
  const r = runClosedLoop(like);
  const tr = r.trace;
  const last = tr.n - 1;
  let d = 0;
  for (let i = 0; i < 4; i++) d = Math.max(d, Math.abs(Math.abs(tr.q[4 * last + i]!) - Math.abs(xb[i]!)));
  for (let i = 0; i < 3; i++) d = Math.max(d, Math.abs(tr.omega[3 * last + i]!) - Math.abs(xb[4 + i]!));
  console.log(`   like-for-like check: engine and bare loop end states differ by ${d.toExponential(2)} (same equations, law and step)`);

  for (let i = 0; i < 5; i++) {
    bareLoop(inputs, record);
    runClosedLoop(like);
    runClosedLoop(fullCfg);
  }
  const REPS = 21;
  const tb: number[] = [],
    tl: number[] = [],
    tf: number[] = [];
  const cb: number[] = [],
    cl: number[] = [],
    cf: number[] = [];
  for (let i = 0; i < REPS; i++) {
    tb.push(...timeIt(() => bareLoop(inputs, record), 1, cb));
    tl.push(...timeIt(() => runClosedLoop(like), 1, cl));
    tf.push(...timeIt(() => runClosedLoop(fullCfg), 1, cf));
  }
  const mb = median(tb),
    ml = median(tl),
    mf = median(tf);
  const per = (m: number) => `${((1000 * m) / (N - 1)).toFixed(2)} µs/sample`;
  const row = (name: string, v: number[], m: number) =>
    `   ${name.padEnd(58)} median ${m.toFixed(2).padStart(6)} ms, min ${Math.min(...v)
      .toFixed(2)
      .padStart(6)} ms (${per(m)})`;
  console.log(row('bare Float64Array RK4 loop, PD, q/ω/h recorded', tb, mb));
  console.log(row('closed loop like for like (PD, no noise, no friction)', tl, ml));
  console.log(row('closed loop full (hysteretic, noise, friction, limits, trace)', tf, mf));
  const goal = (ratio: number, g: number) => `${ratio.toFixed(2)}× (goal ≤ ${g}×: ${ratio <= g ? 'met' : 'not met'})`;
  console.log(`   ratio like for like / bare: ${goal(ml / mb, 1.5)}`);
  console.log(`   ratio full / bare:          ${goal(mf / mb, 3)}`);
  // CPU time (user + system of this process, µs resolution) is less sensitive to other load than wall time.
  const cpu = (v: number[]) => `${median(v).toFixed(2)} ms (min ${Math.min(...v).toFixed(2)})`;
  console.log(`   CPU time per run, median: bare ${cpu(cb)}, like for like ${cpu(cl)}, full ${cpu(cf)}`);
  console.log(
    `   CPU-time ratios (median): like for like / bare ${(median(cl) / median(cb)).toFixed(2)}×, full / bare ${(median(cf) / median(cb)).toFixed(2)}×`,
  );
}

if (import.meta.url === pathToFileURL(process.argv[1]!).href) await benchLoop();
