/**
 * CSV export: `#` comment header (tool, conventions, frames, units, caution, and a line saying so
 * when the run was cut short or failed), one header row of column names with units, one row per
 * (optionally decimated) sample. Comma-separated, `.` as the decimal mark, numbers in shortest
 * round-trip form. Streamed (chunks.ts): csvChunks hands the text out chunk by chunk; writeCsv
 * collects it into one string.
 */
import { orbitHeaderLines } from './orbitText';
import type { Result } from '../errors';
import { fail, ok } from '../errors';
import { collectChunks, LineChunker, type ChunkedExport, type ChunkSource } from './chunks';
import type { ScenarioSummary } from '../pipeline/types';
import type { RunTrace } from '../sim/types';
import { CAUTION_TEXT, FRAME_CONVENTION, QUATERNION_CONVENTION, TIME_CONVENTION } from '../caution';
import { formatNumber, selectSamples, traceColumns, type Column } from './columns';
import { checkExportInputs, oneLine } from './prepare';
import { constraintColumns } from './constraintColumns';
import type { ExportMeta } from './types';

export interface CsvOptions {
  /** Keep about this many samples per second (the first at or after each grid point, and the last). */
  sampleRateHz?: number;
  lineEnding?: '\n' | '\r\n';
}

/** "1: axis (x, y, z), 2 mN m, 6 mN m s; 2: …" in SI. */
export function wheelLimitsText(w: NonNullable<ExportMeta['wheels']>): string {
  const n = w.maxTorqueNm.length;
  const parts: string[] = [];
  for (let i = 0; i < n; i++) {
    const a = [0, 1, 2].map((c) => formatNumber(w.axes[3 * i + c]!)).join(' ');
    parts.push(
      `${i + 1}: axis [${a}], torque ${formatNumber(w.maxTorqueNm[i]!)} N m, momentum ${formatNumber(w.maxMomentumNms[i]!)} N m s`,
    );
  }
  return parts.join('; ');
}

/** The whole CSV as one string (tests, the app's download); the CLI streams csvChunks instead. */
export function writeCsv(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta, options: CsvOptions = {}): Result<string> {
  return collectChunks(csvChunks(trace, scenario, meta, options));
}

/** Checks every input, then the CSV text chunk by chunk (chunks.ts). */
export function csvChunks(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta, options: CsvOptions = {}): ChunkedExport {
  const errors = checkExportInputs(trace, scenario, meta);
  if (options.lineEnding !== undefined && options.lineEnding !== '\n' && options.lineEnding !== '\r\n') {
    errors.push({ path: 'options.lineEnding', rule: 'one-of', message: 'options.lineEnding must be "\\n" or "\\r\\n"' });
  }
  if (errors.length) return fail(errors);
  const sel = selectSamples(trace, options.sampleRateHz);
  if (!sel.ok) return sel;
  const idx = sel.value;
  const cols = [...traceColumns(trace.nWheels), ...constraintColumns(meta.constraints)];
  const eol = options.lineEnding ?? '\n';

  const ctl = meta.controllerId ? `${oneLine(meta.controllerLabel)} (id ${oneLine(meta.controllerId)})` : oneLine(meta.controllerLabel);
  const head = [
    `${oneLine(meta.toolName)} ${oneLine(meta.toolVersion)} - run export (CSV)`,
    `CAUTION: ${CAUTION_TEXT}`,
    ...(meta.incomplete ? [oneLine(meta.incomplete)] : []),
    `scenario: ${oneLine(scenario.name)}; vehicle: ${oneLine(scenario.vehicleName)}; controller: ${ctl}`,
    `epoch (t = 0): ${scenario.epochUtc} (UTC)`,
    `time: ${TIME_CONVENTION}`,
    `quaternion: ${QUATERNION_CONVENTION}`,
    `frames: ${FRAME_CONVENTION}`,
    'units: SI (s, rad/s, N m, N m s) as each column name says; quaternions dimensionless; error_angle_deg in degrees',
    `wheels: ${trace.nWheels}, numbered 1..${trace.nWheels} in the order of the scenario's wheel list`,
    ...(meta.wheels ? [`wheel limits: ${wheelLimitsText(meta.wheels)}`] : []),
    options.sampleRateHz !== undefined
      ? `samples: ${idx.length} of ${trace.n} (decimated to about ${options.sampleRateHz} Hz; the last sample always kept)`
      : `samples: ${trace.n}`,
    ...(scenario.orbit ? orbitHeaderLines(scenario.orbit) : []),
    `columns: ${cols.map((c) => `${c.name} = ${c.description}${c.unit && c.unit !== 'count' ? ` [${c.unit}]` : ''}`).join('; ')}`,
  ];
  return ok(csvRows(trace, idx, cols, [...head.map((h) => `# ${h}`), cols.map((c) => c.name).join(',')], eol));
}

/** The header lines, then one row per selected sample, in chunks. */
function* csvRows(trace: RunTrace, idx: Int32Array, cols: readonly Column[], headLines: string[], eol: string): ChunkSource {
  const out = new LineChunker(eol);
  for (const h of headLines) {
    const c = out.add(h);
    if (c !== null) yield c;
  }
  const row: string[] = new Array(cols.length);
  for (let m = 0; m < idx.length; m++) {
    const k = idx[m]!;
    for (let c = 0; c < cols.length; c++) {
      const col = cols[c]!;
      const x = col.get(trace, k);
      row[c] = col.undefinedAsNaN && Number.isNaN(x) ? '' : formatNumber(x);
    }
    const chunk = out.add(row.join(','));
    if (chunk !== null) yield chunk;
  }
  const rest = out.flush();
  if (rest !== null) yield rest;
  return [];
}
