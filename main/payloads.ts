/**
 * Shape checks on IPC arguments that only the main process needs (argument counts, absolute
 * paths). The content checks shared with the browser shell live in app/bridge/checks.ts.
 */
import { issue, type Issue } from '../app/engine/errors';

export { checkExportRequest, checkFileName, checkScenarioForSave, type ScenarioValidator } from '../app/bridge/checks';

const MAX_PATH_CHARS = 4096;

export function checkArgCount(args: readonly unknown[], expected: number): Issue[] {
  return args.length === expected
    ? []
    : [issue('', 'arity', `expected ${expected} argument${expected === 1 ? '' : 's'}, got ${args.length}`)];
}

export function checkAbsolutePath(v: unknown, isAbsolute: (p: string) => boolean, at = 'path'): Issue[] {
  if (typeof v !== 'string') return [issue(at, 'type', `${at} must be a string`)];
  const out: Issue[] = [];
  if (v.length === 0 || v.length > MAX_PATH_CHARS) out.push(issue(at, 'length', `${at} must have 1 to ${MAX_PATH_CHARS} characters`));
  if (v.includes('\0')) out.push(issue(at, 'no-nul', `${at} must not contain a NUL character`));
  if (out.length === 0 && !isAbsolute(v)) out.push(issue(at, 'absolute', `${at} must be an absolute path`));
  return out;
}
