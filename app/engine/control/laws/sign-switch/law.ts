/** Memoryless sign switch (methods §2b); see quaternionBase.ts for the shared form and sources. */
import { sgnPos } from '../../tracking';
import { MemorylessLaw } from '../../quaternionBase';

/** Memoryless shortest-path law, s = sgn(η) with sgn(0) = +1. Logic unused (0). */
export class SignSwitch extends MemorylessLaw {
  readonly kind = 'sign-switch' as const;
  readonly jumpDecrease = 0;
  protected sign(eta: number): number {
    return sgnPos(eta);
  }
  protected familyMin(eta: number): number {
    return 2 * (1 - Math.abs(eta));
  }
}
