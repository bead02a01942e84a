/**
 * Wheel actuation models: how a sampled controller's held wheel torques (the average over a
 * control period) reach the motors during the period.
 *  - hold: zero-order hold, the torque is applied as held;
 *  - quantized: each wheel torque rounded to a multiple of the quantum (never beyond the wheel's
 *    limit), then held;
 *  - pwm: each wheel gives its full torque, with the held torque's sign, for the fraction
 *    |τ|/τ_max of the period (pulse-width modulation), then nothing until the next sample.
 * The closed loop lands on every pulse end (nextEdge / edge), so a pulse is integrated exactly.
 */
import type { WheelArray } from '../wheels/array';
import type { Actuation } from './types';

export interface WheelActuator {
  /**
   * A new period starts at t: `held` holds the period's wheel torques (quantisation rounds them in
   * place), `now` gets what the motors apply from t on.
   */
  start(t: number, held: Float64Array, now: Float64Array): void;
  /** The next time after t at which the applied torques change within the period (a pulse end), or Infinity. */
  nextEdge(t: number): number;
  /** Apply the changes due at t (pulses that have ended). */
  edge(t: number, now: Float64Array): void;
}

const EDGE_SLACK_S = 1e-12;

class HoldActuator implements WheelActuator {
  start(_t: number, held: Float64Array, now: Float64Array): void {
    now.set(held);
  }
  nextEdge(): number {
    return Infinity;
  }
  edge(): void {}
}

class QuantizedActuator extends HoldActuator {
  constructor(
    private readonly wheels: WheelArray,
    private readonly quantum: number,
  ) {
    super();
  }
  override start(t: number, held: Float64Array, now: Float64Array): void {
    const q = this.quantum;
    for (let i = 0; i < this.wheels.n; i++) {
      const max = this.wheels.maxTorqueNm[i]!;
      let v = Math.round(held[i]! / q) * q;
      if (Math.abs(v) > max) v = Math.sign(v) * Math.floor(max / q) * q;
      held[i] = v;
    }
    super.start(t, held, now);
  }
}

class PwmActuator implements WheelActuator {
  private readonly pulseEnd: Float64Array;
  constructor(
    private readonly wheels: WheelArray,
    private readonly periodS: number,
  ) {
    this.pulseEnd = new Float64Array(wheels.n).fill(Infinity);
  }
  start(t: number, held: Float64Array, now: Float64Array): void {
    for (let i = 0; i < this.wheels.n; i++) {
      const full = this.wheels.maxTorqueNm[i]!;
      const width = Math.min(1, Math.abs(held[i]!) / full) * this.periodS;
      now[i] = width > 0 ? Math.sign(held[i]!) * full : 0;
      this.pulseEnd[i] = t + width;
    }
  }
  nextEdge(t: number): number {
    let next = Infinity;
    for (let i = 0; i < this.wheels.n; i++) {
      const e = this.pulseEnd[i]!;
      if (e > t + EDGE_SLACK_S && e < next) next = e;
    }
    return next;
  }
  edge(t: number, now: Float64Array): void {
    for (let i = 0; i < this.wheels.n; i++)
      if (this.pulseEnd[i]! <= t + EDGE_SLACK_S) {
        now[i] = 0;
        this.pulseEnd[i] = Infinity;
      }
  }
}

export function makeActuator(a: Actuation, wheels: WheelArray, periodS: number): WheelActuator {
  if (a.mode === 'pwm') return new PwmActuator(wheels, periodS);
  if (a.mode === 'quantized') return new QuantizedActuator(wheels, a.quantumNm);
  return new HoldActuator();
}
