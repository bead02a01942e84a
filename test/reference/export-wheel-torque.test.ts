/**
 * The exported wheel torques agree with the exported wheel momentum (issue: "delivered" torques left
 * out bearing friction). Reference: the gyrostat's own equation ḣ_i = τ_motor,i − τ_friction,i
 * (methods §6) applied to the CSV export read back as text: over one control period the motor
 * torque is held, so the forward difference (h_{k+1} − h_k)/Δt equals the net column at sample k
 * up to the change of the friction torque within the period (its tanh Coulomb term turns fast where
 * a wheel's speed crosses zero, so the check allows 1 % of the samples to differ more).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { exportRun } from '../../app/engine/export/runExport';

const root = path.resolve(__dirname, '../..');

function csvOf(name: string, controller: string) {
  const json = JSON.parse(readFileSync(path.join(root, 'assets', `${name}.scenario.json`), 'utf8'));
  json.simulation.mode = 'follow-plan';
  const out = runPipeline(json, { controllers: [controller] });
  if (!out.ok) throw new Error(JSON.stringify(out.errors));
  const run = out.value.runs[0]!;
  const text = exportRun('csv', run, out.value, { toolName: 'Slewsmith', toolVersion: 'test', creationDateUtc: '2030-01-01T00:00:00Z' });
  if (!text.ok) throw new Error(JSON.stringify(text.errors));
  const lines = text.value.split('\n').filter((l) => l && !l.startsWith('#'));
  const head = lines[0]!.split(',');
  const rows = lines.slice(1).map((l) => l.split(',').map(Number));
  return { head, rows, nWheels: run.trace.nWheels, header: text.value };
}

function residuals(c: ReturnType<typeof csvOf>, column: 'net' | 'motor'): { all: number[]; scale: number } {
  const it = c.head.indexOf('t_s');
  const all: number[] = [];
  let scale = 0;
  for (let w = 1; w <= c.nWheels; w++) {
    const ih = c.head.indexOf(`wheel${w}_h_Nms`);
    const ic = c.head.indexOf(`wheel${w}_torque_${column}_Nm`);
    expect(ih).toBeGreaterThan(0);
    expect(ic).toBeGreaterThan(0);
    for (let k = 0; k + 1 < c.rows.length; k++) {
      const dt = c.rows[k + 1]![it]! - c.rows[k]![it]!;
      if (!(dt > 0)) continue;
      all.push(Math.abs((c.rows[k + 1]![ih]! - c.rows[k]![ih]!) / dt - c.rows[k]![ic]!));
      scale = Math.max(scale, Math.abs(c.rows[k]![ic]!));
    }
  }
  return { all: all.sort((a, b) => a - b), scale };
}

describe('exported wheel torques: commanded, motor and net (with friction), and dh/dt', () => {
  it('the Kestrel-60 wheels (with bearing friction): dh/dt matches the net column, not the motor column', () => {
    const c = csvOf('kestrel60-momentum', 'pd');
    for (const name of ['wheel1_torque_cmd_Nm', 'wheel1_torque_motor_Nm', 'wheel1_torque_net_Nm']) expect(c.head).toContain(name);
    const net = residuals(c, 'net');
    const motor = residuals(c, 'motor');
    const p99 = (r: number[]) => r[Math.floor(0.99 * (r.length - 1))]!;
    expect(p99(net.all)).toBeLessThan(1e-3 * net.scale);
    // Without friction in it, the motor column misses by the friction torque itself.
    expect(p99(motor.all)).toBeGreaterThan(10 * p99(net.all));
  });

  it('the CSV header states each wheel’s axis and limits, SI', () => {
    const c = csvOf('lumen6-imaging', 'pd');
    expect(c.header).toMatch(/# wheel limits: 1: axis \[[^\]]+\], torque 0\.002 N m, momentum 0\.006 N m s; 2:/);
  });
});
