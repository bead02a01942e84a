/**
 * Display units and number formatting (design.md: SI inside the engine; the UI shows degrees,
 * deg/s, mN·m, mN·m·s, converted here at the edge and nowhere else).
 */

/** Compact fixed or exponential notation with `digits` significant figures; '—' for none. */
export function fmt(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e6 || a < 1e-3) return v.toExponential(Math.max(0, digits - 1));
  const s = v.toPrecision(digits);
  // toPrecision can still pick exponential form (e.g. 1e+3 for 1000 at 1 digit).
  return s.includes('e') ? String(Number(s)) : String(Number(s));
}

export function pct(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—';
  return `${(fraction * 100).toFixed(fraction < 0.1 ? 1 : 0)} %`;
}

/** Text typed into a number field → the JSON value stored: a number when it parses, else the text
 *  itself, so the engine's validator reports it ("must be a number (got "1.2.3")"). */
export function parseNumberText(text: string): number | string {
  const s = text.trim().replace(/\u2212/g, '-');
  if (s === '') return text;
  const n = Number(s);
  return Number.isFinite(n) ? n : text;
}

/** How a stored JSON value shows in a number field. */
export function numberText(v: unknown): string {
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'string') return v;
  return '';
}
