/**
 * The work of the commands that need the engine, loaded by index.ts on first use (see `work`
 * there). check and plan live here; the others have their own modules and are re-exported.
 */
import { preparePipeline } from '../../app/engine/pipeline/run';
import { planSummaryWithConstraints } from '../../app/engine/pipeline/constraints';
import { withConstraintStatus } from './constraintStatus';
import { planSummaryWithSavings } from '../../app/engine/pipeline/rollFreePlan';
import { CAUTION_TEXT } from '../../app/engine/caution';
import type { ParsedArgs } from './args';
import { planTable } from './format';
import { orbitOutput } from '../../app/engine/pipeline/orbit';
import { orbitJson, windowsText } from './orbitText';
import { printIssues, printWarnings, type CliContext } from './io';

export { scenarioJsonSchema } from '../../app/engine/scenario/schema';
export { runCertify } from './certify';
export { runCompare, runFly } from './fly';
export { runStudyCli } from './study';
export { runSweepCli } from './sweep';
export { runSweepMerge } from './sweep-campaign';
export { runSweepSlurm } from './sweep-slurm';
export { runStudyMerge, runStudySlurm } from './study-campaign';

export async function runCheck(file: string, json: unknown, { io }: CliContext): Promise<number> {
  const p = preparePipeline(json);
  if (!p.ok) {
    printIssues(io, `${file} is not valid`, p.errors);
    return 2;
  }
  printWarnings(io, p.value.warnings);
  const s = p.value.scenario;
  io.out(
    `${file}: valid. "${s.name}", ${s.vehicle.wheels.length} wheels, ${s.targets.length} targets, ${p.value.controllers.length} controllers.`,
  );
  return 0;
}

export async function runPlan(file: string, json: unknown, a: ParsedArgs, { io }: CliContext): Promise<number> {
  const p = preparePipeline(json);
  if (!p.ok) {
    printIssues(io, `${file} is not valid`, p.errors);
    return 2;
  }
  const plan = planSummaryWithConstraints(
    planSummaryWithSavings(p.value),
    p.value.planConstraints,
    p.value.plan,
    p.value.constrainedSegments,
  );
  const orbit = p.value.orbit ? orbitOutput(p.value.scenario, p.value.orbit, p.value.plan.tracking ?? null) : null;
  if (orbit) printWarnings(io, p.value.warnings);
  if (a.flags.has('json')) io.out(JSON.stringify({ caution: CAUTION_TEXT, plan, ...(orbit ? { orbit: orbitJson(orbit) } : {}) }, null, 2));
  else io.out(`Plan for "${p.value.scenario.name}"\n\n${planTable(plan)}\n\n${orbit ? `${windowsText(orbit)}\n\n` : ''}${CAUTION_TEXT}`);
  return withConstraintStatus(p.value.plan.feasible ? 0 : 1, plan.constraints?.clear === false);
}
