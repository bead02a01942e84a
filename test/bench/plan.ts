/**
 * Planner speed figures (no assertions): closed-form segments (H = 0), sampled-search segments
 * (stored momentum), and evaluateReference per call. Run: node --import tsx test/bench/plan.ts,
 * or through run.ts once it lists { file: './plan.ts', fn: 'benchPlan' }.
 */
import { planSegment } from '../../app/engine/plan/segment';
import { planSequence } from '../../app/engine/plan/sequence';
import { evaluateReference } from '../../app/engine/plan/reference';
import { cubeCapacity } from '../../app/engine/plan/limits';
import { makeRng } from '../../app/engine/math/prng';
import { qCreate, qRandomUniform } from '../../app/engine/math/rotation';
import type { PlanLimits } from '../../app/engine/plan/types';

function stats(ms: number[]): string {
  const s = [...ms].sort((a, b) => a - b);
  const q = (p: number) => s[Math.min(s.length - 1, Math.floor(p * s.length))]!;
  return `median ${q(0.5).toFixed(2)} ms, p90 ${q(0.9).toFixed(2)} ms, max ${s[s.length - 1]!.toFixed(2)} ms (n = ${s.length})`;
}

export async function benchPlan(): Promise<void> {
  // Invented Lumen-6-like body; cube envelopes of an orthogonal triad (2 mN·m, 6 mN·m·s).
  const J = [0.11, 0.002, -0.001, 0.002, 0.12, 0.0015, -0.001, 0.0015, 0.08];
  const limits: PlanLimits = {
    torqueCapacity: cubeCapacity(0.002),
    momentumCapacity: cubeCapacity(0.006),
    torqueMargin: 0.8,
    momentumMargin: 0.8,
  };
  const rng = makeRng(42, 0);
  for (const stored of [false, true]) {
    const ms: number[] = [];
    let infeasible = 0;
    for (let k = 0; k < 100; k++) {
      const q0 = qRandomUniform(qCreate(), rng),
        q1 = qRandomUniform(qCreate(), rng);
      const h = stored ? [rng.normal() * 0.0008, rng.normal() * 0.0008, rng.normal() * 0.0008] : [0, 0, 0];
      const t0 = performance.now();
      const r = planSegment({ qStart: q0, qTarget: q1, inertia: J, wheelMomentumBody: h }, limits);
      ms.push(performance.now() - t0);
      if (r.ok && !r.value.feasible) infeasible++;
    }
    console.log(
      `   planSegment, ${stored ? 'stored momentum (sampled search)' : 'H = 0 (closed form)'}: ${stats(ms)}; ${infeasible} infeasible`,
    );
  }
  const seq = planSequence(
    {
      qStart: [0, 0, 0, 1],
      inertia: J,
      wheelMomentumBody: [0.001, -0.0005, 0.0008],
      targets: [0, 1, 2, 3].map(() => ({ q: Array.from(qRandomUniform(qCreate(), rng)), holdS: 30 })),
    },
    limits,
  );
  if (seq.ok) {
    const q = new Float64Array(4),
      w = new Float64Array(3),
      wd = new Float64Array(3);
    const n = 1_000_000,
      T = seq.value.totalS;
    const t0 = performance.now();
    for (let i = 0; i < n; i++) evaluateReference(seq.value, (T * i) / n, q, w, wd);
    const dt = performance.now() - t0;
    console.log(`   evaluateReference over a 4-target sequence: ${((dt * 1e6) / n).toFixed(0)} ns per call`);
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await benchPlan();
