/** Where the CLI writes (stdout for results, stderr for progress and problems), and how it lists problems. */
import { formatIssues, type Issue } from '../../app/engine/errors';

export interface CliIo {
  out: (s: string) => void;
  err: (s: string) => void;
}

/** A titled, indented list of problems on stderr, each with its field path and rule. */
export function printIssues(io: CliIo, title: string, issues: readonly Issue[]): void {
  io.err(`${title} (${issues.length} problem${issues.length === 1 ? '' : 's'}):`);
  io.err(
    formatIssues(issues)
      .split('\n')
      .map((l) => `  ${l}`)
      .join('\n'),
  );
}
