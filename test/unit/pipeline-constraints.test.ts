/**
 * Attitude constraints through the scenario file, the pipeline, the plan summary, the comparison,
 * the exports and the CLI's exit status (pipeline/constraints.ts, scenario/constraint*.ts,
 * export/constraintColumns.ts, main/cli/constraintStatus.ts).
 *
 * Independent angle checks: the body axis is rotated into inertial axes with the npm `quaternion`
 * package (its own Hamilton product and rotateVector), and the margin is formed by hand from the
 * definition (keep-out: angle − half-angle − margin), not with the engine's constraint code.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Quaternion from 'quaternion';
import { describe, expect, it } from 'vitest';
import { preparePipeline, runPipeline } from '../../app/engine/pipeline/run';
import { evaluateReference } from '../../app/engine/plan/reference';
import { exportRun } from '../../app/engine/export/runExport';
import { validateScenario } from '../../app/engine/scenario/validate';
import { resolveScenario } from '../../app/engine/scenario/resolve';
import { toScenarioFile } from '../../app/engine/scenario/toFile';
import { DEG_PER_RAD } from '../../app/engine/units';
import { asset, runInProcess } from './cli-harness';

type Json = Record<string, unknown>;

/** Lumen-6 cut to its first target, one controller and short holds (fast), with extra fields. */
function lumen(extra: Json = {}): Json {
  const s = JSON.parse(readFileSync(asset('lumen6-imaging.scenario.json'), 'utf8')) as Json;
  const targets = s.targets as Json[];
  s.targets = [{ ...targets[0]!, holdS: 5 }];
  s.controllers = (s.controllers as Json[]).filter((c) => c.id === 'pd');
  (s.simulation as Json).tailS = 5;
  (s.simulation as Json).mode = 'both';
  return { ...s, ...extra };
}

/** Inertial direction of a body axis at attitude q = [x, y, z, w] (qInertialFromBody), by the `quaternion` package. */
function inertialAxis(q: ArrayLike<number>, b: readonly number[]): number[] {
  const Q = new Quaternion(q[3]!, q[0]!, q[1]!, q[2]!);
  return Q.rotateVector([b[0]!, b[1]!, b[2]!]) as number[];
}

function angleDeg(a: readonly number[], b: readonly number[]): number {
  const na = Math.hypot(a[0]!, a[1]!, a[2]!),
    nb = Math.hypot(b[0]!, b[1]!, b[2]!);
  const c = (a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!) / (na * nb);
  return Math.acos(Math.min(1, Math.max(-1, c))) * DEG_PER_RAD;
}

/** The +Z boresight's inertial direction half-way through the first slew of the cut scenario. */
function midSlewBoresight(): number[] {
  const p = preparePipeline(lumen());
  if (!p.ok) throw new Error(JSON.stringify(p.errors));
  const e = p.value.plan.timeline[0]!;
  const q = new Float64Array(4);
  evaluateReference(p.value.plan, (e.slewStartS + e.slewEndS) / 2, q, new Float64Array(3), new Float64Array(3));
  return inertialAxis(q, [0, 0, 1]);
}

const cone = (direction: Json, extra: Json = {}) => ({
  name: 'Imager keep-out',
  kind: 'keep-out',
  bodyAxis: [0, 0, 1],
  halfAngleDeg: 10,
  direction,
  ...extra,
});

describe('scenario constraints: schema, messages, round trip', () => {
  it('accepts a constraints list and resolves it to SI (half-angle, margin in rad; unit vectors)', () => {
    const v = validateScenario(lumen({ constraints: [cone({ kind: 'fixed', inertialDirection: [0, 0, 2] }, { marginDeg: 2 })] }));
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    const r = resolveScenario(v.value);
    // Degrees to radians: π/180 per degree (SI definition of the degree).
    expect(r.constraints[0]!.halfAngleRad).toBeCloseTo((10 * Math.PI) / 180, 15);
    expect(r.constraints[0]!.marginRad).toBeCloseTo((2 * Math.PI) / 180, 15);
    expect(Array.from((r.constraints[0]!.direction as unknown as { direction: Float64Array }).direction)).toEqual([0, 0, 1]);
    // The inverse writes the same list back (margin and window as given).
    const back = toScenarioFile(r).constraints!;
    expect(back[0]!.name).toBe('Imager keep-out');
    expect(back[0]!.halfAngleDeg).toBeCloseTo(10, 12);
    expect(back[0]!.marginDeg).toBeCloseTo(2, 12);
    expect(back[0]!.direction).toEqual({ kind: 'fixed', inertialDirection: [0, 0, 1] });
  });

  it('names the field and the rule for bad constraints', () => {
    const v = validateScenario(
      lumen({
        constraints: [
          cone({ kind: 'fixed', inertialDirection: [0, 0, 1] }, { bodyAxis: [0, 0, 0] }),
          cone({ kind: 'fixed', inertialDirection: [0, 0, 0] }, { name: 'b' }),
          cone({ kind: 'sun' }, { name: 'c', halfAngleDeg: 180 }),
          cone({ kind: 'sun' }, { name: 'b' }),
          cone({ kind: 'sun' }, { name: 'd', window: { startS: 10, endS: 5 } }),
        ],
      }),
    );
    expect(v.ok).toBe(false);
    if (v.ok) return;
    const paths = v.errors.map((e) => e.path);
    expect(paths).toContain('constraints[0].bodyAxis');
    expect(paths).toContain('constraints[1].direction.inertialDirection');
    expect(paths).toContain('constraints[2].halfAngleDeg');
    expect(paths).toContain('constraints[3].name');
    expect(paths).toContain('constraints[4].window.endS');
    expect(v.errors.find((e) => e.path === 'constraints[0].bodyAxis')!.message).toMatch(/zero vector/);
  });

  it('refuses Earth and ground-station directions without an orbit, naming the field', () => {
    const p = preparePipeline(lumen({ constraints: [cone({ kind: 'earth-limb' })] }));
    expect(p.ok).toBe(false);
    if (p.ok) return;
    expect(p.errors[0]!.path).toBe('constraints[0].direction');
    expect(p.errors[0]!.message).toMatch(/needs the scenario's orbit/);
  });

  it('refuses a target that itself sits inside a keep-out cone (and a keep-in the target leaves)', () => {
    const p0 = preparePipeline(lumen());
    if (!p0.ok) throw new Error('base');
    const qT = p0.value.scenario.targets[0]!.qInertialFromBody;
    const atTarget = inertialAxis(qT, [0, 0, 1]);
    const out = preparePipeline(lumen({ constraints: [cone({ kind: 'fixed', inertialDirection: atTarget })] }));
    expect(out.ok).toBe(false);
    if (!out.ok) {
      expect(out.errors[0]!.path).toBe('targets[0].attitude');
      expect(out.errors[0]!.message).toMatch(/Imager keep-out/);
    }
    // Keep-in about the direction opposite the target's boresight: the target is 180° away.
    const away = atTarget.map((x) => -x);
    const ki = preparePipeline(
      lumen({ constraints: [cone({ kind: 'fixed', inertialDirection: away }, { kind: 'keep-in', halfAngleDeg: 30 })] }),
    );
    expect(ki.ok).toBe(false);
    if (!ki.ok) expect(ki.errors[0]!.rule).toBe('keep-in-violated');
  });

  it('reads the older keepOut list as keep-out constraints (Lumen-6: the star tracker Sun exclusion)', () => {
    const p = preparePipeline(lumen());
    if (!p.ok) throw new Error('base');
    expect(p.value.constraints.info.map((c) => [c.name, c.kind, c.path])).toEqual([
      ['Star tracker Sun exclusion', 'keep-out', 'keepOut[0]'],
    ]);
    expect(p.value.planConstraints!.clear).toBe(true);
  });
});

describe('checks on the plan and on every run', () => {
  it('step-target mode flies straight through a cone across the slew: every run reports it, margins agree with an independent computation', () => {
    const mid = midSlewBoresight();
    const r = runPipeline(lumen({ constraints: [cone({ kind: 'fixed', inertialDirection: mid })] }), { modes: ['step-target'] });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const o = r.value;
    // The plan itself goes around the cone (next test); the step-target runs are commanded the target at once.
    expect(o.plan.constraints!.clear).toBe(true);
    for (const run of o.runs) {
      const rc = run.constraints!;
      expect(rc.constraints.map((c) => c.name)).toEqual(['Star tracker Sun exclusion', 'Imager keep-out']);
      expect(rc.clear).toBe(false);
      expect(run.verdict.text).toMatch(/VIOLATES keep-out "Imager keep-out"/);
      const row = o.comparison.find((c) => c.key === run.key)!;
      expect(row.constraintMarginDeg!).toBeLessThan(0);
      expect(row.constraintMarginDeg!).toBeCloseTo(rc.minimumMarginRad * DEG_PER_RAD, 12);
      // A violating run never gets a best mark.
      expect(Object.values(o.best)).not.toContain(run.key);
      const tr = run.trace;
      for (const k of [0, Math.floor(tr.n / 3), Math.floor(tr.n / 2), tr.n - 1]) {
        const q = tr.q.subarray(4 * k, 4 * k + 4);
        const expected = angleDeg(inertialAxis(q, [0, 0, 1]), mid) - 10; // keep-out: angle − half-angle − margin (0)
        expect(rc.marginRad[1]![k]! * DEG_PER_RAD).toBeCloseTo(expected, 6);
      }
      // The reported minimum is the series' minimum.
      let lo = Infinity;
      for (const m of rc.marginRad[1]!) lo = Math.min(lo, m);
      expect(rc.constraints[1]!.minMarginRad).toBeCloseTo(lo, 9);
    }
  });

  it('follow-plan: the planner goes around the cone with its margin, and every controller stays out of the cone', () => {
    const mid = midSlewBoresight();
    const s = lumen({ constraints: [cone({ kind: 'fixed', inertialDirection: mid }, { marginDeg: 2 })] });
    (s as { controllers: Json[] }).controllers = (
      JSON.parse(readFileSync(asset('lumen6-imaging.scenario.json'), 'utf8')) as { controllers: Json[] }
    ).controllers;
    const p = preparePipeline(s);
    if (!p.ok) throw new Error(JSON.stringify(p.errors));
    const around = p.value.constrainedSegments[0]!;
    expect(around.status).toBe('planned');
    expect(around.extraTimeS).toBeGreaterThan(0);
    // Independent check of the plan: sample the reference and measure the boresight's angle to the
    // cone's centre with the `quaternion` package; the plan promises ≥ half-angle + margin = 12°.
    const q = new Float64Array(4),
      w = new Float64Array(3),
      wd = new Float64Array(3);
    let planMin = Infinity;
    for (let t = 0; t <= p.value.plan.totalS; t += 0.05) {
      evaluateReference(p.value.plan, t, q, w, wd);
      planMin = Math.min(planMin, angleDeg(inertialAxis(q, [0, 0, 1]), mid));
    }
    expect(planMin).toBeGreaterThanOrEqual(12 - 1e-4);
    const r = runPipeline(s, { modes: ['follow-plan'] });
    if (!r.ok) throw new Error('run');
    const o = r.value;
    expect(o.plan.feasible).toBe(true);
    expect(o.plan.constrainedSlews![0]!.status).toBe('planned');
    expect(o.plan.segments[0]!.reason).toMatch(/planned around the constraints/);
    expect(o.plan.segments[0]!.slewTimeS).toBeCloseTo(around.slewTimeS, 9);
    expect(o.runs.length).toBe(3);
    for (const run of o.runs) {
      // Flown: the boresight never enters the 10° cone itself (tracking error below the 2° margin).
      let flownMin = Infinity;
      for (let k = 0; k < run.trace.n; k++)
        flownMin = Math.min(flownMin, angleDeg(inertialAxis(run.trace.q.subarray(4 * k, 4 * k + 4), [0, 0, 1]), mid));
      expect(flownMin, run.key).toBeGreaterThan(10);
      expect(run.trace.segment[run.trace.n - 1]).toBe(0);
      expect(run.constraints!.constraints[1]!.intervals, run.key).toEqual([]);
      // The legs' quaternions keep one sign across the leg boundary: a law acting on the sign (PD)
      // would otherwise see a 360° error there and unwind (it did before signContinuous).
      expect(run.verdict.kind, run.key).toBe('settled');
    }
  });

  it('exports: CSV and JSON get a margin column per constraint (degrees, named after it); the AEM a COMMENT', () => {
    const mid = midSlewBoresight();
    const r = runPipeline(lumen({ constraints: [cone({ kind: 'fixed', inertialDirection: mid })] }), { modes: ['step-target'] });
    if (!r.ok) throw new Error('run');
    const run = r.value.runs[0]!;
    const opts = { toolName: 'Slewsmith', toolVersion: 'test', creationDateUtc: '2030-03-14T10:00:00Z' };
    const csv = exportRun('csv', run, r.value, opts);
    if (!csv.ok) throw new Error('csv');
    const lines = csv.value.split('\n').filter((l) => l && !l.startsWith('#'));
    const head = lines[0]!.split(',');
    const col = head.indexOf('margin_imager_keep_out_deg');
    expect(col).toBeGreaterThan(0);
    expect(head).toContain('margin_star_tracker_sun_exclusion_deg');
    const qx = head.indexOf('q_x');
    for (const line of [lines[1]!, lines[Math.floor(lines.length / 2)]!]) {
      const cells = line.split(',').map(Number);
      const q = [cells[qx]!, cells[qx + 1]!, cells[qx + 2]!, cells[qx + 3]!];
      expect(cells[col]!).toBeCloseTo(angleDeg(inertialAxis(q, [0, 0, 1]), mid) - 10, 6);
    }
    const json = exportRun('json', run, r.value, opts);
    if (!json.ok) throw new Error('json');
    const doc = JSON.parse(json.value) as { channels: Record<string, number[]>; constraints: { name: string; minMarginDeg: number }[] };
    expect(doc.channels.margin_imager_keep_out_deg!.length).toBe(doc.channels.t_s!.length);
    expect(doc.constraints[1]!.minMarginDeg).toBeCloseTo(run.constraints!.constraints[1]!.minMarginRad * DEG_PER_RAD, 12);
    const aem = exportRun('aem', run, r.value, opts);
    if (!aem.ok) throw new Error('aem');
    expect(aem.value).toMatch(/COMMENT Constraint "Imager keep-out" \(keep-out\): VIOLATED/);
  });

  it('a constraint whose window closes before the slew is not violated; the Sun source works from the epoch', () => {
    const mid = midSlewBoresight();
    const r = runPipeline(
      lumen({
        constraints: [
          cone({ kind: 'fixed', inertialDirection: mid }, { window: { startS: 0, endS: 0.5 } }),
          // The imager (+Z) starts pointing away from the Sun (the array normal −Z is Sun-pointing): 170° keep-out of 5° is clear.
          cone({ kind: 'sun' }, { name: 'Imager Sun', halfAngleDeg: 5 }),
        ],
      }),
      { modes: ['follow-plan'] },
    );
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.plan.constraints!.clear).toBe(true);
    expect(r.value.runs[0]!.constraints!.clear).toBe(true);
    // At t = 0 the imager is anti-Sun (initial attitude −Z to the file's Sun direction); the
    // geocentric Sun from orbit/sky.ts at 2030-03-14 is within 1° of that direction, so the margin is ≈ 180° − 5°.
    const sun = r.value.runs[0]!.constraints!.marginRad[2]![0]! * DEG_PER_RAD;
    expect(sun).toBeGreaterThan(174);
  });
});

describe('CLI exit status 3: ran, but violated a constraint', () => {
  it('plan (start inside a cone) and compare (step-target through a cone) exit 3 and list the violation; plans around a cone exit 0', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'slewsmith-constr-'));
    const mid = midSlewBoresight();
    const bad = path.join(dir, 'bad.scenario.json');
    writeFileSync(bad, JSON.stringify(lumen({ constraints: [cone({ kind: 'fixed', inertialDirection: mid })] })));
    // The start attitude itself inside the cone: no path can leave it clear, the shortest slew is kept and violates.
    const p0 = preparePipeline(lumen());
    if (!p0.ok) throw new Error('base');
    const startAxis = inertialAxis(p0.value.scenario.initial.qInertialFromBody, [0, 0, 1]);
    const stuck = path.join(dir, 'stuck.scenario.json');
    writeFileSync(stuck, JSON.stringify(lumen({ constraints: [cone({ kind: 'fixed', inertialDirection: startAxis })] })));
    const good = path.join(dir, 'good.scenario.json');
    writeFileSync(good, JSON.stringify(lumen()));
    const plan = await runInProcess(['plan', stuck]);
    expect(plan.code).toBe(3);
    expect(plan.stdout).toMatch(/no constrained path/);
    expect((await runInProcess(['plan', bad])).code).toBe(0);
    expect(plan.stdout).toMatch(/Plan INFEASIBLE: the planned attitude violates an attitude constraint/);
    const cmp = await runInProcess(['compare', bad, '--mode', 'step-target']);
    expect(cmp.code).toBe(3);
    expect(cmp.stderr).toMatch(/constraint violated: run pd:step-target: keep-out "Imager keep-out" violated/);
    expect((await runInProcess(['plan', good])).code).toBe(0);
    const help = await runInProcess(['--help']);
    expect(help.stdout).toMatch(/3 \(plan, fly, compare\) everything ran but the plan or a run violated/);
  });
});
