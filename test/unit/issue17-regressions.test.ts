/**
 * Issue 17's minimal failing inputs, each through the real CLI path in-process (runCli with the
 * real simulation): what used to crash, hang or pass silently now exits with a named reason. The
 * items not here have their own tests (listed in cli-edges.test.ts, cli-process.test.ts,
 * cli-outcome.test.ts, cli-kill-export.test.ts, pipeline-budget.test.ts, closedloop-guards.test.ts,
 * export-stream.test.ts, main-documents-guards.test.ts, ui-app-controller.test.ts,
 * renderer-bundles.test.ts). Pass criteria are the project's rules (README exit codes); no outside
 * reference applies.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MAX_LISTED_ISSUES } from '../../main/cli/io';
import { validateScenario } from '../../app/engine/scenario/validate';
import { asset, runInProcess as cli, STACK_TRACE } from './cli-harness';
import { tempDir } from './main-fakes';

let dir: string;
beforeAll(async () => {
  dir = await tempDir();
});
afterAll(() => fsp.rm(dir, { recursive: true, force: true }));

async function demo(): Promise<Record<string, any>> {
  return JSON.parse(await fsp.readFile(asset('lumen6-imaging.scenario.json'), 'utf8'));
}
async function file(name: string, edit: (j: Record<string, any>) => void): Promise<string> {
  const j = await demo();
  edit(j);
  const p = path.join(dir, name);
  await fsp.writeFile(p, JSON.stringify(j));
  return p;
}

describe('issue 17 regressions', () => {
  it('item 1: a target hold or tail of 1e9 s is invalid input naming the field (was RangeError: Invalid typed array length)', async () => {
    for (const [field, edit] of [
      ['targets[0].holdS', (j: any) => (j.targets[0].holdS = 1e9)],
      ['simulation.tailS', (j: any) => (j.simulation.tailS = 1e9)],
    ] as const) {
      const f = await file(`long-${field}.json`, edit);
      const r = await cli(['fly', f, '--out', path.join(dir, 'o1')]);
      expect(r.code, field).toBe(2);
      expect(r.stderr).toContain(field);
      expect(r.stderr).not.toMatch(STACK_TRACE);
      expect(r.stderr).not.toContain('RangeError');
    }
  });

  it('item 4: a torque margin of 5e-324 is refused naming the margin, never "Plan feasible: total NaN s"', async () => {
    const f = await file('margin.json', (j) => (j.planning.torqueMargin = 5e-324));
    for (const cmd of ['plan', 'fly']) {
      const r = await cli([cmd, f, '--out', path.join(dir, 'o4')].slice(0, cmd === 'plan' ? 2 : 4));
      expect(r.code, cmd).not.toBe(0);
      expect(r.stdout + r.stderr).toContain('planning.torqueMargin');
      expect(r.stdout + r.stderr).not.toMatch(/\bNaN\b/);
    }
  });

  it('item 5: a rate bias of 1e200 deg/s is invalid input naming the field (was "completed", 0 % torque, exit 0)', async () => {
    const f = await file('bias.json', (j) => (j.vehicle.sensors.rateBiasDegPerS = [1e200, 0, 0]));
    const r = await cli(['fly', f, '--out', path.join(dir, 'o5')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('vehicle.sensors.rateBiasDegPerS');
  });

  it('item 8: an epoch in the year 9999 is invalid input naming epochUtc (was 2,504 internal lines at AEM export)', async () => {
    const f = await file('epoch.json', (j) => (j.epochUtc = '9999-01-01T00:00:00Z'));
    const r = await cli(['fly', f, '--out', path.join(dir, 'o8'), '--format', 'aem']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('epochUtc');
    expect(r.stderr.trim().split('\n').length).toBeLessThanOrEqual(MAX_LISTED_ISSUES + 2);
  });

  it('item 11: 476,625 controllers give a capped list of problems; 10^6 targets validate in well under 13 s', async () => {
    const j = await demo();
    const c0 = j.controllers[0];
    j.controllers = Array.from({ length: 476_625 }, (_, i) => ({ ...c0, id: `c${i}` }));
    const v0 = validateScenario(j);
    expect(v0.ok).toBe(false);
    if (!v0.ok) {
      expect(v0.errors.length).toBeLessThan(100); // was one issue per controller
      expect(v0.errors.some((e) => e.path === 'controllers')).toBe(true);
    }
    // Through the CLI the same document is a 55 MB file: refused by size, naming the limit.
    const p = path.join(dir, 'many.json');
    await fsp.writeFile(p, JSON.stringify(j));
    const r = await cli(['check', p]);
    expect(r.code).toBe(2);
    expect(r.stderr.trimEnd().split('\n').length).toBeLessThanOrEqual(MAX_LISTED_ISSUES + 2);
    expect(r.stderr).toContain('at most 20971520 bytes');

    const t = await demo();
    t.targets = Array.from({ length: 1_000_000 }, () => t.targets[0]);
    const t0 = performance.now();
    const v = validateScenario(t);
    const s = (performance.now() - t0) / 1000;
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.errors.some((e) => e.path === 'targets')).toBe(true);
    expect(s).toBeLessThan(5); // was 13 s: the cross-field checks ran past the count limit
  }, 120_000);
});
