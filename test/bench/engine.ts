/**
 * Engine speed figures (printed, never asserted): a 600 s run of the invented Pyra-4 vehicle
 * (4-wheel pyramid, dynamics-fixtures.ts) with a 10 Hz zero-order-hold wheel-torque input
 * (smooth sinusoids, tabulated per sample and held; the held torques live in the system's closure, as a
 * closed-loop controller keeps its output — one line also shows them carried in the state), by
 *  - our fixed-step RK4 fast path (one or two steps per sample), and
 *  - `odex` 2.0.4 (Hairer & Wanner's ODEX extrapolation code), restarted at every sample since
 *    the held input is discontinuous there, at the loosest tolerance that reaches the same
 *    end-state accuracy as RK4.
 * Accuracy is measured against a tight reference: our DP54 at rtol 1e-13 (restarted at every
 * sample by the simulator), cross-checked against odex at tolerance 1e-13.
 *
 * Run: `node --import tsx test/bench/engine.ts` or `npm run bench engine`.
 */
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { gyrostatDerivative } from '../../app/engine/body/gyrostat';
import { simulateHybrid } from '../../app/engine/hybrid/index';
import type { IntegratorOptions } from '../../app/engine/hybrid/index';
import { pyra4, pyra4InitialState, testWheelTorque, zohWheelSystem, zohWheelSystemCompact } from '../reference/dynamics-fixtures';
import type * as OdexModule from 'odex';

// tsconfig maps the bare name 'odex' to its type declaration (test/types/odex.d.ts), and tsx
// applies that mapping at run time too; so load the package's CommonJS file by its own path.
const { Solver } = createRequire(import.meta.url)('odex/src/odex.js') as typeof OdexModule;

const T_END = 600;
const TS = 0.1;
const N_SAMPLES = Math.round(T_END / TS);

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>, n: number): number {
  let d = 0;
  for (let i = 0; i < n; i++) d = Math.max(d, Math.abs(a[i]! - b[i]!));
  return d;
}

const g = pyra4();
const x0 = pyra4InitialState();
// The input profile is tabulated once per sample, so both integrators read identical torques and
// the timings measure integration, not Math.sin.
const TORQUE_TABLE = new Float64Array(4 * (N_SAMPLES + 1));
for (let k = 0; k <= N_SAMPLES; k++) testWheelTorque(TORQUE_TABLE.subarray(4 * k, 4 * k + 4), k * TS);
const tableTorque = (out: Float64Array, k: number): void => {
  for (let i = 0; i < 4; i++) out[i] = TORQUE_TABLE[4 * k + i]!;
};
const x0WithHeld = new Float64Array(g.dim + 4);
x0WithHeld.set(x0);

/** End state (11 values) of the ZOH run by our simulator. */
function runOurs(integrator: IntegratorOptions, heldInState = false): Float64Array {
  const r = heldInState
    ? simulateHybrid(zohWheelSystem(g, TS), x0WithHeld, { tEnd: T_END, integrator, record: 'none' })
    : simulateHybrid(zohWheelSystemCompact(g, TS, tableTorque), x0, { tEnd: T_END, integrator, record: 'none' });
  if (!r.ok || r.value.outcome.status !== 'completed') throw new Error('engine run failed');
  return r.value.finalState.slice(0, g.dim);
}

/** The same ZOH run by odex: one solve per sample interval with the held torque constant. */
function runOdex(tol: number): { y: number[]; steps: number } {
  const s = new Solver(g.dim);
  s.absoluteTolerance = s.relativeTolerance = tol;
  s.maxSteps = 100000;
  s.initialStepSize = TS;
  const held = new Float64Array(4);
  const xs = new Float64Array(g.dim),
    dx = new Float64Array(g.dim);
  const ext = new Float64Array(3);
  const f = (_t: number, y: number[]): number[] => {
    for (let i = 0; i < g.dim; i++) xs[i] = y[i]!;
    gyrostatDerivative(dx, xs, g, held, ext);
    return Array.from(dx);
  };
  let y = Array.from(x0.subarray(0, g.dim));
  let steps = 0;
  for (let k = 0; k < N_SAMPLES; k++) {
    tableTorque(held, k);
    const r = s.solve(f, k * TS, y, (k + 1) * TS);
    y = r.y;
    steps += r.nStep;
    // renormalise the quaternion as our run does after each step
    const nq = Math.sqrt(y[0]! * y[0]! + y[1]! * y[1]! + y[2]! * y[2]! + y[3]! * y[3]!);
    for (let i = 0; i < 4; i++) y[i]! /= nq;
  }
  return { y, steps };
}

function timeIt(fn: () => void, reps: number): number[] {
  const out: number[] = [];
  for (let r = 0; r < reps; r++) {
    const t0 = performance.now();
    fn();
    out.push(performance.now() - t0);
  }
  return out;
}

export async function benchEngine(): Promise<void> {
  // Machine calibration: the same figure on another machine scales the rest.
  let acc = 0;
  const c0 = performance.now();
  for (let i = 0; i < 1e8; i++) acc += i * 0.5;
  const calib = performance.now() - c0;
  console.log(`   machine: 1e8 scalar multiply-adds in ${calib.toFixed(0)} ms${acc < 0 ? '' : ''}`);

  const ref = runOurs({ kind: 'dp54', rtol: 1e-13, atol: 1e-16 });
  const refOdex = runOdex(1e-13).y;
  console.log(`   reference: DP54 rtol 1e-13 vs odex tol 1e-13 end states differ by ${maxAbsDiff(ref, refOdex, g.dim).toExponential(2)}`);

  {
    const integ: IntegratorOptions = { kind: 'rk4', dt: TS };
    timeIt(() => runOurs(integ, true), 20);
    const times = timeIt(() => runOurs(integ, true), 60);
    console.log(
      `   (held torques carried as 4 extra states: median ${median(times).toFixed(2)} ms, min ${Math.min(...times).toFixed(2)} ms)`,
    );
  }
  for (const stepsPerSample of [1, 2, 3]) {
    const integ: IntegratorOptions = { kind: 'rk4', dt: TS / stepsPerSample };
    const errRk4 = maxAbsDiff(runOurs(integ), ref, g.dim);
    timeIt(() => runOurs(integ), 20); // warm-up
    const times = timeIt(() => runOurs(integ), 60);
    const med = median(times);
    const nSteps = N_SAMPLES * stepsPerSample;
    console.log(
      `   RK4 ${stepsPerSample} step/sample (${nSteps} steps, ${N_SAMPLES} ZOH jumps): median ${med.toFixed(2)} ms ` +
        `(min ${Math.min(...times).toFixed(2)} ms), ${(nSteps / (med / 1000) / 1e6).toFixed(2)} M RK4 steps/s, ` +
        `end-state error ${errRk4.toExponential(2)}`,
    );

    // Loosest odex tolerance (half-decade grid) that is at least as accurate at the end.
    let chosen = NaN;
    let chosenErr = NaN;
    let chosenSteps = 0;
    for (let e = 1; e <= 13; e += 0.5) {
      const tol = 10 ** -e;
      const r = runOdex(tol);
      const err = maxAbsDiff(r.y, ref, g.dim);
      if (err <= errRk4) {
        chosen = tol;
        chosenErr = err;
        chosenSteps = r.steps;
        break;
      }
    }
    if (!Number.isFinite(chosen)) {
      console.log('   odex: no tolerance down to 1e-13 reached the RK4 accuracy');
      continue;
    }
    timeIt(() => runOdex(chosen), 2);
    const oTimes = timeIt(() => runOdex(chosen), 7);
    const oMed = median(oTimes);
    console.log(
      `   odex at tol ${chosen.toExponential(1)} (end-state error ${chosenErr.toExponential(2)}, ${chosenSteps} steps): ` +
        `median ${oMed.toFixed(1)} ms → RK4 fast path is ${(oMed / med).toFixed(1)}× faster`,
    );
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  await benchEngine();
}
