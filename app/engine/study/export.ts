/**
 * Study exports: the per-case table (CSV, one row per case × controller, `#` header lines with the
 * caution and the conventions) and the summary (JSON). Both list cases in case-index order, so
 * the files are the same whatever the number of workers or shards. The table is made of pieces
 * (head, the rows of each case, tail) so that a large study streams it to disk case by case.
 */
import { CAUTION_TEXT, QUATERNION_CONVENTION } from '../caution';
import type { CaseRecord } from './runCase';
import { CHATTER_THRESHOLD_PER_S } from './runCase';
import type { MapPoint, StudyInfo, StudySummary } from './summary';
import { outcomeOf, sortRecords } from './summary';
import { MAP_SAMPLE_CASES } from './accumulate';

export const SUMMARY_FORMAT = 'slewsmith-study-summary';
/** 2: shares with intervals, spreads with moments and bins, a scenario, a map sample (1: the first layout). */
export const SUMMARY_VERSION = 2;
import { ARCSEC_PER_RAD, DEG_PER_RAD } from '../units';

/** Shortest round-trip number text; null/undefined → empty cell. */
function num(v: number | null | undefined): string {
  if (v === null || v === undefined) return '';
  if (!Number.isFinite(v)) return '';
  return Object.is(v, -0) ? '0' : String(v);
}

function cell(s: string): string {
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export const CASE_COLUMNS = [
  'case',
  'controller',
  'outcome',
  'status',
  'settle_time_s',
  'unwound',
  'long_way',
  'chattered',
  'rotation_travelled_deg',
  'shortest_rotation_deg',
  'extra_rotation_deg',
  'jumps',
  'chatter_per_s',
  'peak_wheel_torque_fraction',
  'peak_wheel_momentum_fraction',
  'final_error_deg',
  'end_s',
  'initial_error_angle_deg',
  'initial_error_axis_x',
  'initial_error_axis_y',
  'initial_error_axis_z',
  'initial_eta',
  'q0_x',
  'q0_y',
  'q0_z',
  'q0_w',
  'initial_rate_x_deg_per_s',
  'initial_rate_y_deg_per_s',
  'initial_rate_z_deg_per_s',
  'inertia_rejections',
  'failed_wheel',
  'control_rate_hz',
  'actuation',
  'attitude_noise_arcsec',
  'adversarial_eta',
  'noise_seed',
  'reason',
] as const;

/** The `#` lines and the column line that open every cases.csv (they do not depend on the cases). */
export function casesCsvHead(info: StudyInfo): string {
  const def = info.def;
  const head = [
    `CAUTION: ${CAUTION_TEXT}`,
    `Slewsmith robustness study: scenario "${info.scenarioName}", seed ${def.seed}, ${def.runs} cases, mode ${def.mode}, ${def.durationS} s per case`,
    'one row per case and controller, in case order; a case depends only on (seed, case); every controller flies the same case with the same noise seed',
    `q0: ${QUATERNION_CONVENTION}; initial error = q_target* q0 in target axes (shortest rotation); initial_eta is its scalar part as flown`,
    `outcome: failed | unflyable | unsettled | unwound | chattered (chatter ≥ ${CHATTER_THRESHOLD_PER_S} events/s) | settled, first that applies; fractions are of the case's own (degraded) wheel limits`,
    'failed_wheel: 1-based index of the wheel lost in this case, 0 for none',
  ];
  return head.map((h) => `# ${h}\n`).join('') + CASE_COLUMNS.join(',') + '\n';
}

/** The rows of one case (one per controller, each ending in a newline). */
export function caseRowsText(rec: CaseRecord): string {
  const d = rec.draw;
  let out = '';
  rec.runs.forEach((r) => {
    const row = [
      String(d.index),
      cell(r.controllerId),
      outcomeOf(r),
      r.status,
      num(r.settleTimeS),
      r.unwound ? '1' : '0',
      r.longWay ? '1' : '0',
      r.chattered ? '1' : '0',
      num(r.rotationTravelledDeg),
      num(r.shortestRotationDeg),
      num(r.extraRotationDeg),
      String(r.jumps),
      num(r.chatterPerS),
      num(r.peakWheelTorqueFraction),
      num(r.peakWheelMomentumFraction),
      num(r.finalErrorDeg),
      num(r.endS),
      num(d.errorAngleRad * DEG_PER_RAD),
      num(d.errorAxis[0]),
      num(d.errorAxis[1]),
      num(d.errorAxis[2]),
      num(d.errorEta),
      num(d.q0[0]),
      num(d.q0[1]),
      num(d.q0[2]),
      num(d.q0[3]),
      num(d.omega0RadPerS[0]! * DEG_PER_RAD),
      num(d.omega0RadPerS[1]! * DEG_PER_RAD),
      num(d.omega0RadPerS[2]! * DEG_PER_RAD),
      String(d.inertiaRejections),
      String(d.failedWheel + 1),
      num(d.controlRateHz),
      d.actuation,
      num(d.attitudeNoiseRad * ARCSEC_PER_RAD),
      num(d.adversarialEta),
      String(d.noiseSeed),
      cell(r.reason),
    ];
    out += row.join(',') + '\n';
  });
  return out;
}

/** What closes cases.csv: nothing for a complete study, one `#` line saying what is missing otherwise. */
export function casesCsvTail(summary: StudySummary): string {
  return summary.incomplete
    ? `# stopped early: ${summary.casesDone} of ${summary.runsRequested} cases finished; only those are listed\n`
    : '';
}

/**
 * The whole table as one string (small studies and the app's export). Large studies write the
 * same bytes piece by piece: casesCsvHead, caseRowsText per case in case order, casesCsvTail.
 */
export function casesCsv(info: StudyInfo, records: readonly CaseRecord[], summary: StudySummary): string {
  return casesCsvHead(info) + sortRecords(records).map(caseRowsText).join('') + casesCsvTail(summary);
}

/**
 * The summary file: caution, conventions, the scenario as run (when known: a worst case can then
 * be re-flown from this file alone), the study definition, the per-controller summary and the
 * outcome map of the first MAP_SAMPLE_CASES cases. Byte-identical for the same study state.
 */
export function summaryJson(info: StudyInfo, summary: StudySummary, map: readonly MapPoint[]): string {
  return (
    JSON.stringify(
      {
        caution: CAUTION_TEXT,
        format: SUMMARY_FORMAT,
        version: SUMMARY_VERSION,
        conventions: {
          quaternion: QUATERNION_CONVENTION,
          units: 'angles deg, times s, rates deg/s; wheel figures are fractions of the case limits',
          shares:
            'shares are of the flyable runs; low/high: 95 % Wilson score interval (Wilson 1927); ruleOfThreeHigh: with no event in n runs, 3/n bounds the rate at 95 % one-sided (rule of three)',
          spreads:
            'mean, sd (sample), min, max over finite values; median and p95 nearest-rank over all flyable runs, located to medianBin/p95Bin (a tenth of a display bin) and interpolated in it; null when beyond the last bin',
          map: `the cases with index below ${MAP_SAMPLE_CASES} (all cases of a smaller study): axis/angleDeg = initial error rotation q_target* q0 in target axes; eta0 its scalar part as flown; outcome and settleTimeS per controller in the order of summary.controllers`,
        },
        scenario: info.scenario ?? null,
        study: info.def,
        summary,
        map,
      },
      null,
      1,
    ) + '\n'
  );
}
