/**
 * Sweep definition, cells and boundaries (app/engine/study/sweep*.ts). Rules and names are our own
 * format's (no outside source); the interpolation check is a worked example by hand (linear
 * interpolation between two grid values); the band-edge noise check is its defining formula
 * (measured η = −sgn(η)·ē, unit quaternion, vector part along the true one).
 */
import { describe, expect, it } from 'vitest';
import { applyParameter, cellPosition, cellSeed, validateSweep, type SweepDefinition } from '../../app/engine/study/sweep';
import { runSweep, runSweepCell, sweepBoundaries, sweepCellJson, type SweepCell } from '../../app/engine/study/sweepRun';
import { sweepCellsCsv, sweepJson } from '../../app/engine/study/sweepExport';
import { measure } from '../../app/engine/sim/sensors';
import { makeRng } from '../../app/engine/math/prng';
import { shareReport } from '../../app/engine/math/stats';
import { testVehicleScenario } from './study-fixtures';
import { loadScenario } from '../../app/engine/scenario/load';
import { toScenarioFile } from '../../app/engine/scenario/toFile';

const spec = (axes: unknown[], extra: Record<string, unknown> = {}) =>
  ({ axes, runs: 2, seed: 5, controllers: null, level: 0.5, ...extra }) as Parameters<typeof validateSweep>[0];

describe('sweep definition', () => {
  it('lo/hi/steps gives evenly spaced values with both ends exact; listed values are kept', () => {
    const r = validateSweep(
      spec([
        { parameter: 'worst-case-eta', lo: 0, hi: 0.3, steps: 4 },
        { parameter: 'control-rate-hz', values: [2, 5, 10] },
      ]),
    );
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.axes[0]!.values).toEqual([0, 0.1, 0.2, 0.3]);
    expect(r.value.axes[1]!.values).toEqual([2, 5, 10]);
    expect(cellPosition(r.value, 0)).toEqual([0, 0]);
    expect(cellPosition(r.value, 5)).toEqual([1, 1]); // first axis fastest: 5 = 1 + 4·1
  });

  it('reports every problem with its path and rule', () => {
    const r = validateSweep(
      spec(
        [
          { parameter: 'gain', values: [1] },
          { parameter: 'hysteresis', lo: 0.5, hi: 0.2, steps: 2.5 },
        ],
        { runs: 0, seed: -1, level: 1 },
      ),
    );
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const keys = r.errors.map((e) => `${e.path}|${e.rule}`);
    expect(keys).toEqual([
      'sweep.axes[0].parameter|unknown-parameter',
      'sweep.axes[1].steps|integer',
      'sweep.axes[1].lo|min-max',
      'sweep.runs|range',
      'sweep.seed|range',
      'sweep.level|range',
    ]);
    expect(r.errors[0]!.message).toContain('"gain" is not a sweep parameter');
  });

  it('values out of a parameter’s range, not increasing, or the same parameter twice are refused', () => {
    const bad = (axes: unknown[]) => {
      const r = validateSweep(spec(axes));
      return r.ok ? [] : r.errors.map((e) => `${e.path}|${e.rule}`);
    };
    expect(bad([{ parameter: 'hysteresis', values: [0, 0.2] }])).toEqual(['sweep.axes[0].values[0]|range']);
    expect(bad([{ parameter: 'worst-case-eta', values: [0.2, 0.1] }])).toEqual(['sweep.axes[0].values|increasing']);
    expect(bad([{ parameter: 'control-rate-hz', lo: 1, hi: 2000, steps: 3 }])).toEqual(['sweep.axes[0].hi|range']);
    expect(
      bad([
        { parameter: 'failed-wheel', values: [0, 1] },
        { parameter: 'failed-wheel', values: [0.5] },
      ]),
    ).toEqual(['sweep.axes[1].parameter|unique']);
    expect(bad([])).toEqual(['sweep.axes|count']);
  });

  it('cell seeds depend only on (sweep seed, cell index)', () => {
    expect(cellSeed(5, 3)).toBe(cellSeed(5, 3));
    const seeds = new Set(Array.from({ length: 1000 }, (_, i) => cellSeed(5, i)));
    expect(seeds.size).toBe(1000);
    expect(cellSeed(6, 3)).not.toBe(cellSeed(5, 3));
  });

  it('each parameter is written where the scenario reads it', () => {
    const j = testVehicleScenario({ runs: 1, seed: 1, dispersions: { controlRateHz: [5, 10], actuation: ['hold', 'pwm'] } });
    applyParameter(j, 'hysteresis', 0.3);
    applyParameter(j, 'control-rate-hz', 4);
    applyParameter(j, 'torque-quantum-mnm', 0.5);
    applyParameter(j, 'worst-case-eta', 0.1);
    applyParameter(j, 'noise-scale', 2);
    applyParameter(j, 'inertia-error', 0.05);
    applyParameter(j, 'failed-wheel', 0.25);
    const c = j.controllers as { law: string; hysteresis?: number }[];
    expect(c.find((x) => x.law === 'hysteretic')!.hysteresis).toBe(0.3);
    expect(c.find((x) => x.law === 'synergistic')!.hysteresis).toBeUndefined();
    const v = j.vehicle as Record<string, unknown>;
    expect(v.controlRateHz).toBe(4);
    expect(v.actuation).toEqual({ mode: 'quantized', torqueQuantumMNm: 0.5 });
    const d = (j.study as { dispersions: Record<string, Record<string, unknown>> }).dispersions;
    expect(d.controlRateHz).toBeUndefined();
    expect(d.actuation).toBeUndefined();
    expect(d.sensors).toEqual({ adversarialEta: 0.1, attitudeNoiseScale: [2, 2] });
    expect(d.inertia).toEqual({ momentSigmaFraction: 0.05 });
    expect(d.wheels).toEqual({ failOneWheelProbability: 0.25 });
  });
});

describe('boundaries', () => {
  const def: SweepDefinition = {
    axes: [
      { parameter: 'worst-case-eta', label: '', unit: '', values: [0, 0.1, 0.2] },
      { parameter: 'hysteresis', label: '', unit: '', values: [0.1, 0.2] },
    ],
    runs: 10,
    seed: 0,
    controllers: null,
    level: 0.5,
  };
  const cell = (index: number, settled: number): SweepCell => ({
    index,
    position: cellPosition(def, index),
    values: [],
    seed: 0,
    casesDone: 10,
    controllers: [
      {
        controllerId: 'h',
        flyable: 10,
        settled: shareReport(settled, 10),
        stalled: shareReport(10 - settled, 10),
        unwound: shareReport(0, 10),
        chattered: shareReport(0, 10),
        settleMedianS: null,
        settleP95S: null,
        worstCase: null,
      },
    ],
  });
  it('interpolates linearly along each grid line (worked by hand)', () => {
    // row δ = 0.1: shares 1.0, 0.8, 0.2 → 0.5 between ē = 0.1 and 0.2 at 0.1 + (0.5 − 0.8)/(0.2 − 0.8)·0.1 = 0.15
    // row δ = 0.2: shares 1.0, 1.0, 0.9 → no crossing; column ē = 0.2: 0.2 → 0.9 rises at 0.1 + (0.3/0.7)·0.1
    const cells = [cell(0, 10), cell(1, 8), cell(2, 2), cell(3, 10), cell(4, 10), cell(5, 9)];
    const b = sweepBoundaries({ def, controllers: [{ id: 'h', label: 'H', law: 'hysteretic' }] }, cells)[0]!;
    expect(b.points.length).toBe(2);
    expect(b.points[0]!.along).toBe(0);
    expect(b.points[0]!.fixedValue).toBe(0.1);
    expect(b.points[0]!.value).toBeCloseTo(0.15, 12);
    expect(b.points[0]!.direction).toBe('falls');
    expect(b.points[1]!.along).toBe(1);
    expect(b.points[1]!.fixedValue).toBe(0.2);
    expect(b.points[1]!.value).toBeCloseTo(0.1 + (0.3 / 0.7) * 0.1, 12);
    expect(b.points[1]!.direction).toBe('rises');
  });
  it('a missing cell breaks its grid lines', () => {
    const cells = [cell(0, 10), cell(2, 2), cell(3, 10), cell(4, 10), cell(5, 9)];
    expect(sweepBoundaries({ def, controllers: [{ id: 'h', label: 'H', law: 'hysteretic' }] }, cells)[0]!.points.length).toBe(1);
  });
});

describe('band-edge worst-case noise', () => {
  it('inside |η| < ē the measured η is −sgn(η)·ē, unit norm, vector part along the true one', () => {
    const s = Math.sin(0.5 * (Math.PI - 0.1)); // true error 180° − 0.1 rad about x: η = cos(…) ≈ 0.05
    const qTrue = [s, 0, 0, Math.cos(0.5 * (Math.PI - 0.1))];
    const qOut = new Float64Array(4),
      w = new Float64Array(3);
    const model = {
      attitudeSigmaRad: 0,
      rateSigmaRadPerS: 0,
      rateBiasRadPerS: [0, 0, 0],
      adversarialEta: 0.2,
      adversarialMode: 'band-edge' as const,
    };
    measure(qOut, w, model, makeRng(1), qTrue, [0, 0, 0], [0, 0, 0, 1]);
    expect(qOut[3]).toBeCloseTo(-0.2, 12);
    expect(qOut[0]).toBeCloseTo(Math.sqrt(1 - 0.04), 12);
    expect(Math.abs(qOut[1]!) + Math.abs(qOut[2]!)).toBeLessThan(1e-15);
    // outside the band: untouched
    measure(qOut, w, model, makeRng(1), [0, 0, 0.6, 0.8], [0, 0, 0], [0, 0, 0, 1]);
    expect(Array.from(qOut)).toEqual([0, 0, 0.6, 0.8]);
  });
});

describe('vehicle.sensors.boundedNoiseMode in the file', () => {
  it('defaults to reflect, round-trips band-edge, refuses other words with its path', () => {
    const j = testVehicleScenario({ runs: 1, seed: 1 });
    const plain = loadScenario(j);
    expect(plain.ok && plain.value.vehicle.sensors.boundedNoiseMode).toBe('reflect');
    expect(plain.ok && 'boundedNoiseMode' in toScenarioFile(plain.value).vehicle.sensors).toBe(false);
    const v = j.vehicle as { sensors: Record<string, unknown> };
    v.sensors.boundedNoiseMode = 'band-edge';
    const edge = loadScenario(j);
    expect(edge.ok && toScenarioFile(edge.value).vehicle.sensors.boundedNoiseMode).toBe('band-edge');
    v.sensors.boundedNoiseMode = 'edge';
    const bad = loadScenario(j);
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors[0]!.path).toBe('vehicle.sensors.boundedNoiseMode');
  });
});

describe('sweep runner on the study test vehicle', () => {
  const json = testVehicleScenario({
    runs: 1,
    seed: 1,
    durationS: 60,
    dispersions: { initialAttitude: { mode: 'cone', maxAngleDeg: 60 } },
  });
  const d = validateSweep(spec([{ parameter: 'control-rate-hz', values: [2, 10] }], { controllers: ['pd', 'hyst'] }));
  if (!d.ok) throw new Error('bad sweep');
  const def = d.value;

  it('a cell run alone equals the same cell in the whole sweep; the exports hold one row per cell and controller', () => {
    const all = runSweep(json, def);
    expect(all.ok).toBe(true);
    if (!all.ok) return;
    expect(all.value.cells.length).toBe(2);
    const alone = runSweepCell(json, def, 1);
    expect(alone.ok && alone.value).toEqual(all.value.cells[1]);
    const csv = sweepCellsCsv(all.value).trimEnd().split('\n');
    expect(csv.length).toBe(1 + 2 * 2);
    expect(csv[0]!.startsWith('cell,control-rate-hz_value,cell_seed,controller,cases,flyable,settled_count')).toBe(true);
    const parsed = JSON.parse(sweepJson(all.value, 'c')) as { cells: unknown[]; complete: boolean };
    expect(parsed.cells.length).toBe(2);
    expect(parsed.complete).toBe(true);
    // the cell scenario carries the cell's rate and seed
    const cj = sweepCellJson(json, def, 1) as { vehicle: { controlRateHz: number }; study: { seed: number; runs: number } };
    expect(cj.vehicle.controlRateHz).toBe(10);
    expect(cj.study.seed).toBe(cellSeed(5, 1));
    expect(cj.study.runs).toBe(2);
  });

  it('a hysteresis sweep without a hysteretic controller is refused, naming the axis', () => {
    const h = validateSweep(spec([{ parameter: 'hysteresis', values: [0.1] }], { controllers: ['pd'] }));
    if (!h.ok) throw new Error('bad sweep');
    const r = runSweep(json, h.value);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.rule).toBe('needs-hysteretic');
  });
});
