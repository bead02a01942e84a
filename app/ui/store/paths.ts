/**
 * JSON paths in the engine's issue style (`vehicle.inertiaKgm2[1][2]`, `targets[0].attitude`) and
 * immutable get/set over plain JSON with structural sharing, so undo snapshots are cheap and
 * unchanged branches keep their identity.
 */
export type PathToken = string | number;

export function parsePath(path: string): PathToken[] {
  const out: PathToken[] = [];
  const re = /([^.[\]]+)|\[(\d+)\]/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(path)) !== null) {
    if (m[2] !== undefined) out.push(Number(m[2]));
    else out.push(m[1]!);
  }
  return out;
}

export function formatPath(tokens: readonly PathToken[]): string {
  let s = '';
  for (const t of tokens) {
    if (typeof t === 'number') s += `[${t}]`;
    else s += s === '' ? t : `.${t}`;
  }
  return s;
}

export function getIn(root: unknown, tokens: readonly PathToken[]): unknown {
  let cur: unknown = root;
  for (const t of tokens) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string | number, unknown>)[t];
  }
  return cur;
}

/**
 * A copy of `root` with the value at `tokens` replaced (or removed when `value` is undefined).
 * Missing intermediate containers are created: an array when the next token is a number.
 */
export function setIn(root: unknown, tokens: readonly PathToken[], value: unknown): unknown {
  if (tokens.length === 0) return value;
  const [head, ...rest] = tokens as readonly [PathToken, ...PathToken[]];
  const container = root !== null && typeof root === 'object' ? root : typeof head === 'number' ? [] : {};
  const child = (container as Record<string | number, unknown>)[head];
  const next = setIn(child, rest, value);
  if (Array.isArray(container)) {
    const copy = container.slice();
    const i = head as number;
    if (next === undefined && rest.length === 0) copy.splice(i, 1);
    else copy[i] = next;
    return copy;
  }
  const copy: Record<string, unknown> = { ...(container as Record<string, unknown>) };
  if (next === undefined && rest.length === 0) delete copy[head as string];
  else copy[head as string] = next;
  return copy;
}
