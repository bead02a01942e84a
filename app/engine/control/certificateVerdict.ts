/**
 * Step 4 of the SO(3) synergy-gap certificate (certificate.ts, methods §5): the gap verdict and the
 * admissibility of δ (0 < δ < δ*; Mayhew & Teel, IEEE TAC 58(11):2730–2742, 2013), the sampled
 * flow-set gradient check, and the one-sentence summary for the certificate badge.
 */
import type { Issue } from '../errors';
import { fmt, fmtBelow } from './certificateCritical';
import type { FlowSetCheck } from './flowset';
import { flowSetGradientCheck } from './flowset';
import type { WarpFamily } from './potential';

export interface GapVerdict {
  /** No issue was raised, the gap above its tolerance included. */
  certified: boolean;
  /** certified and 0 < δ < δ* − tolerance. */
  admissible: boolean;
  /** δ*, or 0 when the family is refused. */
  deltaStar: number;
}

/**
 * Refuse a family without gap (δ* not above its tolerance), then judge δ against δ* when the family
 * is certified: not finite, not positive or not below δ* is an issue, within 10 % of δ* a warning.
 */
export function gapVerdict(
  deltaStar: number,
  deltaTol: number,
  delta: number,
  base: string,
  issues: Issue[],
  warnings: Issue[],
): GapVerdict {
  if (!(deltaStar > deltaTol))
    issues.push({
      path: base + 'warpDirections',
      rule: 'certificate-zero-gap',
      message: `the family has no synergy gap (δ* = ${fmt(deltaStar)} at or below the tolerance ${fmt(deltaTol)}): some undesired critical point is also a minimiser of the family; choose other warp directions (e.g. the eigenvectors of A) or another warp gain`,
    });
  const certified = issues.length === 0;
  if (!certified) deltaStar = 0;
  let admissible = false;
  if (certified) {
    if (!Number.isFinite(delta))
      issues.push({ path: base + 'gapThreshold', rule: 'finite', message: `the jump threshold δ must be a finite number (got ${delta})` });
    else if (!(delta > 0))
      issues.push({
        path: base + 'gapThreshold',
        rule: 'positive',
        message: `the jump threshold δ must be greater than zero (got ${delta})`,
      });
    else if (!(delta < deltaStar - deltaTol))
      issues.push({
        path: base + 'gapThreshold',
        rule: 'certificate-gap',
        message: `the jump threshold δ = ${delta} is not below the certified gap δ* = ${fmtBelow(deltaStar)}…: an undesired critical point would lie in the flow set; use δ ≤ ${fmtBelow(deltaStar)} (recommended ${fmt(0.8 * deltaStar)})`,
      });
    else {
      admissible = true;
      if (delta > 0.9 * deltaStar)
        warnings.push({
          path: base + 'gapThreshold',
          rule: 'gap-margin',
          message: `the jump threshold δ = ${delta} leaves only ${fmt(deltaStar - delta)} to the gap δ* = ${fmtBelow(deltaStar)}…; measurement noise could reach it (recommended ${fmt(0.8 * deltaStar)})`,
        });
    }
  }
  return { certified, admissible, deltaStar };
}

/**
 * The sampled flow-set gradient check of a certified family with a usable δ (null otherwise, or
 * with no samples). With δ < δ* the flow set holds no critical point but I: a vanishing
 * sampled/refined gradient there would contradict the certificate (a numerical failure worth a
 * loud warning).
 */
export function flowSetCheck(
  fam: WarpFamily,
  delta: number,
  verdict: GapVerdict,
  flowSetSamples: number | undefined,
  seed: number,
  base: string,
  warnings: Issue[],
): FlowSetCheck | null {
  const scale = 1 + fam.traceA;
  const flowSamples = Math.max(0, Math.floor(flowSetSamples ?? 20_000));
  const flowSet =
    verdict.certified && flowSamples > 0 && delta > 0 && Number.isFinite(delta)
      ? flowSetGradientCheck(fam, delta, { samples: flowSamples, seed })
      : null;
  if (flowSet && verdict.admissible && !(flowSet.minGradientNorm > 1e-9 * scale))
    warnings.push({
      path: base + 'gapThreshold',
      rule: 'flow-set-gradient',
      message: `sampled flow-set check found ‖b_q‖ = ${fmt(flowSet.minGradientNorm)} away from the identity inside the flow set, which contradicts the certificate; treat it as unreliable`,
    });
  return flowSet;
}

/** One plain sentence: certified and admissible, certified but δ not admissible, or refused (with the rules raised). */
export function certificateSummary(verdict: GapVerdict, deltaTol: number, delta: number, diffeo: number, issues: readonly Issue[]): string {
  const deltaStar = verdict.deltaStar;
  return verdict.certified
    ? verdict.admissible
      ? `Certified: synergy gap δ* = ${fmtBelow(deltaStar)}… (±${deltaTol.toExponential(1)}); δ = ${delta} is admissible with margin ${fmt(deltaStar - delta)} (${Math.round((100 * (deltaStar - delta)) / deltaStar)}% of δ*). Diffeomorphism margin ${fmt(diffeo)}.`
      : `Family certified with synergy gap δ* = ${fmtBelow(deltaStar)}…, but δ = ${delta} is NOT admissible (need 0 < δ < δ*; recommended ${fmt(0.8 * deltaStar)}).`
    : `Refused: ${issues
        .map((i) => i.rule)
        .filter((r, k, a) => a.indexOf(r) === k)
        .join(', ')} — ${issues[0]!.message}.`;
}
