/**
 * Segment boundaries for the exports: the ones the caller passes (checked), or runs of the
 * trace's `segment` channel. A derived segment ends where the next one starts, so consecutive
 * segments share their boundary instant (the AEM writer then repeats that state in both blocks).
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { ScenarioSummary } from '../pipeline/types';
import type { RunTrace } from '../sim/types';
import type { ExportSegment } from './types';

export function segmentLabel(scenario: ScenarioSummary, index: number): string {
  const t = scenario.targets[index];
  if (t) return t.label;
  return index >= scenario.targets.length ? 'After the last target' : `Segment ${index}`;
}

export function exportSegments(trace: RunTrace, scenario: ScenarioSummary, given?: readonly ExportSegment[]): Result<ExportSegment[]> {
  if (given) {
    const errors: Issue[] = [];
    given.forEach((s, i) => {
      const p = `meta.segments[${i}]`;
      if (!Number.isFinite(s.startS) || !Number.isFinite(s.stopS) || s.stopS < s.startS) {
        errors.push({ path: p, rule: 'interval', message: `${p} must have finite startS ≤ stopS (got ${s.startS}, ${s.stopS})` });
      }
      if (typeof s.label !== 'string') errors.push({ path: `${p}.label`, rule: 'type', message: `${p}.label must be a string` });
      if (i > 0 && s.startS < given[i - 1]!.stopS) {
        errors.push({
          path: `${p}.startS`,
          rule: 'ordered',
          message: `${p}.startS = ${s.startS} s is before the previous segment's stopS = ${given[i - 1]!.stopS} s`,
        });
      }
    });
    if (given.length === 0)
      errors.push({ path: 'meta.segments', rule: 'min-items', message: 'meta.segments must list at least one segment' });
    return errors.length ? fail(errors) : ok(given.map((s) => ({ ...s })));
  }
  const out: ExportSegment[] = [];
  let first = 0;
  for (let k = 1; k <= trace.n; k++) {
    if (k === trace.n || trace.segment[k] !== trace.segment[first]) {
      const idx = trace.segment[first]!;
      out.push({
        index: idx,
        label: segmentLabel(scenario, idx),
        startS: trace.t[first]!,
        stopS: k < trace.n ? trace.t[k]! : trace.t[trace.n - 1]!,
      });
      first = k;
    }
  }
  return ok(out);
}
