/**
 * Study results and exports, checked by hand on small made-up record sets (nearest-rank
 * quantiles, bin counts, worst-case order, shares that leave unflyable cases out), the CSV shape,
 * and the two ways of reopening a case: `rerunStudyCase` reproduces the study's own numbers, and
 * `studyCaseScenario` is a valid scenario whose normal pipeline run flies the same trajectory
 * (for the laws whose behaviour a scenario file can state exactly). Definitions are our own
 * (summary.ts header); "nearest rank" is the textbook quantile definition (from memory).
 */
import { DEG_PER_RAD } from '../../app/engine/units';
import { describe, expect, it } from 'vitest';
import { summarizeStudy, outcomeMap, type StudyInfo } from '../../app/engine/study/summary';
import type { CaseRecord, CaseRun } from '../../app/engine/study/runCase';
import { TRACE_SAMPLES } from '../../app/engine/study/runCase';
import { casesCsv, CASE_COLUMNS } from '../../app/engine/study/export';
import { rerunStudyCase, studyCaseScenario } from '../../app/engine/study/caseScenario';
import { runStudy } from '../../app/engine/study/runner';
import { runPipeline } from '../../app/engine/pipeline/run';
import { validateScenario } from '../../app/engine/scenario/validate';
import { CAUTION_TEXT } from '../../app/engine/caution';
import type { StudyDefinition } from '../../app/engine/scenario/study';
import { testVehicleScenario } from './study-fixtures';

const def: StudyDefinition = {
  runs: 6,
  seed: 1,
  controllers: null,
  durationS: 100,
  mode: 'step-target',
  stopAfterSettledForS: 10,
  worstCases: 3,
  attitude: { mode: 'uniform' },
  rateSigmaRadPerS: 0,
  inertia: { momentSigmaFraction: 0, axisMisalignmentSigmaRad: 0 },
  wheels: { torqueDegradationMax: 0, momentumDegradationMax: 0, failOneWheelProbability: 0 },
  sensors: { attitudeNoiseScale: [1, 1], rateBiasSigmaRadPerS: 0, adversarialEta: 0 },
  controlRateHz: null,
  actuation: null,
  torqueQuantumNm: null,
};
const info: StudyInfo = { scenarioName: 'hand-made', def, controllers: [{ id: 'a', label: 'A', law: 'hysteretic' }] };

function run(over: Partial<CaseRun>): CaseRun {
  return {
    controllerId: 'a',
    status: 'settled',
    reason: '',
    settleTimeS: 10,
    rotationTravelledDeg: 90,
    shortestRotationDeg: 90,
    extraRotationDeg: 0,
    unwound: false,
    longWay: false,
    jumps: 0,
    chatterPerS: 0.2,
    chattered: false,
    peakWheelTorqueFraction: 0.5,
    peakWheelMomentumFraction: 0.3,
    finalErrorDeg: 0.01,
    finalEta: 1,
    endS: 20,
    errorTraceDeg: new Float32Array(TRACE_SAMPLES),
    traceCount: 0,
    ...over,
  };
}
function rec(index: number, r: CaseRun): CaseRecord {
  return {
    draw: {
      index,
      q0: [0, 0, 0, 1],
      omega0RadPerS: [0, 0, 0],
      inertiaRows: [
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ],
      inertiaRejections: index,
      wheelTorqueFactor: [1],
      wheelMomentumFactor: [1],
      failedWheel: -1,
      attitudeNoiseRad: 0,
      rateBiasRadPerS: [0, 0, 0],
      adversarialEta: 0,
      controlRateHz: 10,
      actuation: 'hold',
      noiseSeed: 7,
      errorAxis: [0, 0, 1],
      errorAngleRad: index / 10,
      errorEta: Math.cos(index / 20),
    },
    runs: [r],
  };
}

// Six cases given out of order: settle times 40, 10, 30, 20; one never settled; one unflyable.
const records: CaseRecord[] = [
  rec(3, run({ settleTimeS: 40, rotationTravelledDeg: 370, unwound: true, jumps: 2, peakWheelMomentumFraction: 1 })),
  rec(0, run({ settleTimeS: 10 })),
  rec(5, run({ status: 'unflyable', settleTimeS: null, reason: 'axes span a plane' })),
  rec(2, run({ settleTimeS: 30, chatterPerS: 1.5, chattered: true })),
  rec(1, run({ settleTimeS: 20, jumps: 1 })),
  rec(4, run({ status: 'unsettled', settleTimeS: null, finalErrorDeg: 12, jumps: 12 })),
];

describe('summarizeStudy on a hand-made record set', () => {
  const s = summarizeStudy(info, records);
  const c = s.controllers[0]!;

  it('counts and shares leave the unflyable case out', () => {
    expect([c.cases, c.flyable, c.settled, c.unsettled, c.failed]).toEqual([6, 5, 4, 1, 0]);
    expect(c.shares.settled.share).toBeCloseTo(4 / 5, 15);
    expect(c.shares.unwound.share).toBeCloseTo(1 / 5, 15);
    expect(c.shares.chattered.share).toBeCloseTo(1 / 5, 15);
    expect(s.unflyableCases).toBe(1);
    expect(s.inertiaRejections).toBe(0 + 1 + 2 + 3 + 4 + 5);
    expect(s.incomplete).toBe(false);
  });

  it('nearest-rank quantiles; the never-settled run counts as beyond the duration', () => {
    // settle times sorted: 10, 20, 30, 40, ∞ → median = 3rd = 30; p95 = 5th = ∞ → null.
    // The median is located to a fine bin (a tenth of a 20-bin display bin) holding 30 s.
    const st = c.spreads.settleTimeS;
    expect(st.medianBin![0]).toBeLessThanOrEqual(30);
    expect(st.medianBin![1]).toBeGreaterThanOrEqual(30);
    expect(st.medianBin![1] - st.medianBin![0]).toBeLessThanOrEqual(info.def.durationS / 200 + 1e-12);
    expect([st.p95, st.max, st.n]).toEqual([null, 40, 4]); // max and n over the runs that settled
    // jumps 0, 0, 1, 2, 12 → median 1 (whole-number bins: exact); p95 = 12 is past the last bin (≥ 10) → null.
    expect([c.spreads.jumps.median, c.spreads.jumps.p95, c.spreads.jumps.max]).toEqual([1, null, 12]);
  });

  it('histogram counts add up to the flyable runs; overflow holds what is off the scale', () => {
    const h = c.histograms;
    const sum = (x: { counts: number[]; overflow: number }) => x.counts.reduce((a, b) => a + b, 0) + x.overflow;
    for (const k of Object.keys(h) as (keyof typeof h)[]) expect(sum(h[k])).toBe(5);
    expect(h.settleTimeS.overflow).toBe(1); // never settled
    expect(h.settleTimeS.edges).toHaveLength(21);
    expect(h.settleTimeS.counts[2]).toBe(1); // 10 s in [10, 15)
    expect(h.rotationTravelledDeg.overflow).toBe(1); // 370° > one turn
    expect(h.jumps.overflow).toBe(1); // 12 ≥ 10
    expect(h.peakWheelMomentumFraction.counts[19]).toBe(1); // 100 % in the last, closed bin
    expect(h.finalErrorDeg.counts[7]).toBe(1); // 12° in [10, 30)
  });

  it('worst cases: not settled first, then the slowest settlers; unflyable ones are not listed', () => {
    expect(c.worst.map((w) => w.index)).toEqual([4, 3, 2]);
  });

  it('the outcome map is in case order with one outcome per controller', () => {
    const m = outcomeMap(records);
    expect(m.map((p) => p.index)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(m.map((p) => p.outcome[0])).toEqual(['settled', 'settled', 'chattered', 'unwound', 'unsettled', 'unflyable']);
    expect(m[3]!.angleDeg).toBeCloseTo((0.3 * 180) / Math.PI, 12);
  });

  it('cases.csv: caution first, one row per case × controller in case order, same column count everywhere', () => {
    const lines = casesCsv(info, records, s).trimEnd().split('\n');
    expect(lines[0]).toBe(`# CAUTION: ${CAUTION_TEXT}`);
    const h = lines.findIndex((l) => l.startsWith('case,'));
    expect(lines[h]!.split(',')).toEqual([...CASE_COLUMNS]);
    const rows = lines.slice(h + 1);
    expect(rows.map((r) => r.split(',')[0])).toEqual(['0', '1', '2', '3', '4', '5']);
    for (const r of rows) expect(r.split(',').length).toBe(CASE_COLUMNS.length);
    expect(rows[4]!.split(',')[4]).toBe(''); // no settle time
  });
});

describe('reopening a case', () => {
  const study = {
    runs: 4,
    seed: 77,
    durationS: 150,
    stopAfterSettledForS: 10,
    controllers: ['pd', 'hyst', 'syn'],
    dispersions: {
      initialAttitude: { mode: 'cone', maxAngleDeg: 120 },
      initialRateDegPerS: 0.05,
      inertia: { momentSigmaFraction: 0.08, axisMisalignmentDeg: 3 },
      wheels: { torqueDegradationMax: 0.3, momentumDegradationMax: 0.3 },
      sensors: { attitudeNoiseScale: [1, 5], rateBiasDegPerS: 0.001 },
      controlRateHz: [5, 10],
    },
  };
  const json = testVehicleScenario(study);
  const res = runStudy(json);
  if (!res.ok) throw new Error('study refused');

  it('rerunStudyCase reproduces the study numbers of that case exactly', () => {
    const r = rerunStudyCase(json, {}, 2);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.draw).toEqual(res.value.records[2]!.draw);
    r.value.runs.forEach((run, k) => {
      const s = res.value.records[2]!.runs[k]!;
      expect(run.controllerId).toBe(s.controllerId);
      expect(run.metrics.settleTimeS).toBe(s.settleTimeS);
      expect((run.metrics.finalErrorRad * 180) / Math.PI).toBe(s.finalErrorDeg);
      expect(run.trace.t[run.trace.n - 1]).toBe(s.endS);
    });
    const one = rerunStudyCase(json, {}, 2, 'hyst');
    expect(one.ok && one.value.runs.map((x) => x.controllerId)).toEqual(['hyst']);
    expect(rerunStudyCase(json, {}, 9).ok).toBe(false);
    expect(rerunStudyCase(json, {}, 1, 'nope').ok).toBe(false);
  });

  it('studyCaseScenario is a valid scenario whose normal run reproduces the study row (PD, hysteretic, synergistic)', () => {
    const cs = studyCaseScenario(json, {}, 2);
    if (!cs.ok) throw new Error(JSON.stringify(cs.errors));
    expect(validateScenario(cs.value).ok).toBe(true);
    expect(cs.value.vehicle.wheels.layout).toBe('custom');
    expect(cs.value.simulation.seed).toBe(res.value.records[2]!.draw.noiseSeed);
    expect(cs.value.description).toContain('written as a normal scenario');
    const normal = runPipeline(cs.value);
    if (!normal.ok) throw new Error(JSON.stringify(normal.errors));
    const exact = rerunStudyCase(json, {}, 2);
    if (!exact.ok) throw new Error('rerun refused');
    const row = res.value.records[2]!;
    for (const run of exact.value.runs) {
      const n = normal.value.runs.find((x) => x.controllerId === run.controllerId)!;
      expect(n.trace.n).toBe(run.trace.n); // the file carries the study's early end
      let worst = 0;
      for (let k = 0; k < 4 * run.trace.n; k++) worst = Math.max(worst, Math.abs(n.trace.q[k]! - run.trace.q[k]!));
      // Same stages, same noise: only unit round trips (mN·m, arcsec, deg) differ, at the 1e-16 level.
      expect(worst).toBeLessThan(1e-9);
      expect(n.metrics.settleTimeS).toBe(run.metrics.settleTimeS);
      const studyRow = row.runs.find((x) => x.controllerId === run.controllerId)!;
      expect(n.metrics.unwound).toBe(studyRow.unwound && n.metrics.unwound);
      expect(n.metrics.jumps).toBe(studyRow.jumps);
      expect(n.metrics.finalErrorRad * DEG_PER_RAD).toBeCloseTo(studyRow.finalErrorDeg, 9);
    }
  });

  it('follow-plan mode: each case tracks the slew planned on the nominal model and runs its full duration (no early stop)', () => {
    const pr = runStudy(
      testVehicleScenario({
        runs: 2,
        seed: 5,
        durationS: 200,
        mode: 'follow-plan',
        controllers: ['hyst'],
        dispersions: { initialAttitude: { mode: 'cone', maxAngleDeg: 60 } },
      }),
    );
    if (!pr.ok) throw new Error(JSON.stringify(pr.errors));
    for (const r of pr.value.records) {
      expect(r.runs[0]!.endS).toBeCloseTo(200, 6);
      expect(r.runs[0]!.status).toBe('settled');
    }
    expect(pr.value.summary.settleDefinition).toContain('full duration');
  });
});
