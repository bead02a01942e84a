/**
 * Constraint validation: each bad field gives its own issue (path and rule), all at once; the
 * target helper reports a keep-in that the target itself violates. Rules from the brief and
 * types.ts (common practice, no outside source needed: they are the library's own contract).
 */
import { describe, expect, it } from 'vitest';
import { prepareConstraints, targetKeepInViolations } from '../../app/engine/constraints/validate';
import { checkAttitudeHistory } from '../../app/engine/constraints/check';
import type { AttitudeConstraint } from '../../app/engine/constraints/types';

const D = Math.PI / 180;
const good = (): AttitudeConstraint => ({
  name: 'ST Sun',
  kind: 'keep-out',
  bodyAxis: [0, 0, 2],
  halfAngleRad: 30 * D,
  marginRad: 2 * D,
  source: { kind: 'fixed', direction: [3, 0, 0] },
});
const rules = (cs: unknown) => {
  const r = prepareConstraints(cs);
  return r.ok ? [] : r.errors.map((e) => `${e.path}:${e.rule}`);
};

describe('prepareConstraints', () => {
  it('normalises axes and directions and shares a source given twice', () => {
    const src: AttitudeConstraint['source'] = { kind: 'fixed', direction: [0, 5, 0] };
    const r = prepareConstraints([{ ...good(), source: src }, { ...good(), name: 'ST2', source: src }, good()]);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Array.from(r.value[0]!.axisBody)).toEqual([0, 0, 1]);
    expect(Array.from(r.value[0]!.source.directions)).toEqual([0, 1, 0]);
    expect(r.value.map((c) => c.sourceIndex)).toEqual([0, 0, 1]);
    expect(r.value[0]!.windowStartS).toBe(-Infinity);
  });
  it('lists every problem: zero axis, half-angle outside (0°, 180°), negative margin, window end before start', () => {
    expect(rules([{ ...good(), bodyAxis: [0, 0, 0] }])).toEqual(['constraints[0].bodyAxis:non-zero']);
    expect(rules([{ ...good(), halfAngleRad: 0 }])).toEqual(['constraints[0].halfAngleRad:half-angle-range']);
    expect(rules([{ ...good(), halfAngleRad: Math.PI }])).toEqual(['constraints[0].halfAngleRad:half-angle-range']);
    expect(rules([{ ...good(), marginRad: -0.01 }])).toEqual(['constraints[0].marginRad:non-negative']);
    expect(rules([{ ...good(), window: { startS: 10, endS: 5 } }])).toEqual(['constraints[0].window.endS:window-order']);
    expect(
      rules([
        { ...good(), bodyAxis: [0, 0, 0], halfAngleRad: 4, marginRad: -1 },
        { ...good(), window: { startS: 1, endS: 0 } },
      ]),
    ).toEqual([
      'constraints[0].bodyAxis:non-zero',
      'constraints[0].halfAngleRad:half-angle-range',
      'constraints[0].marginRad:non-negative',
      'constraints[1].window.endS:window-order',
    ]);
  });
  it('rejects a keep-in that the margin swallows, names, kinds and bad sources', () => {
    expect(rules([{ ...good(), kind: 'keep-in', halfAngleRad: 0.1, marginRad: 0.1 }])).toEqual([
      'constraints[0].marginRad:keep-in-vanishes',
    ]);
    expect(rules([{ ...good(), name: ' ' }])).toEqual(['constraints[0].name:name']);
    expect(rules([{ ...good(), kind: 'keep-near' }])).toEqual(['constraints[0].kind:enum']);
    expect(rules([{ ...good(), source: { kind: 'fixed', direction: [0, 0, 0] } }])).toEqual(['constraints[0].source.direction:non-zero']);
    expect(rules([{ ...good(), source: { kind: 'fixed', direction: [1, 0, 0], angularRadiusRad: -0.1 } }])).toEqual([
      'constraints[0].source.angularRadiusRad:radius-range',
    ]);
    const sampled = (timesS: number[], directions: number[]) => ({
      ...good(),
      source: { kind: 'sampled', timesS, directions, interpolation: 'linear' },
    });
    expect(rules([sampled([0, 0], [1, 0, 0, 1, 0, 0])])).toEqual(['constraints[0].source.timesS[1]:increasing']);
    expect(rules([sampled([0, 1], [1, 0, 0])])).toEqual(['constraints[0].source.directions:length']);
    expect(rules([sampled([0, 1], [1, 0, 0, -1, 0.1, 0])])).toEqual(['constraints[0].source.directions[1]:sample-step']);
    expect(rules('nope')).toEqual(['constraints:type']);
  });
});

describe('targetKeepInViolations', () => {
  it('reports a keep-in the target violates and nothing for one it keeps', () => {
    const r = prepareConstraints([
      {
        ...good(),
        name: 'antenna',
        kind: 'keep-in',
        bodyAxis: [1, 0, 0],
        halfAngleRad: 20 * D,
        marginRad: 0,
        source: { kind: 'fixed', direction: [0, 1, 0] },
      },
      {
        ...good(),
        name: 'panel',
        kind: 'keep-in',
        bodyAxis: [0, 1, 0],
        halfAngleRad: 20 * D,
        marginRad: 0,
        source: { kind: 'fixed', direction: [0, 1, 0] },
      },
    ]);
    if (!r.ok) throw new Error('invalid');
    const issues = targetKeepInViolations([0, 0, 0, 1], r.value, 0);
    expect(issues.map((i) => i.rule)).toEqual(['keep-in-violated']);
    expect(issues[0]!.message).toContain('antenna');
    expect(issues[0]!.message).toContain('70.000°');
  });
});

describe('history validation', () => {
  it('reports times that do not increase, zero quaternions and a wrong length, with the constraint issues', () => {
    const r = checkAttitudeHistory({ timesS: [0, 1, 1], qInertialFromBody: [0, 0, 0, 1, 0, 0, 0, 0, 0, 0, 0, 1] }, [
      { ...good(), marginRad: -1 },
    ]);
    expect(r.ok ? [] : r.errors.map((e) => `${e.path}:${e.rule}`)).toEqual([
      'history.qInertialFromBody[1]:quaternion',
      'history.timesS[2]:increasing',
      'constraints[0].marginRad:non-negative',
    ]);
    const short = checkAttitudeHistory({ timesS: [0, 1], qInertialFromBody: [0, 0, 0, 1] }, [good()]);
    expect(short.ok ? [] : short.errors.map((e) => e.rule)).toEqual(['length']);
  });
});
