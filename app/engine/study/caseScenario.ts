/**
 * One study case, outside the study:
 * - `studyCaseScenario`: the case written as a plain scenario file (scenario/toFile.ts on the
 *   case scenario of disperse.ts), which the app or the CLI opens and flies as a normal run —
 *   through the same stages, so it reproduces the study's row for that case;
 * - `rerunStudyCase`: the exact study run of that case with full traces and the Lyapunov
 *   monitor, as pipeline runs (so the normal views can show a worst case).
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { flyAndSummarise } from '../pipeline/run';
import type { ControllerRun } from '../pipeline/types';
import type { Scenario } from '../scenario/schema';
import { toScenarioFile } from '../scenario/toFile';
import type { StudyOverrides } from './context';
import { makeStudyContext } from './context';
import { disperseScenario } from './disperse';
import type { CaseDraw } from './sample';
import { drawCase } from './sample';
import { prepareCase } from './runCase';

function checkIndex(index: number, runs: number): Issue[] {
  if (!Number.isInteger(index) || index < 0 || index >= runs) {
    return [{ path: 'index', rule: 'range', message: `case index must be a whole number from 0 to ${runs - 1} (got ${index})` }];
  }
  return [];
}

/**
 * The scenario file of case `index` of the study in `json` (with the same overrides the study ran
 * with). Fails with issues for a bad scenario, an index out of range, or an unflyable case.
 */
export function studyCaseScenario(json: unknown, study: StudyOverrides | undefined, index: number): Result<Scenario> {
  const c = makeStudyContext(json, study ?? {});
  if (!c.ok) return fail(c.errors, c.warnings);
  const ctx = c.value;
  const bad = checkIndex(index, ctx.def.runs);
  if (bad.length) return fail(bad);
  const d = drawCase(ctx.def, ctx.nominal, index);
  const cs = disperseScenario(
    ctx.prepared.scenario,
    ctx.def,
    d,
    ctx.controllers.map((x) => x.id),
    ctx.target,
  );
  if (!cs.ok) return fail([{ path: `case ${index}`, rule: 'unflyable', message: `case ${index} cannot be flown: ${cs.reason}` }]);
  return ok(toScenarioFile(cs.scenario));
}

export interface StudyCaseRerun {
  draw: CaseDraw;
  runs: ControllerRun[];
}

/** The exact study run of case `index` (all study controllers, or only `controllerId`). */
export function rerunStudyCase(
  json: unknown,
  study: StudyOverrides | undefined,
  index: number,
  controllerId?: string,
): Result<StudyCaseRerun> {
  const c = makeStudyContext(json, study ?? {});
  if (!c.ok) return fail(c.errors, c.warnings);
  const ctx = c.value;
  const bad = checkIndex(index, ctx.def.runs);
  if (controllerId !== undefined && !ctx.controllers.some((x) => x.id === controllerId)) {
    bad.push({
      path: 'controller',
      rule: 'unknown-id',
      message: `the study has no controller "${controllerId}" (have: ${ctx.controllers.map((x) => x.id).join(', ')})`,
    });
  }
  if (bad.length) return fail(bad);
  const pc = prepareCase(ctx, index);
  if (!pc.ok) return fail([{ path: `case ${index}`, rule: 'unflyable', message: `case ${index} cannot be flown: ${pc.reason}` }]);
  const runs = pc.prepared.controllers
    .filter((bc) => controllerId === undefined || bc.id === controllerId)
    .map((bc) => flyAndSummarise(pc.prepared, bc, ctx.def.mode));
  return ok({ draw: pc.draw, runs });
}
