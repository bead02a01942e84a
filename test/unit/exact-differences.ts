/**
 * Where two plain-data values differ bit for bit, for the fast-path tests that pin a new path to
 * the general one (noise-tape, online-study-row, studyfast-paths, metrics-online): numbers by
 * Object.is (−0 and NaN apart), arrays and typed arrays element by element, objects key by key.
 * Test plumbing (no outside source).
 */
export function differences(a: unknown, b: unknown, at = '', out: string[] = []): string[] {
  if (typeof a === 'number' || typeof b === 'number') {
    if (!Object.is(a, b)) out.push(`${at}: ${String(a)} vs ${String(b)}`);
  } else if (ArrayBuffer.isView(a) || ArrayBuffer.isView(b) || Array.isArray(a) || Array.isArray(b)) {
    const x = a as ArrayLike<unknown>,
      y = b as ArrayLike<unknown>;
    if (!x || !y || x.length !== y.length) out.push(`${at}: length ${x?.length} vs ${y?.length}`);
    else for (let i = 0; i < x.length; i++) differences(x[i], y[i], `${at}[${i}]`, out);
  } else if (a !== null && b !== null && typeof a === 'object' && typeof b === 'object') {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
    for (const k of keys) differences((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${at}.${k}`, out);
  } else if (a !== b) out.push(`${at}: ${String(a)} vs ${String(b)}`);
  return out;
}
