/**
 * Pointing-only (roll-free) targets in the pipeline (scenario/pointingOnly.ts):
 *  - the per-segment axis table the closed loop hands to the laws and the pointing noise;
 *  - the rule that a pointing law flies only pointing-only targets.
 */
import type { Issue } from '../errors';
import { lawDefinition } from '../control/registry';
import type { ResolvedController, ResolvedTarget } from '../scenario/resolve';

/** Pointed body axis per target, 3 each (zeros for a full-attitude target); null when no target is roll free. */
export function pointingAxesOf(targets: readonly Pick<ResolvedTarget, 'pointingOnly'>[]): Float64Array | null {
  if (!targets.some((t) => t.pointingOnly)) return null;
  const out = new Float64Array(3 * targets.length);
  targets.forEach((t, k) => {
    if (t.pointingOnly) out.set(t.pointingOnly.bodyAxis, 3 * k);
  });
  return out;
}

/**
 * A pointing law controls one body axis and leaves the roll free, so it cannot fly a target that
 * fixes the whole attitude: such a pair is refused (at build, before any simulation), naming the
 * controller, the target and the two ways out.
 */
export function pointingLawIssues(
  controllers: readonly ResolvedController[],
  targets: readonly Pick<ResolvedTarget, 'label' | 'pointingOnly'>[],
  only?: readonly string[],
): Issue[] {
  const issues: Issue[] = [];
  const full = targets.map((t, k) => ({ t, k })).filter((x) => !x.t.pointingOnly);
  if (full.length === 0) return issues;
  controllers.forEach((c, i) => {
    if (only && !only.includes(c.id)) return;
    if (!lawDefinition(c.law).pointingOnly) return;
    const names = full.map((x) => `targets[${x.k}] "${x.t.label}"`);
    const shown = names.length > 3 ? `${names.slice(0, 3).join(', ')} and ${names.length - 3} more` : names.join(', ');
    issues.push({
      path: `controllers[${i}].law`,
      rule: 'needs-pointing-only',
      message: `controllers[${i}] "${c.label}" (${lawDefinition(c.law).title}) controls one body axis and leaves the roll free, so it cannot fly a full-attitude target: ${shown} ${full.length === 1 ? 'fixes' : 'fix'} the whole attitude. Make ${full.length === 1 ? 'that target' : 'those targets'} pointing-only (rollFree: true on a "pointing" attitude) or fly ${full.length === 1 ? 'it' : 'them'} with a full-attitude law.`,
    });
  });
  return issues;
}
