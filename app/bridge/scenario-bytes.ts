/**
 * A scenario file's bytes → its JSON document, shared by every shell that opens files (the CLI,
 * the desktop main process, the browser fallback). Pure TypeScript (TextDecoder is a global in
 * Node and in browsers); reading the bytes is the caller's job, never the engine's.
 *
 * Rules, each failure an Issue (path '' = the whole file):
 * - size: at most `maxBytes` (rule `max-size`, the limit stated in the message);
 * - encoding: UTF-8, decoded with a fatal TextDecoder (WHATWG Encoding §4.2: a fatal decoder
 *   throws instead of writing U+FFFD), so no replacement character ever reaches the parser. A
 *   leading UTF-8 byte-order mark is accepted and dropped. On failure the message names the byte
 *   offset of the first ill-formed sequence (rule `utf-8`);
 * - syntax: JSON (rule `json-syntax`);
 * - nesting: at most MAX_SCENARIO_DEPTH levels of arrays and objects (rule `max-depth`). A real
 *   scenario nests about 6 deep; JSON.parse copes with 50 000 levels, but recursive walks
 *   downstream (JSON.stringify, structured clone, validators) overflow the stack on such input;
 * - document: a JSON object; null, arrays, numbers, strings and booleans are named for what they
 *   are (rule `json-type`).
 */
import { issue, type Issue, type Result } from '../engine/errors';

/** The JSON document of a scenario file and the text it was parsed from (without a BOM). */
export interface ScenarioDocument {
  json: Record<string, unknown>;
  text: string;
}

/**
 * Offset of the first byte of the first ill-formed UTF-8 sequence, or -1 when every byte is part
 * of a well-formed sequence. The well-formed sequences are those of the Unicode Standard, Table
 * 3-7 (no overlongs, no surrogates D800–DFFF, nothing above U+10FFFF).
 */
export function firstInvalidUtf8Offset(bytes: Uint8Array): number {
  const n = bytes.length;
  let i = 0;
  while (i < n) {
    const b0 = bytes[i]!;
    if (b0 < 0x80) {
      i++;
      continue;
    }
    // Allowed range of the second byte, and how many bytes the sequence has.
    let len: number,
      lo = 0x80,
      hi = 0xbf;
    if (b0 >= 0xc2 && b0 <= 0xdf) len = 2;
    else if (b0 >= 0xe0 && b0 <= 0xef) {
      len = 3;
      if (b0 === 0xe0) lo = 0xa0;
      else if (b0 === 0xed) hi = 0x9f;
    } else if (b0 >= 0xf0 && b0 <= 0xf4) {
      len = 4;
      if (b0 === 0xf0) lo = 0x90;
      else if (b0 === 0xf4) hi = 0x8f;
    } else return i;
    if (i + len > n) return i;
    const b1 = bytes[i + 1]!;
    if (b1 < lo || b1 > hi) return i;
    for (let k = 2; k < len; k++) {
      const b = bytes[i + k]!;
      if (b < 0x80 || b > 0xbf) return i;
    }
    i += len;
  }
  return -1;
}

function hex(b: number): string {
  return `0x${b.toString(16).toUpperCase().padStart(2, '0')}`;
}

/** UTF-8 text of a file: BOM dropped, ill-formed bytes refused with their offset. */
export function decodeUtf8Strict(bytes: Uint8Array): Result<string> {
  if (bytes.length >= 2 && ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)))
    return {
      ok: false,
      errors: [issue('', 'utf-8', `the file starts with a UTF-16 byte-order mark (${hex(bytes[0])} ${hex(bytes[1])}); save it as UTF-8`)],
      warnings: [],
    };
  try {
    // ignoreBOM false: the decoder itself drops one leading UTF-8 BOM.
    const text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
    return { ok: true, value: text, warnings: [] };
  } catch {
    const at = firstInvalidUtf8Offset(bytes);
    const where =
      at < 0 ? '' : `: the first bad byte sequence starts at byte offset ${at} (${Array.from(bytes.subarray(at, at + 4), hex).join(' ')})`;
    return { ok: false, errors: [issue('', 'utf-8', `the file is not valid UTF-8${where}`)], warnings: [] };
  }
}

/** What a JSON value is, in words: "JSON null", "a JSON array of 3 items", … */
function describeJsonValue(v: unknown): string {
  if (v === null) return 'JSON null';
  if (Array.isArray(v)) return `a JSON array of ${v.length} item${v.length === 1 ? '' : 's'}`;
  if (typeof v === 'number') return `a JSON number (${v})`;
  if (typeof v === 'boolean') return `a JSON boolean (${v})`;
  if (typeof v === 'string') return `a JSON string of ${v.length} character${v.length === 1 ? '' : 's'}`;
  return 'a JSON object';
}

export const MAX_SCENARIO_DEPTH = 64;

/**
 * Deepest nesting of arrays and objects in JSON text, counted in one pass over the characters
 * (brackets inside strings do not count); stops counting once past `limit`.
 */
export function jsonNestingDepth(text: string, limit = Infinity): number {
  let depth = 0;
  let max = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c)
        i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x5b || c === 0x7b) {
      depth++;
      if (depth > max) max = depth;
      if (max > limit) return max;
    } else if (c === 0x5d || c === 0x7d) depth--;
  }
  return max;
}

/** Parses a scenario file's text; anything but a JSON object is refused and named. */
export function parseScenarioDocument(text: string): Result<ScenarioDocument> {
  if (text.trim() === '')
    return { ok: false, errors: [issue('', 'json-syntax', 'the file is empty; a scenario is a JSON object')], warnings: [] };
  if (jsonNestingDepth(text, MAX_SCENARIO_DEPTH) > MAX_SCENARIO_DEPTH)
    return {
      ok: false,
      errors: [
        issue(
          '',
          'max-depth',
          `the file nests arrays and objects more than ${MAX_SCENARIO_DEPTH} levels deep; a scenario needs fewer than 10`,
        ),
      ],
      warnings: [],
    };
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    return { ok: false, errors: [issue('', 'json-syntax', `the file is not valid JSON: ${(e as Error).message}`)], warnings: [] };
  }
  if (typeof json !== 'object' || json === null || Array.isArray(json))
    return {
      ok: false,
      errors: [issue('', 'json-type', `the file holds ${describeJsonValue(json)}; a scenario is a JSON object`)],
      warnings: [],
    };
  return { ok: true, value: { json: json as Record<string, unknown>, text }, warnings: [] };
}

/** The size rule on its own, for shells that know the size before reading (stat, File.size). */
export function checkScenarioSize(byteLength: number, maxBytes: number): Issue[] {
  if (byteLength <= maxBytes) return [];
  const mib = maxBytes / (1024 * 1024);
  const limit = Number.isInteger(mib) ? `${maxBytes} bytes (${mib} MiB)` : `${maxBytes} bytes`;
  return [issue('', 'max-size', `the file is ${byteLength} bytes; a scenario file is at most ${limit}`)];
}

/** Size, encoding, syntax and document checks on a file's bytes, in that order. */
export function scenarioDocumentFromBytes(bytes: Uint8Array, maxBytes: number): Result<ScenarioDocument> {
  const size = checkScenarioSize(bytes.byteLength, maxBytes);
  if (size.length) return { ok: false, errors: size, warnings: [] };
  const text = decodeUtf8Strict(bytes);
  if (!text.ok) return text;
  return parseScenarioDocument(text.value);
}
