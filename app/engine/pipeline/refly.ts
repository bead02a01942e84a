/**
 * Exports are written from every sample a run flew. A long run keeps only a display trace
 * (displayTrace.ts), so exporting it flies that one run again: same scenario file, controller, mode,
 * seed and step cap as the pass, on the same deterministic closed loop, so the full trace, metrics,
 * monitor and constraint margins are the ones the pass computed, bit for bit (test:
 * test/unit/pipeline-display-trace.test.ts compares the export bytes). Used by the CLI's fly
 * (main/cli/compute.ts) and the app's export (app/ui/exporting.ts).
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { estimateBudget, grouped, runStepCap } from './budget';
import { flyAndSummarise, preparePipeline } from './run';
import type { ControllerRun, PipelineOutput } from './types';

/** The run as the pass flew it, with its full trace: itself when it kept one, else flown again. */
export function fullRun(out: Pick<PipelineOutput, 'scenario'>, run: ControllerRun, shouldStop?: () => boolean): Result<ControllerRun> {
  if (run.traceKind !== 'display') return ok(run);
  const p = preparePipeline(out.scenario.file, [run.controllerId]);
  if (!p.ok) return fail(p.errors, p.warnings);
  const c = p.value.controllers.find((x) => x.id === run.controllerId);
  if (!c) return fail([{ path: 'run.controllerId', rule: 'exists', message: `controller ${run.controllerId} is not in the scenario` }]);
  // The pass's step cap (runPipeline): it depends on the run's length only, not on how many runs the pass had.
  const maxSteps = runStepCap(estimateBudget(p.value.scenario, p.value.plan, 1, [run.mode]));
  const again = flyAndSummarise(p.value, c, run.mode, { shouldStop, maxSteps });
  if (again.trace.n !== run.display?.fullSamples)
    return fail([
      {
        path: 'run.trace',
        rule: 'refly',
        message: `flying run ${run.key} again recorded ${grouped(again.trace.n)} samples, not the ${grouped(run.display?.fullSamples ?? NaN)} of the pass (stopped, or the scenario changed): export not written`,
      },
    ]);
  return ok(again);
}

/** Why a run cannot be exported as it is (its kept trace is a display trace); null when it can. */
export function displayTraceExportIssue(run: Pick<ControllerRun, 'key' | 'traceKind' | 'display'>): Issue | null {
  if (run.traceKind !== 'display') return null;
  const d = run.display;
  const what = d ? `${grouped(d.kept)} of its ${grouped(d.fullSamples)} samples` : 'a subset of its samples';
  return {
    path: 'run.trace',
    rule: 'display-trace',
    message: `run ${run.key} kept only a display trace (${what}, for the plots and views); an export needs every sample: fly the run again at full rate (the CLI's fly and the app's export do this) instead of exporting the display trace`,
  };
}
