/**
 * Issues beside a field or at the top of a section: one line per field in the form's words
 * (present.ts), the rule, a suggested value, and the engine's further findings for the same field
 * folded under a "related findings" toggle.
 */
import { useMemo } from 'react';
import type { Issue } from '../../engine/errors';
import { useAppState } from '../context';
import { presentIssues, sentence, type PresentedIssue } from './present';

function Line({ p, kind, full }: { p: PresentedIssue; kind: 'error' | 'warning'; full: boolean }) {
  return (
    <div className={`issue ${kind}`} data-rule={p.rule} data-path={p.path} role={kind === 'error' ? 'alert' : undefined}>
      <span className="issue-field">{full ? p.title : p.label}:</span> {sentence(p.text)}
      {p.suggestion && <span className="issue-suggest"> Suggested: {p.suggestion}.</span>}
      <span className="rule"> [{p.rule}]</span>
      {p.more.length > 0 && (
        <details className="issue-more">
          <summary>
            {p.more.length} related finding{p.more.length === 1 ? '' : 's'} for this field
          </summary>
          <ul>
            {p.more.map((m, k) => (
              <li key={k}>{sentence(m)}</li>
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}

/** `full` names each field with its sections ("Vehicle › Reaction wheels › Max torque"); else its label only. */
export function IssueList({
  errors,
  warnings = [],
  full = false,
}: {
  errors: readonly Issue[];
  warnings?: readonly Issue[];
  full?: boolean;
}) {
  const scenario = useAppState((s) => s.scenario);
  const e = useMemo(() => presentIssues(errors, scenario), [errors, scenario]);
  const w = useMemo(() => presentIssues(warnings, scenario), [warnings, scenario]);
  if (e.length === 0 && w.length === 0) return null;
  return (
    <div className="field-issues">
      {e.map((p) => (
        <Line key={`e|${p.path}`} p={p} kind="error" full={full} />
      ))}
      {w.map((p) => (
        <Line key={`w|${p.path}`} p={p} kind="warning" full={full} />
      ))}
    </div>
  );
}
