/**
 * Robustness study (seeded Monte Carlo) — public API for the CLI and the app.
 *
 *   runStudy(json, overrides?, { onProgress, shouldStop })   whole study in this thread
 *   startStudyParallel(json, ports, opts)                     split over workers (any kind)
 *   createStudyWorker(post)                                   the worker half of that
 *   makeStudyContext / runStudyChunk                          build once, run chunks of cases
 *   summarizeStudy / outcomeMap                               results from finished cases
 *   createStudyAccumulator / accumulateCase / studySummaryOf  the mergeable path every summary takes
 *   casesCsv / summaryJson (casesCsvHead, caseRowsText, …)    exports, whole or streamed
 *   shardRange / shardHeader / planMerge …                    campaign shards and their merge
 *   studyCaseScenario(json, overrides, index)                 one case as a normal scenario file
 *   rerunStudyCase(json, overrides, index, controllerId?)     one case re-flown with full traces
 *   validateSweep / runSweep / runSweepCell / sweepJson         robustness sweeps: grid cells as studies
 */
export type { StudyDefinition, AttitudeDispersion, ActuationMode } from '../scenario/study';
export { defaultStudySpec, DEFAULT_DURATION_S, DEFAULT_SETTLED_FOR_S, DEFAULT_WORST_CASES } from '../scenario/study';
export type { CaseDraw, NominalCase } from './sample';
export { drawCase, haarAngleBetween, MAX_CASE_INDEX, MAX_INERTIA_ATTEMPTS, SLOT } from './sample';
export type { StudyContext, StudyOverrides } from './context';
export { makeStudyContext, effectiveStudyJson } from './context';
export type { CaseRecord, CaseRun, CaseStatus } from './runCase';
export { runCase, CHATTER_THRESHOLD_PER_S, TRACE_SAMPLES } from './runCase';
export type { StudyProgress, StudyResult, RunStudyOptions } from './runner';
export { runStudy, runStudyChunk, studyInfo, ProgressCounter } from './runner';
export type { ControllerShares, ControllerSummary, Histogram, MapPoint, Spread, StudyInfo, StudySummary, WorstCase } from './summary';
export { summarizeStudy, studySummaryOf, accumulateRecords, outcomeMap, outcomeOf, sortRecords } from './summary';
export type { StudyAccumulator, RunCounts } from './accumulate';
export { createStudyAccumulator, accumulateCase, mergeStudyAccumulators, accumulatedCases, MAP_SAMPLE_CASES } from './accumulate';
export { accumulatorToJson, accumulatorFromJson } from './accumulateJson';
export type { QuantityKey } from './quantities';
export { QUANTITIES } from './quantities';
export { casesCsv, casesCsvHead, caseRowsText, casesCsvTail, summaryJson, CASE_COLUMNS, SUMMARY_FORMAT, SUMMARY_VERSION } from './export';
export { CaseOrderer } from './ordered';
export type { ShardHeader, ShardTrailer } from './shard';
export {
  shardRange,
  shardSpecIssues,
  shardFileName,
  shardHeader,
  shardHeaderLine,
  shardTrailerLine,
  parseShardHeader,
  parseShardTrailer,
  planMerge,
  SHARD_EXTENSION,
} from './shard';
export type { FromWorker, ToWorker, StudyWorkerPort, ParallelOptions, ParallelOutcome, ParallelStudy } from './parallel';
export { createStudyWorker, startStudyParallel, inThreadPort } from './parallel';
export type { StudyCaseRerun } from './caseScenario';
export { studyCaseScenario, rerunStudyCase } from './caseScenario';
export type { SweepAxis, SweepAxisSpec, SweepDefinition, SweepParameter, SweepSpec } from './sweep';
export { validateSweep, cellCount, cellPosition, cellSeed, SWEEP_PARAMETERS, SWEEP_PARAMETER_NAMES } from './sweep';
export type { BoundaryPoint, SweepBoundary, SweepCell, SweepCellController, SweepInfo, SweepResult } from './sweepRun';
export { runSweep, runSweepCell, sweepInfo, sweepResultOf, sweepBoundaries, sweepCellJson } from './sweepRun';
export { sweepCellsCsv, sweepJson, SWEEP_FORMAT, SWEEP_VERSION } from './sweepExport';
