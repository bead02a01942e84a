/**
 * The certificate cache returns the same verdict as a fresh computation, and callers cannot
 * corrupt it by editing a result (methods note §4.3 parameter set: δ* = 0.249989).
 */
import { describe, expect, it } from 'vitest';
import { certifySynergistic, clearCertificateCache } from '../../app/engine/control/certificate';
import { makeWarpFamily } from '../../app/engine/control/potential';

describe('certificate cache', () => {
  it('a cached result equals a fresh one and is a private copy', () => {
    const A = new Float64Array([1, 0, 0, 0, 2, 0, 0, 0, 3]);
    const fam = makeWarpFamily(A, 0.15, new Float64Array([1, 0, 0, 0, 1, 0, 0, 0, 1]));
    clearCertificateCache();
    const first = certifySynergistic({ family: fam, delta: 0.2 });
    first.criticalPoints[0]!.gap = -1; // a caller scribbling on its copy
    first.deltaStar = 99;
    const second = certifySynergistic({ family: fam, delta: 0.2 });
    expect(second.deltaStar).toBeCloseTo(0.249989, 6);
    expect(second.criticalPoints[0]!.gap).not.toBe(-1);
    clearCertificateCache();
    const fresh = certifySynergistic({ family: fam, delta: 0.2 });
    expect(fresh.deltaStar).toBe(second.deltaStar);
    expect(fresh.admissible).toBe(true);
    const other = certifySynergistic({ family: fam, delta: 0.3 });
    expect(other.admissible).toBe(false); // δ above δ*: a different key, not the cached verdict
  });
});
