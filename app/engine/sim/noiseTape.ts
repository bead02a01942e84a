/**
 * A sensor-noise realisation drawn once and read by every run that would draw the same one.
 *
 * The sampled loop's random sensor noise (sensors.ts measure) depends only on the run's seed and
 * stream, the two noise levels σ_θ and σ_ω, and the sample's index — never on the state: sample k
 * takes three normals for the attitude (when σ_θ > 0), then three for the rate (when σ_ω > 0),
 * from one generator that only those draws advance. A study flies every selected law on the same
 * case with the same seed (a paired comparison), so each law drew the same normals again and
 * formed the same small rotation from them. The tape keeps, per sample, the rotation
 * dq = exp(½ σ_θ n_θ) and the rate term σ_ω n_ω that measure forms, and extends itself from its
 * own generator when a run goes past what an earlier run reached: the same operations on the same
 * values, so the measured state is the same bits (test/unit/noise-tape.test.ts checks it against
 * measure, and a study's records with and without a tape).
 *
 * A tape holds one realisation: `begin` with other inputs forgets the old one (compared with ===,
 * so any doubt draws afresh). The loop uses a tape only for runs of at most
 * NOISE_TAPE_MAX_SAMPLES samples, so its memory stays small (7 doubles per sample).
 */
import { makeRng, type Rng } from '../math/prng';
import { qFromRotationVector } from '../math/quaternion';

/** Longest run (in control samples) that reads a tape: 65,536 samples, 3.7 MB of tape. */
export const NOISE_TAPE_MAX_SAMPLES = 65_536;

const dtheta = new Float64Array(3);
const rateNoise = new Float64Array(3);
const dqScratch = new Float64Array(4);

export class SensorNoiseTape {
  private seed = NaN;
  private stream = NaN;
  private sigmaAttitude = NaN;
  private sigmaRate = NaN;
  private rng: Rng | null = null;
  /** Samples drawn so far. */
  private filled = 0;
  /** dq of sample k at [4k, 4k + 4) (σ_θ > 0 only). */
  private dq: Float64Array = new Float64Array(0);
  /** σ_ω n of sample k at [3k, 3k + 3) (σ_ω > 0 only). */
  private rate: Float64Array = new Float64Array(0);
  /** Sample k's values after `at(k)`: dq (4) and σ_ω n (3). */
  readonly dqNow = new Float64Array(4);
  readonly rateNow = new Float64Array(3);

  /**
   * Make this the tape of a run with these inputs (as the loop makes its generator: makeRng(seed,
   * stream)). Kept when all four equal the last call's; otherwise started afresh.
   */
  begin(seed: number, stream: number, sigmaAttitudeRad: number, sigmaRateRadPerS: number): void {
    if (
      this.rng !== null &&
      seed === this.seed &&
      stream === this.stream &&
      sigmaAttitudeRad === this.sigmaAttitude &&
      sigmaRateRadPerS === this.sigmaRate
    )
      return;
    this.seed = seed;
    this.stream = stream;
    this.sigmaAttitude = sigmaAttitudeRad;
    this.sigmaRate = sigmaRateRadPerS;
    this.rng = makeRng(seed, stream);
    this.filled = 0;
  }

  /** Samples drawn so far (the longest run read since `begin` started this realisation). */
  get drawn(): number {
    return this.filled;
  }

  /** Load sample k's dq and rate term into dqNow / rateNow (only the parts whose σ is > 0). */
  at(k: number): void {
    while (this.filled <= k) this.draw();
    const dq = this.dq,
      rate = this.rate,
      a = this.dqNow,
      r = this.rateNow;
    if (this.sigmaAttitude > 0) {
      const o = 4 * k;
      a[0] = dq[o]!;
      a[1] = dq[o + 1]!;
      a[2] = dq[o + 2]!;
      a[3] = dq[o + 3]!;
    }
    if (this.sigmaRate > 0) {
      const o = 3 * k;
      r[0] = rate[o]!;
      r[1] = rate[o + 1]!;
      r[2] = rate[o + 2]!;
    }
  }

  /** Draw the next sample's noise as measure does: attitude normals first, then the rate's. */
  private draw(): void {
    const k = this.filled;
    const rng = this.rng!;
    const sa = this.sigmaAttitude,
      sw = this.sigmaRate;
    if (sa > 0) {
      if (this.dq.length < 4 * (k + 1)) this.dq = grown(this.dq, 4 * (k + 1));
      rng.normals(dtheta, 3);
      dtheta[0] = sa * dtheta[0]!;
      dtheta[1] = sa * dtheta[1]!;
      dtheta[2] = sa * dtheta[2]!;
      qFromRotationVector(dqScratch, dtheta);
      const o = 4 * k;
      this.dq[o] = dqScratch[0]!;
      this.dq[o + 1] = dqScratch[1]!;
      this.dq[o + 2] = dqScratch[2]!;
      this.dq[o + 3] = dqScratch[3]!;
    }
    if (sw > 0) {
      if (this.rate.length < 3 * (k + 1)) this.rate = grown(this.rate, 3 * (k + 1));
      rng.normals(rateNoise, 3);
      const o = 3 * k;
      this.rate[o] = sw * rateNoise[0]!;
      this.rate[o + 1] = sw * rateNoise[1]!;
      this.rate[o + 2] = sw * rateNoise[2]!;
    }
    this.filled = k + 1;
  }
}

/** A copy of a with room for at least `need` values (doubling). */
function grown(a: Float64Array, need: number): Float64Array {
  const b = new Float64Array(Math.max(need, 2 * a.length, 1024));
  b.set(a);
  return b;
}
