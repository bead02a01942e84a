/**
 * The real `slewsmith` CLI, spawned as a user would run it, on the bundled example scenarios.
 * Exports are checked against CCSDS 504.0-B-2 (AEM KVN: parsed by the project's reader, line
 * length ≤ 254, no NaN) and for the caution text; exit codes follow the CLI contract.
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync, existsSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parseAem } from '../../app/engine/export/aem-read';
import { CAUTION_TEXT } from '../../app/engine/caution';

const root = path.resolve(__dirname, '../..');
const bin = path.join(root, 'bin/slewsmith.mjs');
const asset = (name: string) => path.join(root, 'assets', name);

function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, [bin, ...args], { cwd: root, maxBuffer: 64 << 20 }, (err, stdout, stderr) => {
      const code = err ? (((err as NodeJS.ErrnoException & { code?: number }).code as unknown as number) ?? 1) : 0;
      resolve({ code: typeof code === 'number' ? code : 1, stdout, stderr });
    });
  });
}

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'slewsmith-cli-'));
});

describe('slewsmith CLI', () => {
  it('prints help and refuses an unknown command with exit 2', async () => {
    const h = await cli(['--help']);
    expect(h.code).toBe(0);
    expect(h.stdout).toContain('compare');
    expect(h.stdout).toContain('not flight software');
    const sub = await cli(['fly', '--help']);
    expect(sub.code).toBe(0);
    expect(sub.stdout).toContain('--format');
    const bad = await cli(['launch']);
    expect(bad.code).toBe(2);
  });

  it('check: valid demo → 0; an impossible inertia → 2 naming the field and the rule', async () => {
    const ok = await cli(['check', asset('lumen6-imaging.scenario.json')]);
    expect(ok.code).toBe(0);
    expect(ok.stdout).toContain('valid');
    const json = JSON.parse(readFileSync(asset('lumen6-imaging.scenario.json'), 'utf8'));
    json.vehicle.inertiaKgm2[2][2] = 0.5; // 0.11 + 0.12 < 0.5: breaks the triangle inequality
    json.vehicle.inertiaKgm2[0][0] = -1; // and not positive definite
    const f = path.join(dir, 'bad.scenario.json');
    writeFileSync(f, JSON.stringify(json));
    const bad = await cli(['check', f]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('vehicle.inertiaKgm2');
    expect(bad.stderr).toMatch(/positive-definite|triangle-inequality/);
  });

  it('plan: the demo plan is feasible and names its binding limits', async () => {
    const r = await cli(['plan', asset('lumen6-imaging.scenario.json')]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/slew-rate|torque|momentum/);
    expect(r.stdout).toContain('Plan feasible');
    const j = await cli(['plan', asset('kestrel60-momentum.scenario.json'), '--json']);
    const plan = JSON.parse(j.stdout).plan;
    expect(plan.segments.some((s: { binding: string }) => s.binding === 'momentum')).toBe(true);
  });

  it('plan: wheels already holding more momentum than the envelope → infeasible, exit 1', async () => {
    const json = JSON.parse(readFileSync(asset('kestrel60-momentum.scenario.json'), 'utf8'));
    // Every wheel at 99.9 % of its own limit: beyond the planning margin before the slew starts.
    json.initial.wheelMomentumMNms = json.vehicle.wheels.wheels.map(
      (w: { maxMomentumMNms: number }, i: number) => (i % 2 ? -0.999 : 0.999) * w.maxMomentumMNms,
    );
    const f = path.join(dir, 'full.scenario.json');
    writeFileSync(f, JSON.stringify(json));
    const r = await cli(['plan', f]);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('INFEASIBLE');
  });

  it('compare: one table for every controller, also as CSV', async () => {
    const csv = path.join(dir, 'cmp.csv');
    const r = await cli(['compare', asset('tern12-reversal.scenario.json'), '--mode', 'step-target', '--csv', csv]);
    expect(r.code).toBe(0);
    for (const name of ['Quaternion PD', 'Sign-switch', 'Eigenaxis', 'Hysteretic', 'Synergistic']) expect(r.stdout).toContain(name);
    const lines = readFileSync(csv, 'utf8').trim().split('\n');
    expect(lines[0]).toContain(CAUTION_TEXT);
    expect(lines.length).toBe(2 + 5);
  });

  it('fly: writes CSV, JSON and AEM that parse, carry the caution and contain no NaN', async () => {
    const out = path.join(dir, 'fly');
    const r = await cli([
      'fly',
      asset('lumen6-imaging.scenario.json'),
      '--controller',
      'hysteretic',
      '--mode',
      'follow-plan',
      '--out',
      out,
    ]);
    expect(r.code).toBe(0);
    const files = readdirSync(out);
    expect(files.sort()).toEqual([
      'lumen6-imaging.hysteretic.follow-plan.aem',
      'lumen6-imaging.hysteretic.follow-plan.csv',
      'lumen6-imaging.hysteretic.follow-plan.json',
    ]);
    const aem = readFileSync(path.join(out, files[0]!), 'utf8');
    const doc = parseAem(aem);
    expect(doc.ok).toBe(true);
    if (doc.ok) expect(doc.value.segments.length).toBe(4); // one AEM segment per maneuver segment
    expect(aem).not.toMatch(/NaN|Infinity/);
    expect(Math.max(...aem.split(/\r?\n/).map((l) => l.length))).toBeLessThanOrEqual(254);
    expect(aem).toContain('not flight software');
    const csv = readFileSync(path.join(out, files[1]!), 'utf8');
    expect(csv.split('\n')[1]).toContain(CAUTION_TEXT);
    expect(csv).not.toMatch(/NaN/);
    const js = JSON.parse(readFileSync(path.join(out, files[2]!), 'utf8'));
    expect(JSON.stringify(js)).toContain('not flight software');
  });

  it('certify: the demo set is admissible (0); a zero-gap set (opposite warp directions) is refused (1)', async () => {
    const ok = await cli(['certify', asset('lumen6-imaging.scenario.json')]);
    expect(ok.code).toBe(0);
    expect(ok.stdout).toMatch(/δ\* = 0\.0312/);
    const json = JSON.parse(readFileSync(asset('lumen6-imaging.scenario.json'), 'utf8'));
    const syn = json.controllers.find((c: { law: string }) => c.law === 'synergistic');
    syn.warpDirections = [
      [1, 0, 0],
      [-1, 0, 0],
    ]; // methods note §4.2: opposite directions give δ* = 0
    const f = path.join(dir, 'zero-gap.scenario.json');
    writeFileSync(f, JSON.stringify(json));
    const bad = await cli(['certify', f]);
    expect(bad.code).toBe(1);
    expect(bad.stderr).toMatch(/gap|refus/i);
    expect(existsSync(f)).toBe(true);
  });

  it('schema: prints a JSON Schema of the scenario format', async () => {
    const r = await cli(['schema']);
    expect(r.code).toBe(0);
    const s = JSON.parse(r.stdout);
    expect(JSON.stringify(s)).toContain('inertiaKgm2');
  });
});
