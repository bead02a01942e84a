/**
 * Attitude-constraint margins in the exports: one column per constraint, named after it
 * (`margin_<name>_deg`, the name lower-cased with every run of other characters as `_`), in
 * degrees (negative: violated). Outside a constraint's window the margin is not defined: the
 * CSV leaves the cell empty and the JSON writes null. The AEM gets one COMMENT line per
 * constraint with its smallest margin and its violated time.
 */
import { DEG_PER_RAD } from '../units';
import type { Column } from './columns';

/** One constraint's check over the exported run (pipeline/constraints.ts RunConstraintReport, per constraint). */
export interface ExportConstraint {
  name: string;
  kind: 'keep-out' | 'keep-in';
  /** Margin per trace sample (rad), NaN outside the window. */
  marginRad: Float64Array;
  minMarginRad: number;
  minAtS: number;
  violatedS: number;
  violations: number;
}

/** `margin_<slug>_deg`, unique within the list (a repeated slug gets _2, _3 …). */
export function constraintColumnNames(names: readonly string[]): string[] {
  const used = new Map<string, number>();
  return names.map((n) => {
    const slug =
      n
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '_')
        .replace(/^_+|_+$/g, '') || 'constraint';
    const k = (used.get(slug) ?? 0) + 1;
    used.set(slug, k);
    return `margin_${slug}${k > 1 ? `_${k}` : ''}_deg`;
  });
}

export function constraintColumns(list: readonly ExportConstraint[] | undefined): Column[] {
  if (!list?.length) return [];
  const names = constraintColumnNames(list.map((c) => c.name));
  return list.map((c, i) => ({
    name: names[i]!,
    unit: 'deg',
    description: `${c.kind} margin of constraint "${c.name}" (negative: violated; empty outside its window)`,
    integer: false,
    undefinedAsNaN: true,
    get: (_tr, k) => c.marginRad[k]! * DEG_PER_RAD,
  }));
}

/** AEM COMMENT texts, one per constraint. */
export function constraintComments(list: readonly ExportConstraint[] | undefined): string[] {
  return (list ?? []).map((c) =>
    Number.isFinite(c.minMarginRad)
      ? `Constraint "${c.name}" (${c.kind}): ${c.violations ? `VIOLATED ${c.violatedS.toFixed(1)} s in ${c.violations} interval(s)` : 'clear'}, smallest margin ${(c.minMarginRad * DEG_PER_RAD).toFixed(3)} deg at t = ${c.minAtS.toFixed(2)} s`
      : `Constraint "${c.name}" (${c.kind}): not in force during the run`,
  );
}
