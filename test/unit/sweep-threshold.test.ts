/**
 * The jump threshold as a swept parameter and the theory lines' placement (app/engine/study/sweep.ts,
 * sweepTheory.ts). Where a line sits is the published condition it draws: ē = δ (Mayhew, Sanfelice &
 * Teel 2011, IEEE TAC 56(11)) and δ = δ* (Mayhew & Teel 2013, IEEE TAC 58(11)); clipping to the grid,
 * the field names and the refusals are our own format's rules (no outside source). The grids and
 * controllers here are made up for the geometry; the δ* value fed in is methods §4.3's 0.249989.
 */
import { describe, expect, it } from 'vitest';
import { applyParameter, validateSweep, type SweepDefinition } from '../../app/engine/study/sweep';
import { runSweep, sweepInfo } from '../../app/engine/study/sweepRun';
import { makeStudyContext } from '../../app/engine/study/context';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { sweepTheoryLines, type SweepTheoryInputs } from '../../app/engine/study/sweepTheory';
import { loadScenario } from '../../app/engine/scenario/load';
import { toScenarioFile } from '../../app/engine/scenario/toFile';
import { testVehicleScenario } from './study-fixtures';

const spec = (axes: unknown[], extra: Record<string, unknown> = {}) =>
  ({ axes, runs: 1, seed: 5, controllers: null, level: 0.5, ...extra }) as Parameters<typeof validateSweep>[0];

function defOf(axes: unknown[]): SweepDefinition {
  const d = validateSweep(spec(axes));
  if (!d.ok) throw new Error(JSON.stringify(d.errors));
  return d.value;
}

const CONTROLLERS = [
  { id: 'hyst', label: 'Hysteretic', law: 'hysteretic' },
  { id: 'syn', label: 'Synergistic', law: 'synergistic' },
  { id: 'point', label: 'Pointing synergistic', law: 'pointing-synergistic' },
  { id: 'pd', label: 'PD', law: 'quaternion-pd' },
];
const INPUTS: SweepTheoryInputs = {
  worstCaseEta: 0.15,
  controllers: [
    { id: 'hyst', hysteresis: 0.2, gapStar: null },
    { id: 'syn', hysteresis: null, gapStar: 0.249989 },
    { id: 'point', hysteresis: null, gapStar: 0.9 },
    { id: 'pd', hysteresis: null, gapStar: null },
  ],
};
const lines = (axes: unknown[], inputs: SweepTheoryInputs | null = INPUTS) =>
  sweepTheoryLines({ def: defOf(axes), controllers: CONTROLLERS, ...(inputs ? { theoryInputs: inputs } : {}) });

describe('jump-threshold parameter', () => {
  it('is written into every synergistic controller (both laws), with the certificate gate off; other laws unchanged', () => {
    const j = testVehicleScenario({ runs: 1, seed: 1 });
    const cs = j.controllers as Record<string, unknown>[];
    cs.push({
      id: 'pt',
      label: 'Pointing',
      law: 'pointing-synergistic',
      gains: { kp: 1, kd: 1 },
      warpGain: 0.5,
      warpAzimuthsDeg: [0, 120, 240],
      gapThreshold: 0.4,
    });
    applyParameter(j, 'jump-threshold', 0.33);
    for (const c of cs) {
      const syn = c.law === 'synergistic' || c.law === 'pointing-synergistic';
      expect(c.gapThreshold).toBe(syn ? 0.33 : undefined);
      expect(c.requireCertificate).toBe(syn ? false : undefined);
    }
  });

  it('requireCertificate: false survives load and write-back; absent stays absent', () => {
    const j = testVehicleScenario({ runs: 1, seed: 1 });
    const plain = loadScenario(j);
    if (!plain.ok) throw new Error(JSON.stringify(plain.errors));
    const synPlain = toScenarioFile(plain.value).controllers.find((c) => c.law === 'synergistic')!;
    expect('requireCertificate' in synPlain).toBe(false);
    applyParameter(j, 'jump-threshold', 0.2);
    const gated = loadScenario(j);
    if (!gated.ok) throw new Error(JSON.stringify(gated.errors));
    expect(gated.value.controllers.find((c) => c.law === 'synergistic')!.requireCertificate).toBe(false);
    const back = toScenarioFile(gated.value).controllers.find((c) => c.law === 'synergistic')!;
    expect((back as { requireCertificate?: boolean }).requireCertificate).toBe(false);
    (j.controllers as Record<string, unknown>[])[3]!.requireCertificate = 'no';
    const bad = loadScenario(j);
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors.some((e) => e.path === 'controllers[3].requireCertificate')).toBe(true);
  });

  it('lets a pointing-synergistic law fly beyond its certified gap, which the plain scenario refuses', () => {
    const json = JSON.parse(readFileSync(path.join(__dirname, '../../assets/petrel16-pointing.scenario.json'), 'utf8')) as Record<
      string,
      unknown
    >;
    const d = validateSweep(spec([{ parameter: 'jump-threshold', values: [2.5, 3] }], { controllers: ['synergistic'] }));
    if (!d.ok) throw new Error('bad sweep');
    const inf = sweepInfo(json, d.value);
    expect(inf.ok).toBe(true);
    // the S² certificate's δ* of the example's family (control/sphere/certificate.ts) lies below the grid: no line
    const gap = inf.ok ? inf.value.theoryInputs!.controllers[0]!.gapStar : null;
    expect(gap).toBeGreaterThan(0);
    expect(gap).toBeLessThan(2.5);
    expect(inf.ok && sweepTheoryLines(inf.value)).toEqual([]);
    const plain = JSON.parse(JSON.stringify(json)) as { controllers: Record<string, unknown>[] };
    plain.controllers.find((c) => c.id === 'synergistic')!.gapThreshold = 2.5;
    const refused = makeStudyContext(plain, { controllers: ['synergistic'] });
    expect(refused.ok).toBe(false);
    if (!refused.ok) expect(refused.errors.some((e) => e.path.startsWith('controllers[1].gapThreshold'))).toBe(true);
  });

  it('must be positive; the message names the axis field', () => {
    const r = validateSweep(spec([{ parameter: 'jump-threshold', values: [0, 0.1] }]));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.path).toBe('sweep.axes[0].values[0]');
  });

  it('is refused when no controller flown is synergistic, naming the axis', () => {
    const j = testVehicleScenario({ runs: 1, seed: 1 });
    const d = validateSweep(spec([{ parameter: 'jump-threshold', values: [0.1] }], { controllers: ['pd', 'hyst'] }));
    if (!d.ok) throw new Error('bad sweep');
    const r = runSweep(j, d.value);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors[0]!.rule).toBe('needs-synergistic');
      expect(r.errors[0]!.path).toBe('sweep.axes[0].parameter');
      expect(r.errors[0]!.message).toContain('pd, hyst');
    }
  });
});

describe('theory lines', () => {
  it('threshold axis alone: one value δ* per synergistic controller inside the grid, each with its source', () => {
    const t = lines([{ parameter: 'jump-threshold', lo: 0.1, hi: 0.5, steps: 5 }]);
    // the pointing law's δ* = 0.9 lies beyond the grid: clipped away
    expect(t.map((x) => x.controllerId)).toEqual(['syn']);
    expect(t[0]!.points).toEqual([{ a0: 0.249989, a1: null }]);
    expect(t[0]!.source).toMatch(/IEEE TAC 58\(11\)/);
    const wide = lines([{ parameter: 'jump-threshold', lo: 0.1, hi: 1, steps: 4 }]);
    expect(wide.map((x) => [x.controllerId, x.points[0]!.a0])).toEqual([
      ['syn', 0.249989],
      ['point', 0.9],
    ]);
    expect(wide[1]!.source).toMatch(/2-sphere/);
  });

  it('threshold on either axis of a 2-D grid: a segment at δ* across the other axis', () => {
    const a = lines([
      { parameter: 'jump-threshold', values: [0.1, 0.3] },
      { parameter: 'noise-scale', values: [1, 2, 4] },
    ]);
    expect(a[0]!.points).toEqual([
      { a0: 0.249989, a1: 1 },
      { a0: 0.249989, a1: 4 },
    ]);
    const b = lines([
      { parameter: 'control-rate-hz', values: [5, 10] },
      { parameter: 'jump-threshold', values: [0.1, 0.3] },
    ]);
    expect(b[0]!.points).toEqual([
      { a0: 5, a1: 0.249989 },
      { a0: 10, a1: 0.249989 },
    ]);
  });

  it('ē alone: the value ē = δ of each hysteretic controller; δ alone: δ = the study’s ē', () => {
    const e = lines([{ parameter: 'worst-case-eta', lo: 0, hi: 0.4, steps: 5 }]);
    expect(e.map((x) => [x.controllerId, x.label, x.points])).toEqual([['hyst', 'ē = δ (δ = 0.2)', [{ a0: 0.2, a1: null }]]]);
    expect(e[0]!.source).toMatch(/Mayhew, Sanfelice & Teel 2011/);
    const d = lines([{ parameter: 'hysteresis', lo: 0.1, hi: 0.3, steps: 3 }]);
    expect(d.map((x) => [x.controllerId, x.label, x.points])).toEqual([['hyst', 'δ = ē (ē = 0.15)', [{ a0: 0.15, a1: null }]]]);
    // clipped: ē outside the δ grid, δ outside the ē grid, or no inputs at all
    expect(lines([{ parameter: 'hysteresis', values: [0.2, 0.3] }])).toEqual([]);
    expect(lines([{ parameter: 'worst-case-eta', values: [0.3, 0.4] }])).toEqual([]);
    expect(lines([{ parameter: 'worst-case-eta', values: [0.1, 0.4] }], null)).toEqual([]);
  });

  it('the (ē, δ) grid keeps its diagonal only (no extra fixed-value lines)', () => {
    const t = lines([
      { parameter: 'worst-case-eta', values: [0.05, 0.35] },
      { parameter: 'hysteresis', values: [0.1, 0.3] },
    ]);
    expect(t.map((x) => [x.controllerId, x.label, x.points])).toEqual([
      [
        'hyst',
        'ē = δ',
        [
          { a0: 0.1, a1: 0.1 },
          { a0: 0.3, a1: 0.3 },
        ],
      ],
    ]);
  });
});
