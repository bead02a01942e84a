/**
 * Checks every writer runs before writing anything: the trace (finite, ordered, unit
 * quaternions), its wheel count against the scenario's, and the metadata strings.
 */
import type { Issue } from '../errors';
import type { ScenarioSummary } from '../pipeline/types';
import type { RunTrace } from '../sim/types';
import { validateTraceForExport } from './trace-check';
import type { ExportMeta } from './types';

export function checkExportInputs(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta): Issue[] {
  const errors: Issue[] = [];
  const t = validateTraceForExport(trace);
  if (!t.ok) errors.push(...t.errors);
  else if (trace.nWheels !== scenario.wheelCount) {
    errors.push({
      path: 'trace.nWheels',
      rule: 'wheel-count',
      message: `trace.nWheels = ${trace.nWheels} but the scenario's vehicle has ${scenario.wheelCount} wheels`,
    });
  }
  for (const k of ['toolName', 'toolVersion', 'controllerLabel'] as const) {
    const v = meta?.[k];
    if (typeof v !== 'string' || v.trim() === '')
      errors.push({ path: `meta.${k}`, rule: 'required', message: `meta.${k} must be a non-empty string` });
  }
  if (meta?.controllerId !== undefined && typeof meta.controllerId !== 'string') {
    errors.push({ path: 'meta.controllerId', rule: 'type', message: 'meta.controllerId must be a string when given' });
  }
  return errors;
}

/** One line of free text: no line breaks, no control characters. */
export function oneLine(s: string): string {
  // eslint-disable-next-line no-control-regex -- control characters are exactly what this removes
  return s.replace(/[\u0000-\u001f\u007f]+/g, ' ').trim();
}
