/**
 * Validation results shared by every engine constructor and validator.
 *
 * Expected failures are data, not exceptions: a validator collects every problem it finds and
 * returns them together, each naming the field (a JSON-style path such as `vehicle.inertia[1][2]`)
 * and the rule it breaks.
 */

export interface Issue {
  /** Where the problem is, e.g. `wheels.axes[2]` or `targets[0].quaternion`. */
  path: string;
  /** Short machine-readable rule name, e.g. `positive-definite`, `finite`, `unit-norm`. */
  rule: string;
  /** A sentence for a person: names the field, the rule and, where useful, the value found. */
  message: string;
  /** Only on the summary issue of a capped list (rule 'more'): how many problems it stands for. */
  count?: number;
}

export type Result<T> = { ok: true; value: T; warnings: Issue[] } | { ok: false; errors: Issue[]; warnings: Issue[] };

export function ok<T>(value: T, warnings: Issue[] = []): Result<T> {
  return { ok: true, value, warnings };
}

export function fail<T>(errors: Issue[], warnings: Issue[] = []): Result<T> {
  return { ok: false, errors, warnings };
}

export function issue(path: string, rule: string, message: string): Issue {
  return { path, rule, message };
}

/** One line per issue, for CLI output and thrown errors. */
export function formatIssues(issues: readonly Issue[]): string {
  return issues.map((i) => `${i.path || '(root)'}: ${i.message} [${i.rule}]`).join('\n');
}

/** Thrown only where a programming error (not user input) makes continuing meaningless. */
export class EngineInputError extends Error {
  readonly issues: Issue[];
  constructor(issues: Issue[]) {
    super(formatIssues(issues));
    this.name = 'EngineInputError';
    this.issues = issues;
  }
}

/** Unwrap a result or throw an EngineInputError listing every problem. */
export function unwrap<T>(r: Result<T>): T {
  if (r.ok) return r.value;
  throw new EngineInputError(r.errors);
}

/** Collects issues with a path prefix; small helper for validators. */
export class IssueList {
  readonly items: Issue[] = [];
  add(path: string, rule: string, message: string): void {
    this.items.push({ path, rule, message });
  }
  /** Check that a value is a finite number; returns true when it is. */
  finite(path: string, v: unknown): v is number {
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      this.add(path, 'finite', `${path} must be a finite number (got ${describe(v)})`);
      return false;
    }
    return true;
  }
  /** Finite and > 0. */
  positive(path: string, v: unknown): v is number {
    if (!this.finite(path, v)) return false;
    if (v <= 0) {
      this.add(path, 'positive', `${path} must be greater than zero (got ${v})`);
      return false;
    }
    return true;
  }
  get empty(): boolean {
    return this.items.length === 0;
  }
}

export function describe(v: unknown): string {
  if (typeof v === 'number') return String(v);
  if (v === null) return 'null';
  if (v === undefined) return 'nothing';
  if (typeof v === 'string') return JSON.stringify(v.length > 40 ? v.slice(0, 40) + '…' : v);
  if (Array.isArray(v)) return `an array of length ${v.length}`;
  return typeof v;
}

/** Drop repeated (path, rule) pairs, keeping the first message of each. */
export function dedupeIssues(list: readonly Issue[]): Issue[] {
  const seen = new Set<string>();
  return list.filter((i) => {
    const k = `${i.path}|${i.rule}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}
