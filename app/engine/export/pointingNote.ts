/**
 * The line the exports add for a pointing-only (roll-free) segment: which body axis was pointed
 * where, and that the attitude written is still the full attitude flown (the roll about the axis
 * as the controller left it), so a reader of the AEM knows the roll is not a requirement.
 */
import type { ScenarioSummary } from '../pipeline/types';

const fmt = (v: readonly number[]) => `(${v.map((x) => x.toFixed(6)).join(', ')})`;

/** The note for segment `index`, or null when its target fixes the full attitude (or there is none). */
export function pointingNote(scenario: ScenarioSummary, index: number): string | null {
  const p = scenario.targets[index]?.pointingOnly;
  if (!p) return null;
  return `Pointing only (roll free): body axis ${fmt(p.bodyAxis)} on ${scenario.inertialFrame} direction ${fmt(p.inertialDirection)}; the quaternions are the full attitude flown, the roll about that axis is as the controller left it`;
}
