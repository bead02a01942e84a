/**
 * Issue 10, first check: every column of the comparison table is recomputed from the exported
 * files by an independent helper (test/reference/recompute-from-export.ts, which imports no engine
 * metric code) and matches the table, for every run (all controllers, both modes) of the three
 * bundled examples and of two vehicles invented here: a six-wheel array (custom axes, unequal
 * wheels, the continuous-ideal loop with its located jump samples) and a three-wheel triad with
 * stored initial momentum (pulse-width modulated torque, bounded worst-case noise).
 *
 * The CSV timeline is written with every sample in shortest round-trip form (export/csv.ts
 * formatNumber = ECMAScript Number::toString), so it reads back to the very doubles of the run;
 * that is checked first, then the recomputation runs on the text alone (plus the JSON export for
 * targets, settings, jump events and outcome). Tolerances, and why:
 * - counts, flags, settle times (a difference of two exported sample times), wheel peak fractions
 *   (|x| / limit of the same doubles), chatter (count / window) and the verdict text: exact;
 * - angles: the helper uses its own formula (chord-based atan2 on the quaternions, not the
 *   engine's atan2 of the error quaternion), so ≤ 1e-12 rad absolute + 1e-12 relative (measured
 *   ≤ 9e-16 rad per sample);
 * - trapezoid integrals and the RMS: summation order and rounding differ, so 1e-9 relative
 *   (the recursive-summation bound (n − 1)·u·Σ|xᵢ| with u = 1.1e-16 stays below it up to ~9e6
 *   samples; Higham, Accuracy and Stability of Numerical Algorithms, 2nd ed., §4.2 — from memory;
 *   measured ≤ 6e-15).
 * What the exports cannot let anyone recompute (the monitor's noise energy, a law's promised jump
 * decrease, whether it picks a lift) is listed in the helper's header; it is read from the JSON.
 */
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { exportRun } from '../../app/engine/export/runExport';
import { COMPARISON_COLUMNS } from '../../app/engine/pipeline/comparison';
import type { ComparisonRow, ControllerRun, PipelineOutput } from '../../app/engine/pipeline/types';
import { DEG_PER_RAD, RAD_PER_DEG } from '../../app/engine/units';
import { EXAMPLE_FILES, loadExample } from '../unit/scenario-fixtures';
import { parseCsv, recompute, wheelLimitsFromCsv, type Recomputed, type RunJson } from './recompute-from-export';

const OPTS = { toolName: 'Slewsmith', toolVersion: 'test', creationDateUtc: '2030-01-01T00:00:00Z' };

/** Invented: "Heron-8", six wheels on a 60°-canted hexagonal cone, three sizes of wheel, flown in the ideal continuous loop. */
function sixWheelArray(): unknown {
  const s = loadExample('lumen6-imaging');
  s.name = 'Heron-8 six-wheel array (invented)';
  s.vehicle.name = 'Heron-8';
  const cant = 60 * RAD_PER_DEG;
  s.vehicle.wheels = {
    layout: 'custom',
    wheels: [0, 1, 2, 3, 4, 5].map((i) => ({
      axis: [Math.sin(cant) * Math.cos((i * Math.PI) / 3), Math.sin(cant) * Math.sin((i * Math.PI) / 3), Math.cos(cant)],
      maxTorqueMNm: [1.5, 2, 2.5][i % 3],
      maxMomentumMNms: [4, 5, 6][i % 3],
      rotorInertiaKgm2: 2e-5,
    })),
  };
  delete s.initial.wheelMomentumMNms;
  s.simulation.timing = 'continuous-ideal';
  return s;
}

/** Invented: "Plover-3", a triad holding stored momentum, PWM torque and worst-case bounded noise ē = 0.1. */
function triadWithStoredMomentum(): unknown {
  const s = loadExample('tern12-reversal');
  s.name = 'Plover-3 triad with stored momentum (invented)';
  s.vehicle.name = 'Plover-3';
  s.initial.wheelMomentumMNms = [12, -8, 10];
  s.vehicle.sensors.boundedNoiseEta = 0.1;
  s.vehicle.actuation = { mode: 'pwm' };
  return s;
}

const CASES: { name: string; scenario: () => unknown }[] = [
  ...EXAMPLE_FILES.map((f) => ({ name: f, scenario: () => loadExample(f) })),
  { name: 'invented six-wheel array', scenario: sixWheelArray },
  { name: 'invented triad with stored momentum', scenario: triadWithStoredMomentum },
];

/** A number stated in a column's definition text ("2 %", "10 s", "2°"), so the text and the computation cannot drift apart. */
function statedNumber(key: keyof ComparisonRow, pattern: RegExp): number {
  const def = COMPARISON_COLUMNS.find((c) => c.key === key)!.definition;
  const m = pattern.exec(def);
  if (!m) throw new Error(`the ${key} definition does not state ${pattern}`);
  return Number(m[1]);
}

const close = (a: number, b: number, rel: number, abs = 0) => Math.abs(a - b) <= rel * Math.max(Math.abs(a), Math.abs(b)) + abs;
const ANGLE_ABS_DEG = 1e-12 * DEG_PER_RAD;

/** Every table column: [key, recomputed value, how to compare]. */
function columnChecks(r: Recomputed): [keyof ComparisonRow, unknown, 'exact' | 'angle' | 'integral'][] {
  return [
    ['verdict', r.verdict, 'exact'],
    ['status', r.status, 'exact'],
    ['settleTimeS', r.settleTimeS, 'exact'],
    ['trackingErrorPeakDeg', r.trackingErrorPeakRad * DEG_PER_RAD, 'angle'],
    ['trackingErrorRmsDeg', r.trackingErrorRmsRad * DEG_PER_RAD, 'integral'],
    ['rotationTravelledDeg', r.rotationTravelledRad * DEG_PER_RAD, 'integral'],
    ['shortestRotationDeg', r.shortestRotationRad * DEG_PER_RAD, 'angle'],
    ['unwound', r.unwound, 'exact'],
    ['jumps', r.jumps, 'exact'],
    ['chatterPerS', r.chatterPerS, 'exact'],
    ['peakWheelTorqueFraction', r.peakWheelTorqueFraction, 'exact'],
    ['peakWheelMomentumFraction', r.peakWheelMomentumFraction, 'exact'],
    ['controlEffortNms', r.controlEffortNms, 'integral'],
    ['finalErrorDeg', r.finalErrorRad * DEG_PER_RAD, 'angle'],
    ['monitorViolations', r.monitorViolations, 'exact'],
  ];
}

function mismatches(row: ComparisonRow, r: Recomputed): string[] {
  const out: string[] = [];
  for (const [key, mine, how] of columnChecks(r)) {
    const theirs = row[key];
    const ok =
      how === 'exact' || typeof mine !== 'number' || typeof theirs !== 'number'
        ? mine === theirs
        : how === 'angle'
          ? close(mine, theirs, 1e-12, ANGLE_ABS_DEG)
          : close(mine, theirs, 1e-9, 1e-300);
    if (!ok) out.push(`${row.key} ${key}: recomputed ${String(mine)}, table ${String(theirs)}`);
  }
  return out;
}

interface Exported {
  run: ControllerRun;
  row: ComparisonRow;
  csv: string;
  json: string;
}

function exportsOf(out: PipelineOutput): Exported[] {
  return out.runs.map((run) => {
    const csv = exportRun('csv', run, out, OPTS);
    const json = exportRun('json', run, out, OPTS);
    if (!csv.ok || !json.ok) throw new Error(`${run.key}: export refused`);
    return { run, row: out.comparison.find((c) => c.key === run.key)!, csv: csv.value, json: json.value };
  });
}

/** Column names in the CSV and the trace channel each must equal, sample for sample. */
const EXACT_CHANNELS: [RegExp, (run: ControllerRun, k: number, i: number) => number][] = [
  [/^t_s$/, (r, k) => r.trace.t[k]!],
  [/^j$/, (r, k) => r.trace.j[k]!],
  [/^segment$/, (r, k) => r.trace.segment[k]!],
  [/^q_([xyzw])$/, (r, k, i) => r.trace.q[4 * k + i]!],
  [/^qref_([xyzw])$/, (r, k, i) => r.trace.qRef[4 * k + i]!],
  [/^omega_([xyz])_radps$/, (r, k, i) => r.trace.omega[3 * k + i]!],
  [/^torque_cmd_([xyz])_Nm$/, (r, k, i) => r.trace.torqueCmdBody[3 * k + i]!],
  [/^torque_([xyz])_Nm$/, (r, k, i) => r.trace.torqueBody[3 * k + i]!],
  [/^wheel(\d+)_torque_motor_Nm$/, (r, k, i) => r.trace.wheelTorque[r.trace.nWheels * k + i]!],
  [/^wheel(\d+)_h_Nms$/, (r, k, i) => r.trace.hWheel[r.trace.nWheels * k + i]!],
  [/^lyapunov$/, (r, k) => r.trace.lyapunov[k]!],
];

function componentIndex(m: RegExpExecArray): number {
  const c = m[1];
  if (c === undefined) return 0;
  return /^\d+$/.test(c) ? Number(c) - 1 : 'xyzw'.indexOf(c);
}

/** The CSV reads back to the run's own doubles (every field in shortest round-trip form). */
function readBackProblems(e: Exported): string[] {
  const table = parseCsv(e.csv);
  const out = table.nonCanonical.map((f) => `${e.run.key}: not shortest round-trip: ${f}`);
  if (table.rows !== e.run.trace.n) out.push(`${e.run.key}: ${table.rows} rows for ${e.run.trace.n} samples`);
  for (const name of table.names)
    for (const [re, get] of EXACT_CHANNELS) {
      const m = re.exec(name);
      if (!m) continue;
      const col = table.columns.get(name)!;
      const i = componentIndex(m);
      for (let k = 0; k < e.run.trace.n; k++) {
        const v = get(e.run, k, i);
        // -0 is written as "0" (Number::toString), so it reads back as +0.
        if (!Object.is(col[k], v === 0 ? 0 : v)) {
          out.push(`${e.run.key} ${name}[${k}]: CSV ${col[k]}, trace ${v}`);
          break;
        }
      }
    }
  return out;
}

/**
 * The settings exported with the run against independent statements of them: the scenario file
 * (settle thresholds in degrees, bounded noise), the column definitions' own numbers, the CSV's
 * wheel-limit line, and the plan's slew kinematics for the planned switch times.
 */
function settingProblems(e: Exported, out: PipelineOutput): string[] {
  const doc = JSON.parse(e.json) as RunJson & { scenario: any; plan: PipelineOutput['plan'] };
  const mi = doc.metricInputs;
  const limits = wheelLimitsFromCsv(parseCsv(e.csv));
  const p: string[] = [];
  const want = (what: string, ok: boolean, detail: string) => {
    if (!ok) p.push(`${e.run.key} ${what}: ${detail}`);
  };
  want('full-rate export', doc.samples.sampleRateHz === null && doc.samples.count === doc.samples.ofTrace, JSON.stringify(doc.samples));
  want(
    'CSV wheel limits = JSON wheel limits',
    JSON.stringify(limits) === JSON.stringify({ torqueNm: doc.wheels.maxTorqueNm, momentumNms: doc.wheels.maxMomentumNms }),
    JSON.stringify(limits),
  );
  // deg → rad of the file's own values: equal to rounding (one multiplication).
  want('settle angle', close(mi.settleAngleRad, doc.scenario.simulation.settleAngleDeg * RAD_PER_DEG, 2e-16), `${mi.settleAngleRad}`);
  want(
    'settle rate',
    close(mi.settleRateRadPerS, doc.scenario.simulation.settleRateDegPerS * RAD_PER_DEG, 2e-16),
    `${mi.settleRateRadPerS}`,
  );
  want('bounded noise', mi.boundedNoiseEta === (doc.scenario.vehicle.sensors.boundedNoiseEta ?? 0), `${mi.boundedNoiseEta}`);
  const floorPct = statedNumber('chatterPerS', /above (\d+(?:\.\d+)?) % of the smallest wheel torque limit/);
  want('chatter floor', close(mi.chatterFloorNm, (floorPct / 100) * Math.min(...limits.torqueNm), 2e-16), `${mi.chatterFloorNm}`);
  want('chatter window', mi.chatterWindowS === statedNumber('chatterPerS', /busiest (\d+(?:\.\d+)?) s window/), `${mi.chatterWindowS}`);
  const unwindDeg = mi.liftDependent
    ? statedNumber('unwound', /at least (\d+(?:\.\d+)?)° longer than the short way/)
    : statedNumber('unwound', /at least (\d+(?:\.\d+)?)° for a law defined on SO\(3\)/);
  want('unwinding threshold', close(mi.unwindMinExtraRad, unwindDeg * RAD_PER_DEG, 2e-16), `${mi.unwindMinExtraRad}`);
  want('decided lift', mi.liftDecidedEta === statedNumber('unwound', /\(\|η\| ≥ (\d+(?:\.\d+)?)\)/), `${mi.liftDecidedEta}`);
  want(
    'monitor tolerance',
    close(mi.monitor.relTol, statedNumber('monitorViolations', /(\d+(?:\.\d+)?) % of the run's largest \|W\|/) / 100, 1e-15),
    `${mi.monitor.relTol}`,
  );
  // Planned switches from the plan summary by rest-to-rest trapezoid kinematics: acceleration for
  // ω_peak/α, coast, deceleration for ω_peak/α, and the slew angle = ω_peak·(T − ω_peak/α) (Wie,
  // Space Vehicle Dynamics and Control, 2nd ed., 2008 — from memory; references.md §2).
  const planned: number[] = [];
  for (const g of out.plan.segments.filter((x) => x.feasible && x.slewTimeS > 0)) {
    const ta = g.peakRateRadPerS / g.accelRadPerS2;
    want(`segment ${g.index} trapezoid area`, close(g.angleRad, g.peakRateRadPerS * (g.slewTimeS - ta), 1e-9), `${g.angleRad}`);
    planned.push(
      ...(e.run.mode === 'step-target' ? [g.tStart] : [g.tStart, g.tStart + ta, g.tStart + g.slewTimeS - ta, g.tStart + g.slewTimeS]),
    );
  }
  want(
    'planned switch times',
    planned.length === mi.plannedSwitchTimesS.length &&
      planned.every((t, i) => Math.abs(t - mi.plannedSwitchTimesS[i]!) <= 1e-9 * Math.max(1, t)),
    `${JSON.stringify(mi.plannedSwitchTimesS)} vs ${JSON.stringify(planned)}`,
  );
  return p;
}

describe('every comparison column recomputed from the exported CSV (and JSON) matches the table', () => {
  const seen = { unwound: new Set<boolean>(), verdicts: new Set<string>(), chatter: 0, jumps: 0, violations: 0, runs: 0 };

  for (const c of CASES) {
    describe(c.name, () => {
      const res = runPipeline(c.scenario());
      if (!res.ok) throw new Error(`${c.name} does not run: ${JSON.stringify(res.errors)}`);
      const out = res.value;
      const exported = exportsOf(out);

      it('has every run: all controllers, both modes', () => {
        const modes = new Set(out.runs.map((r) => r.mode));
        expect([...modes].sort()).toEqual(['follow-plan', 'step-target']);
        expect(out.runs.length).toBe(2 * new Set(out.runs.map((r) => r.controllerId)).size);
      });

      it('the CSV reads back to the run’s own doubles', () => {
        expect(exported.flatMap(readBackProblems)).toEqual([]);
      });

      it('the exported settings agree with the scenario file, the definitions and the plan', () => {
        expect(exported.flatMap((e) => settingProblems(e, out))).toEqual([]);
      });

      it('every column of every run matches its recomputation', () => {
        const bad: string[] = [];
        for (const e of exported) {
          const r = recompute(e.csv, e.json);
          bad.push(...mismatches(e.row, r));
          // The exported per-sample error angle is the angle the definition names.
          const deg = parseCsv(e.csv).columns.get('error_angle_deg')!;
          const k = r.trackingAngles.findIndex((a, i) => !close(a * DEG_PER_RAD, deg[i]!, 1e-12, ANGLE_ABS_DEG));
          if (k >= 0) bad.push(`${e.run.key} error_angle_deg[${k}]: ${deg[k]} vs ${r.trackingAngles[k]! * DEG_PER_RAD}`);
          // The jump counter and the exported jump events tell the same story.
          const doc = JSON.parse(e.json) as RunJson & { monitor: { kind: string }[] };
          if (doc.jumpEvents.length !== r.jumps) bad.push(`${e.run.key}: ${doc.jumpEvents.length} jump events, j rose by ${r.jumps}`);
          const flagged = doc.monitor.filter((f) => f.kind !== 'reference-step').length;
          if (flagged !== r.monitorViolations)
            bad.push(`${e.run.key}: ${flagged} exported monitor violations, recomputed ${r.monitorViolations}`);
          seen.unwound.add(r.unwound);
          seen.verdicts.add(r.verdict);
          seen.chatter += r.chatterReversals;
          seen.jumps += r.jumps;
          seen.violations += r.monitorViolations;
          seen.runs++;
        }
        expect(bad).toEqual([]);
      });

      it('per segment, the JSON metrics agree with the recomputation', () => {
        const bad: string[] = [];
        for (const e of exported) {
          const r = recompute(e.csv, e.json);
          const segs = e.run.metrics.segments;
          if (segs.length !== r.segments.length) bad.push(`${e.run.key}: ${segs.length} segments, recomputed ${r.segments.length}`);
          r.segments.forEach((g, i) => {
            const s = JSON.parse(e.json).metrics.segments[i];
            if (s.segment !== g.segment || s.settleTimeS !== g.settleTimeS || s.unwound !== g.unwound || s.longWay !== g.longWay)
              bad.push(`${e.run.key} segment ${g.segment}: exported ${JSON.stringify(s)}, recomputed ${JSON.stringify(g)}`);
            if (!close(s.shortestRad, g.shortestRad, 1e-12, 1e-12)) bad.push(`${e.run.key} segment ${g.segment} shortest`);
          });
        }
        expect(bad).toEqual([]);
      });
    });
  }

  it('the cases exercise every kind of outcome the columns can report', () => {
    // Without these the equalities above could hold on zeros alone.
    expect(seen.runs).toBeGreaterThanOrEqual(30);
    expect([...seen.unwound].sort()).toEqual([false, true]);
    expect([...seen.verdicts].sort()).toEqual(['settled', 'unsettled']);
    expect(seen.chatter).toBeGreaterThan(0);
    expect(seen.jumps).toBeGreaterThan(0);
    expect(seen.violations).toBeGreaterThan(0);
  });
});

describe('the recomputation notices a changed export', () => {
  const res = runPipeline(loadExample('tern12-reversal'), { controllers: ['pd'], modes: ['follow-plan'] });
  if (!res.ok) throw new Error('tern12 does not run');
  const [e] = exportsOf(res.value);

  /** The CSV with one field of one data row replaced. */
  function withField(csv: string, column: string, row: number, f: (x: number) => number): string {
    const lines = csv.split('\n');
    const header = lines.findIndex((l) => !l.startsWith('#'));
    const c = lines[header]!.split(',').indexOf(column);
    const fields = lines[header + 1 + row]!.split(',');
    fields[c] = String(f(Number(fields[c])));
    lines[header + 1 + row] = fields.join(',');
    return lines.join('\n');
  }

  it('a rate changed at one sample moves the rotation travelled; a wheel torque past its limit moves the peak', () => {
    const mid = Math.floor(e!.run.trace.n / 2);
    const faster = recompute(
      withField(e!.csv, 'omega_x_radps', mid, (x) => x + 0.01),
      e!.json,
    );
    expect(mismatches(e!.row, faster).some((m) => m.includes('rotationTravelledDeg'))).toBe(true);
    const limit = wheelLimitsFromCsv(parseCsv(e!.csv)).torqueNm[1]!;
    const over = recompute(
      withField(e!.csv, 'wheel2_torque_motor_Nm', mid, () => 1.5 * limit),
      e!.json,
    );
    expect(over.peakWheelTorqueFraction).toBeCloseTo(1.5, 12);
    expect(mismatches(e!.row, over).some((m) => m.includes('peakWheelTorqueFraction'))).toBe(true);
    expect(mismatches(e!.row, recompute(e!.csv, e!.json))).toEqual([]);
  });
});
