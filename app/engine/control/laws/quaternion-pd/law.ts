/** Continuous quaternion PD (methods §2a); see quaternionBase.ts for the shared form and sources. */
import { MemorylessLaw } from '../../quaternionBase';

/** Continuous quaternion PD (unwinds; Bhat & Bernstein 2000). Logic unused (0). */
export class QuaternionPd extends MemorylessLaw {
  readonly kind = 'quaternion-pd' as const;
  readonly jumpDecrease = 0;
  protected sign(): number {
    return 1;
  }
  protected familyMin(eta: number): number {
    return 2 * (1 - eta);
  }
}
