/**
 * Orbit test fixtures. The demo objects are INVENTED (catalogue numbers 99901/99902, element sets
 * made up for these tests); the only real element set is the published SGP4 verification case.
 */

/**
 * Vallado, Crawford, Hujsak & Kelso, "Revisiting Spacetrack Report #3", AIAA 2006-6753, test set
 * SGP4-VER.TLE, catalogue 00005 (reproduced from memory, then found identical in public test code).
 */
export const VALLADO_00005 = [
  '1 00005U 58002B   00179.78495062  .00000023  00000-0  28098-4 0  4753',
  '2 00005  34.2682 348.7242 1859667 331.7664  19.3264 10.82419157413667',
].join('\n');

/** Invented sun-synchronous-like 500 km imager "Lumen-6" element set (epoch 2026-03-20T12:00Z). */
export const DEMO_TLE_SSO = [
  'LUMEN-6 (INVENTED)',
  '1 99901U 26001A   26079.50000000  .00001000  00000-0  50000-4 0  9996',
  '2 99901  97.4000 337.5000 0012000  90.0000 270.0000 15.20000000  1008',
].join('\n');

/** Invented 51.6° LEO object (epoch 2026-03-21T06:00Z). */
export const DEMO_TLE_LEO = [
  '1 99902U 26002A   26080.25000000  .00000000  00000-0  00000-0 0  9992',
  '2 99902  51.6000 200.0000 0005000  30.0000 330.0000 15.50000000  1001',
].join('\n');

/** The TLE checksum rule written out independently of the library (for building bad lines). */
export function checksumOf(line: string): number {
  let s = 0;
  for (const ch of line.slice(0, 68)) s += ch === '-' ? 1 : /\d/.test(ch) ? Number(ch) : 0;
  return s % 10;
}

/** Replace columns [from, to] (1-based) of a line and rewrite its checksum. */
export function editColumns(line: string, from: number, to: number, text: string, fixChecksum = true): string {
  const out = line.slice(0, from - 1) + text + line.slice(to);
  return fixChecksum ? out.slice(0, 68) + String(checksumOf(out)) : out;
}
