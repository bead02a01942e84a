/**
 * Running a sweep (sweep.ts): each grid cell is the scenario with the cell's parameter values
 * written in, run as a study of `runs` cases with the cell's own seed (cellSeed) through the
 * study's case generator and mergeable accumulator (runner.ts, accumulate.ts, summary.ts). A cell
 * depends only on (scenario, sweep definition, cell index), so cells may run on any worker in any
 * order and the result, kept in cell order, is the same.
 *
 * The boundary of a controller is where its settle share crosses the sweep's level: along every
 * grid line (each row and each column of a 2-D grid), between neighbouring cells whose shares lie
 * on either side of the level, at the linearly interpolated parameter value.
 */
import type { Issue, Result } from '../errors';
import { fail, issue, ok } from '../errors';
import type { ShareReport } from '../math/stats';
import type { StudyContext } from './context';
import { effectiveStudyJson, makeStudyContext } from './context';
import { accumulateCase, createStudyAccumulator } from './accumulate';
import { runStudyChunk, studyInfo } from './runner';
import { studySummaryOf } from './summary';
import type { SweepDefinition } from './sweep';
import type { SweepTheoryInputs, SweepTheoryLine } from './sweepTheory';
import { sweepTheoryLines } from './sweepTheory';
import { applyParameter, cellCount, cellPosition, cellSeed, sweepScenarioIssues } from './sweep';

export interface SweepCellController {
  controllerId: string;
  /** Cases that could be flown (the rest: unflyable vehicles or no plan). */
  flyable: number;
  /** Shares of the flyable cases with their 95 % intervals (Wilson; rule of three at zero). */
  settled: ShareReport;
  /** Did not settle within the case's duration, or failed (held, e.g. near 180°). */
  stalled: ShareReport;
  unwound: ShareReport;
  chattered: ShareReport;
  /** Nearest-rank median / 95th percentile of the settle time over the flyable runs, s (null: not within the duration). */
  settleMedianS: number | null;
  settleP95S: number | null;
  /** The cell's worst case index for this controller (open it with the study's --case on the cell's scenario), or null. */
  worstCase: number | null;
}

export interface SweepCell {
  index: number;
  /** Index along each axis. */
  position: number[];
  /** Parameter value on each axis. */
  values: number[];
  /** The cell's study seed. */
  seed: number;
  casesDone: number;
  controllers: SweepCellController[];
}

/** One point of a boundary: on the grid line where the other axis (if any) is at `fixedIndex`. */
export interface BoundaryPoint {
  /** Axis along which the crossing lies (0 or 1). */
  along: number;
  /** Index on the other axis (null for a one-axis sweep). */
  fixedIndex: number | null;
  fixedValue: number | null;
  /** Interpolated parameter value on axis `along` where the settle share equals the level. */
  value: number;
  /** 'falls': the share drops below the level as the parameter grows; 'rises': the reverse. */
  direction: 'falls' | 'rises';
}

export interface SweepBoundary {
  controllerId: string;
  level: number;
  points: BoundaryPoint[];
}

export interface SweepInfo {
  scenarioName: string;
  def: SweepDefinition;
  controllers: { id: string; label: string; law: string }[];
  durationS: number;
  cells: number;
  /** The values the theory lines need that the sweep does not vary (cell 0's build); absent in results made before they existed. */
  theoryInputs?: SweepTheoryInputs;
}

export interface SweepResult {
  info: SweepInfo;
  /** Finished cells in cell order. */
  cells: SweepCell[];
  /** True when every cell finished. */
  complete: boolean;
  boundaries: SweepBoundary[];
  /** Published boundary lines that apply to this sweep (sweepTheory.ts). */
  theory: SweepTheoryLine[];
}

/** The scenario JSON of cell `index`: the effective study block with the cell's runs, seed and controllers, then the cell's values. */
export function sweepCellJson(json: unknown, def: SweepDefinition, index: number): unknown {
  const o = { runs: def.runs, seed: cellSeed(def.seed, index), ...(def.controllers ? { controllers: def.controllers } : {}) };
  const eff = effectiveStudyJson(json, o).json;
  if (eff === null || typeof eff !== 'object' || Array.isArray(eff)) return eff;
  const pos = cellPosition(def, index);
  def.axes.forEach((a, k) => applyParameter(eff as Record<string, unknown>, a.parameter, a.values[pos[k]!]!));
  return eff;
}

const prefixed = (index: number, list: readonly Issue[]) => list.map((e) => issue(e.path, e.rule, `grid cell ${index}: ${e.message}`));

/** What every cell shares (scenario name, controllers, duration), from cell 0's context; checks the sweep against the scenario. */
export function sweepInfo(json: unknown, def: SweepDefinition): Result<SweepInfo> {
  const c = makeStudyContext(sweepCellJson(json, def, 0));
  if (!c.ok) return fail(prefixed(0, c.errors), c.warnings);
  const ctx = c.value;
  const controllers = ctx.controllers.map((b) => ({ id: b.id, label: b.label, law: b.law }));
  const bad = sweepScenarioIssues(def, controllers);
  if (bad.length) return fail(bad, ctx.warnings);
  return ok(
    {
      scenarioName: ctx.prepared.scenario.name,
      def,
      controllers,
      durationS: ctx.def.durationS,
      cells: cellCount(def),
      theoryInputs: theoryInputsOf(ctx),
    },
    ctx.warnings,
  );
}

/** Fixed hysteresis δ, certified gap δ* and worst-case ē of cell 0 (the ones a sweep varies are not read from here). */
function theoryInputsOf(ctx: StudyContext): SweepTheoryInputs {
  return {
    worstCaseEta: ctx.def.sensors.adversarialEta,
    controllers: ctx.controllers.map((b) => {
      const spec = ctx.prepared.scenario.controllers.find((c) => c.id === b.id);
      const cert = b.controller.certificate ?? b.controller.sphereCertificate ?? null;
      return {
        id: b.id,
        hysteresis: spec?.law === 'hysteretic' ? spec.hysteresis : null,
        gapStar: cert && cert.certified ? cert.deltaStar : null,
      };
    }),
  };
}

/**
 * Run cell `index` as a study in this thread. `onCase` sees each finished case (progress).
 * Returns ok(null) when `shouldStop` stopped it (a half-run cell is never reported).
 */
export function runSweepCell(
  json: unknown,
  def: SweepDefinition,
  index: number,
  hooks: { onCase?: () => void; shouldStop?: () => boolean } = {},
): Result<SweepCell | null> {
  const c = makeStudyContext(sweepCellJson(json, def, index));
  if (!c.ok) return fail(prefixed(index, c.errors), c.warnings);
  const ctx = c.value;
  const info = studyInfo(ctx);
  const acc = createStudyAccumulator(info);
  const all = Array.from({ length: def.runs }, (_, i) => i);
  const done = runStudyChunk(
    ctx,
    all,
    (r) => {
      accumulateCase(acc, r);
      hooks.onCase?.();
    },
    hooks.shouldStop,
  );
  if (done < def.runs) return ok(null);
  const s = studySummaryOf(info, acc);
  const pos = cellPosition(def, index);
  return ok({
    index,
    position: pos,
    values: def.axes.map((a, k) => a.values[pos[k]!]!),
    seed: cellSeed(def.seed, index),
    casesDone: s.casesDone,
    controllers: s.controllers.map((cs) => ({
      controllerId: cs.controllerId,
      flyable: cs.flyable,
      settled: cs.shares.settled,
      stalled: cs.shares.notSettled,
      unwound: cs.shares.unwound,
      chattered: cs.shares.chattered,
      settleMedianS: cs.spreads.settleTimeS.median,
      settleP95S: cs.spreads.settleTimeS.p95,
      worstCase: cs.worst[0]?.index ?? null,
    })),
  });
}

/**
 * Boundaries per controller from the finished cells (missing cells break a grid line there).
 * A share exactly at the level counts as above it ("settles at least at the level").
 */
export function sweepBoundaries(info: Pick<SweepInfo, 'def' | 'controllers'>, cells: readonly SweepCell[]): SweepBoundary[] {
  const def = info.def;
  const byIndex = new Map(cells.map((c) => [c.index, c]));
  const dims = def.axes.map((a) => a.values.length);
  const indexOf = (pos: number[]) => pos.reduce((acc, p, k) => acc + p * dims.slice(0, k).reduce((m, d) => m * d, 1), 0);
  return info.controllers.map((ctrl, ci) => {
    const points: BoundaryPoint[] = [];
    def.axes.forEach((axis, along) => {
      const other = def.axes.length === 2 ? 1 - along : -1;
      const lines = other < 0 ? 1 : dims[other]!;
      for (let f = 0; f < lines; f++) {
        for (let k = 0; k + 1 < axis.values.length; k++) {
          const p0 = along === 0 ? [k, f] : [f, k];
          const p1 = along === 0 ? [k + 1, f] : [f, k + 1];
          const c0 = byIndex.get(indexOf(p0.slice(0, def.axes.length)));
          const c1 = byIndex.get(indexOf(p1.slice(0, def.axes.length)));
          if (!c0 || !c1) continue;
          const s0 = c0.controllers[ci]!.settled,
            s1 = c1.controllers[ci]!.settled;
          if (s0.of === 0 || s1.of === 0) continue;
          const above0 = s0.share >= def.level,
            above1 = s1.share >= def.level;
          if (above0 === above1) continue;
          const x0 = axis.values[k]!,
            x1 = axis.values[k + 1]!;
          const value = x0 + ((def.level - s0.share) / (s1.share - s0.share)) * (x1 - x0);
          points.push({
            along,
            fixedIndex: other < 0 ? null : f,
            fixedValue: other < 0 ? null : def.axes[other]!.values[f]!,
            value,
            direction: above0 ? 'falls' : 'rises',
          });
        }
      }
    });
    return { controllerId: ctrl.id, level: def.level, points };
  });
}

export interface RunSweepOptions {
  onCell?: (cell: SweepCell, done: number, total: number) => void;
  shouldStop?: () => boolean;
}

/** The whole sweep in this thread (tests, small sweeps); the CLI spreads cells over worker threads. */
export function runSweep(json: unknown, def: SweepDefinition, opts: RunSweepOptions = {}): Result<SweepResult> {
  const inf = sweepInfo(json, def);
  if (!inf.ok) return fail(inf.errors, inf.warnings);
  const info = inf.value;
  const cells: SweepCell[] = [];
  for (let i = 0; i < info.cells; i++) {
    if (opts.shouldStop?.()) break;
    const r = runSweepCell(json, def, i, { shouldStop: opts.shouldStop });
    if (!r.ok) return fail(r.errors, inf.warnings);
    if (!r.value) break;
    cells.push(r.value);
    opts.onCell?.(r.value, cells.length, info.cells);
  }
  return ok(sweepResultOf(info, cells), inf.warnings);
}

/** A result from finished cells (any order). */
export function sweepResultOf(info: SweepInfo, cellsIn: readonly SweepCell[]): SweepResult {
  const cells = [...cellsIn].sort((a, b) => a.index - b.index);
  return { info, cells, complete: cells.length === info.cells, boundaries: sweepBoundaries(info, cells), theory: sweepTheoryLines(info) };
}
