/**
 * The settle rule, as a running check: a run is settled from the first sample after which the
 * error angle stays below `angleRad` and the rate error |ω − ω_ref| below `rateRadPerS`
 * (metrics.ts measures the settle time with the same thresholds after the run). A flight may end
 * early once it has been settled for `holdS` (studies, and simulation.endWhenSettledForS): the
 * closed loop asks a SettleWatch at every recorded sample.
 */

export class SettleWatch {
  private since = -1;

  constructor(
    readonly angleRad: number,
    readonly rateRadPerS: number,
    /** How long the run must stay settled before it may end, s. */
    readonly holdS: number,
  ) {}

  /** Feed one sample; true once the run has stayed settled for holdS. */
  update(t: number, errorAngleRad: number, rateErrorRadPerS: number): boolean {
    if (!(errorAngleRad < this.angleRad && rateErrorRadPerS < this.rateRadPerS)) {
      this.since = -1;
      return false;
    }
    if (this.since < 0) {
      this.since = t;
      return false;
    }
    return t - this.since >= this.holdS;
  }
}
