/**
 * Where the CLI writes (stdout for results, stderr for progress and problems), what else a command
 * may use from its surroundings, and how problems are listed.
 */
import { formatIssues, type Issue } from '../../app/engine/errors';
import type { Computer } from './compute';

export interface CliIo {
  out: (s: string) => void;
  err: (s: string) => void;
}

/** A command's surroundings; runCli fills what the caller leaves out (see index.ts). */
export interface CliContext {
  io: CliIo;
  /** Environment variables read: SOURCE_DATE_EPOCH, SLEWSMITH_DEBUG. */
  env: Readonly<Record<string, string | undefined>>;
  /** Where fly and compare simulate: inline, or in a worker thread (bin/slewsmith.mjs). */
  compute: Computer;
  /** Calls `handler` on Ctrl-C until the returned function is called. */
  onInterrupt(handler: () => void): () => void;
}

/** At most this many problems are listed; the rest are counted (a file can hold a million). */
export const MAX_LISTED_ISSUES = 40;

/** A titled, indented list of problems on stderr, each with its field path and rule. */
export function printIssues(io: CliIo, title: string, all: readonly Issue[]): void {
  // The engine caps long lists with one summary issue that counts the rest.
  const summary = all.at(-1)?.rule === 'more' ? all.at(-1)! : null;
  const issues = summary ? all.slice(0, -1) : all;
  const total = issues.length + (summary?.count ?? 0);
  io.err(`${title} (${total} problem${total === 1 ? '' : 's'}):`);
  const shown = issues.slice(0, MAX_LISTED_ISSUES);
  // One line per problem, however long or multi-line a message is.
  const lines = formatIssues(shown.map((i) => ({ ...i, path: oneLine(i.path, 200), message: oneLine(i.message, 400) }))).split('\n');
  const rest = total - shown.length;
  if (rest > 0) lines.push(`… and ${rest} more problem${rest === 1 ? '' : 's'}`);
  io.err(lines.map((l) => `  ${l}`).join('\n'));
}

/** One stderr line per warning: the field path, then the message (the path once, when the message already starts with it). */
export function printWarnings(io: CliIo, warnings: readonly Issue[]): void {
  for (const w of warnings) {
    const m = oneLine(w.message, 400);
    io.err(`warning: ${w.path && !m.startsWith(`${w.path}:`) ? `${w.path}: ${m}` : m}`);
  }
}

/** Newlines folded and the length capped, for messages that come from outside the CLI. */
export function oneLine(s: string, max = 300): string {
  const t = s.replace(/\s*[\r\n]+\s*/g, ' ').trim();
  return t.length > max ? `${t.slice(0, max - 1)}…` : t;
}
