/** A run's warnings, folded under one line ("3 warnings from the study"), each with its field path. */
import type { Issue } from '../../engine/errors';

export function RunWarnings({ warnings, from }: { warnings: readonly Issue[]; from: string }) {
  if (warnings.length === 0) return null;
  return (
    <details className="run-warnings">
      <summary>
        {warnings.length} warning{warnings.length === 1 ? '' : 's'} from {from}
      </summary>
      <ul>
        {warnings.map((i) => (
          <li key={`${i.path}|${i.rule}`}>
            <code>{i.path}</code> {i.message}
          </li>
        ))}
      </ul>
    </details>
  );
}
