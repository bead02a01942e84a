/**
 * Theory lines for the robustness maps: where a published result says where a law's boundary
 * lies, the line in the sweep's parameter plane, with its citation. The map view draws them over
 * the measured boundary; sweep.json carries them.
 *
 * Hysteretic quaternion feedback: the measured sign of η can only be flipped by noise of worst-case
 * size ē while |η| < ē, and the hysteresis keeps the logic variable from jumping while |η| ≥ −δ on
 * its side, so convergence from every start survives when ē < δ (Mayhew, Sanfelice & Teel 2011,
 * "Quaternion-based hybrid control for robust global attitude tracking", IEEE TAC 56(11)). On an
 * (ē, δ) sweep that is the line ē = δ; on a sweep of ē alone (δ fixed by the controller) or of δ
 * alone (ē fixed by the study) it is the single value where the two meet.
 *
 * Synergistic feedback: the hybrid law has no undesired equilibrium in its flow set, hence global
 * asymptotic stability, when its jump threshold δ lies below the synergy gap δ* of its family
 * (min of V_q − min_p V_p over the undesired critical points of every member): Mayhew & Teel,
 * "Synergistic hybrid feedback for global rigid-body attitude tracking on SO(3)", IEEE TAC
 * 58(11):2730–2742, 2013 (methods §4.1), and for pointing on the sphere Mayhew & Teel's 2-sphere
 * construction (Automatica 2013, venue from memory). δ* is the controller's certificate
 * (control/certificate.ts, control/sphere/certificate.ts); on a sweep with the threshold on an
 * axis the line is threshold = δ*.
 */
import type { SweepParameter } from './sweep';
import type { SweepInfo } from './sweepRun';

/** One theory line: a polyline in axis units (two-axis sweep) or one value on the single axis (a1 = null). */
export interface SweepTheoryLine {
  controllerId: string;
  /** What the line says, in the map's words (shown beside the line). */
  label: string;
  /** The published source. */
  source: string;
  /** Points in parameter space: a0 on axis 0, a1 on axis 1 (null on a one-axis sweep). */
  points: { a0: number; a1: number | null }[];
}

/** What the lines need besides the grid: the values a sweep does not vary (from cell 0's build). */
export interface SweepTheoryInputs {
  /** Worst-case noise ē of the study's cases when it is not swept (study.dispersions.sensors.adversarialEta). */
  worstCaseEta: number;
  controllers: {
    id: string;
    /** Hysteresis δ of a hysteretic law (null: another law). */
    hysteresis: number | null;
    /** Certified synergy gap δ* of a synergistic law, in its potential units (null: another law or a refused family). */
    gapStar: number | null;
  }[];
}

const MST_2011 = 'Mayhew, Sanfelice & Teel 2011, IEEE TAC 56(11): convergence is robust to noise smaller than the hysteresis';
const MT_2013_SO3 = 'Mayhew & Teel 2013, IEEE TAC 58(11): global convergence for a jump threshold below the certified synergy gap δ*';
const MT_2013_S2 =
  'Mayhew & Teel 2013, synergistic feedback on the 2-sphere (Automatica; venue from memory): global convergence for a jump threshold below the certified synergy gap δ*';

type Info = Pick<SweepInfo, 'def' | 'controllers'> & { theoryInputs?: SweepTheoryInputs };

const axisIndex = (info: Pick<SweepInfo, 'def'>, p: SweepParameter) => info.def.axes.findIndex((a) => a.parameter === p);

function range(info: Pick<SweepInfo, 'def'>, k: number): readonly [number, number] {
  const v = info.def.axes[k]!.values;
  return [Math.min(...v), Math.max(...v)] as const;
}

/**
 * The line "axis k = x": one value on a one-axis sweep, a segment across the other axis on a
 * two-axis one; null when x lies outside the grid's range on axis k (clipped away).
 */
function lineAt(info: Pick<SweepInfo, 'def'>, k: number, x: number): SweepTheoryLine['points'] | null {
  const [lo, hi] = range(info, k);
  if (!(x >= lo && x <= hi)) return null;
  if (info.def.axes.length === 1) return [{ a0: x, a1: null }];
  const [o0, o1] = range(info, 1 - k);
  return k === 0
    ? [
        { a0: x, a1: o0 },
        { a0: x, a1: o1 },
      ]
    : [
        { a0: o0, a1: x },
        { a0: o1, a1: x },
      ];
}

const fmt = (x: number) => String(Number(x.toPrecision(6)));

/** The line ē = δ for every hysteretic controller on a sweep whose two axes are ē and δ, clipped to the grid. */
function noiseBelowHysteresis(info: Info): SweepTheoryLine[] {
  const ie = axisIndex(info, 'worst-case-eta');
  const id = axisIndex(info, 'hysteresis');
  if (info.def.axes.length !== 2 || ie < 0 || id < 0) return [];
  const [e0, e1] = range(info, ie);
  const [d0, d1] = range(info, id);
  const lo = Math.max(e0, d0);
  const hi = Math.min(e1, d1);
  if (!(hi > lo)) return [];
  // The line is its own mirror image, so the axis order does not matter.
  const at = (x: number) => ({ a0: x, a1: x });
  return info.controllers
    .filter((c) => c.law === 'hysteretic')
    .map((c) => ({ controllerId: c.id, label: 'ē = δ', source: MST_2011, points: [at(lo), at(hi)] }));
}

/**
 * ē = δ when only one of the two is on an axis: ē swept meets each hysteretic controller's fixed δ,
 * δ swept meets the study's fixed ē (a second axis, if any, varies something else: the line spans it).
 */
function noiseBelowFixedHysteresis(info: Info): SweepTheoryLine[] {
  const inputs = info.theoryInputs;
  const ie = axisIndex(info, 'worst-case-eta');
  const id = axisIndex(info, 'hysteresis');
  if (!inputs || ie < 0 === id < 0) return [];
  const out: SweepTheoryLine[] = [];
  for (const c of info.controllers) {
    if (c.law !== 'hysteretic') continue;
    const fixed = ie >= 0 ? inputs.controllers.find((x) => x.id === c.id)?.hysteresis : inputs.worstCaseEta;
    if (fixed === null || fixed === undefined) continue;
    const points = lineAt(info, ie >= 0 ? ie : id, fixed);
    if (!points) continue;
    const label = ie >= 0 ? `ē = δ (δ = ${fmt(fixed)})` : `δ = ē (ē = ${fmt(fixed)})`;
    out.push({ controllerId: c.id, label, source: MST_2011, points });
  }
  return out;
}

/** threshold = δ* for every synergistic controller with a certified gap, on a sweep with the jump threshold on an axis. */
function thresholdBelowGap(info: Info): SweepTheoryLine[] {
  const it = axisIndex(info, 'jump-threshold');
  const inputs = info.theoryInputs;
  if (it < 0 || !inputs) return [];
  const out: SweepTheoryLine[] = [];
  for (const c of info.controllers) {
    if (c.law !== 'synergistic' && c.law !== 'pointing-synergistic') continue;
    const gap = inputs.controllers.find((x) => x.id === c.id)?.gapStar;
    if (gap === null || gap === undefined || !(gap > 0)) continue;
    const points = lineAt(info, it, gap);
    if (!points) continue;
    const source = c.law === 'synergistic' ? MT_2013_SO3 : MT_2013_S2;
    out.push({ controllerId: c.id, label: `δ = δ* (${fmt(gap)}, certified)`, source, points });
  }
  return out;
}

/** Every theory line that applies to this sweep (empty when none applies), in a fixed order. */
export function sweepTheoryLines(info: Info): SweepTheoryLine[] {
  return [...noiseBelowHysteresis(info), ...noiseBelowFixedHysteresis(info), ...thresholdBelowGap(info)];
}
