/**
 * Checks on what crosses the bridge, shared by both shells (the desktop main process and the
 * browser fallback). A compromised or buggy renderer is assumed on the desktop: every field is
 * checked for type, size and shape, and every problem is reported together (Issue: path, rule,
 * message). Pure TypeScript: no Node, no DOM.
 */
import { issue, type Issue, type Result } from '../engine/errors';
import type { ExportRequest } from './api';
import { scenarioDocumentFromBytes } from './scenario-bytes';

/** Checks a scenario's JSON; the real one is validateScenario from app/engine/scenario. */
export type ScenarioValidator = (json: unknown) => Result<unknown>;

const MAX_FILE_NAME_CHARS = 200;
export const UNTITLED_SCENARIO = 'untitled.scenario.json';

/** Reserved on Windows whatever the extension; refusing them everywhere keeps files portable. */
const WINDOWS_RESERVED = /^(con|prn|aux|nul|com[0-9]|lpt[0-9])(\..*)?$/i;

/** A bare file name: no folders, no control or reserved characters, not a device name. */
export function checkFileName(v: unknown, at: string): Issue[] {
  if (typeof v !== 'string') return [issue(at, 'type', `${at} must be a string`)];
  const out: Issue[] = [];
  if (v.trim().length === 0 || v.length > MAX_FILE_NAME_CHARS)
    out.push(issue(at, 'length', `${at} must have 1 to ${MAX_FILE_NAME_CHARS} characters`));
  if (/[/\\]/.test(v)) out.push(issue(at, 'bare-name', `${at} must be a file name without folders`));
  // eslint-disable-next-line no-control-regex -- control characters are exactly what this rejects
  if (/[\u0000-\u001f\u007f<>:"|?*]/.test(v)) out.push(issue(at, 'characters', `${at} contains a character not allowed in file names`));
  if (/^\.+$/.test(v)) out.push(issue(at, 'bare-name', `${at} must name a file`));
  if (WINDOWS_RESERVED.test(v)) out.push(issue(at, 'reserved', `${at} is a reserved device name on Windows`));
  if (/[. ]$/.test(v)) out.push(issue(at, 'trailing', `${at} must not end with a dot or a space`));
  return out;
}

/** A name typed without an extension gets `.json`; any other extension is the user's choice. */
export function withJsonExtension(name: string): string {
  return /\.[^./\\]+$/.test(name) ? name : `${name}.json`;
}

/** UTF-8 size of a string without encoding it (exports can be hundreds of megabytes). */
export function utf8ByteLength(s: string): number {
  let n = 0;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c < 0x80) n += 1;
    else if (c < 0x800) n += 2;
    else if (c >= 0xd800 && c <= 0xdbff && i + 1 < s.length && (s.charCodeAt(i + 1) & 0xfc00) === 0xdc00) {
      n += 4; // a surrogate pair is one 4-byte code point
      i++;
    } else n += 3; // the rest of the BMP, and lone surrogates (written as U+FFFD)
  }
  return n;
}

export function contentByteLength(content: string | Uint8Array): number {
  return typeof content === 'string' ? utf8ByteLength(content) : content.byteLength;
}

export function checkExportRequest(v: unknown, maxBytes: number): Result<ExportRequest> {
  if (typeof v !== 'object' || v === null || Array.isArray(v))
    return { ok: false, errors: [issue('', 'type', 'the export request must be an object with suggestedName and content')], warnings: [] };
  const r = v as Record<string, unknown>;
  const errors: Issue[] = [];
  for (const key of Object.keys(r)) {
    if (key !== 'suggestedName' && key !== 'content')
      errors.push(issue(key, 'unknown-field', `${key} is not a field of an export request`));
  }
  errors.push(...checkFileName(r.suggestedName, 'suggestedName'));
  const content = r.content;
  if (typeof content !== 'string' && !(content instanceof Uint8Array)) {
    errors.push(issue('content', 'type', 'content must be a string or a Uint8Array'));
  } else {
    const n = contentByteLength(content);
    if (n > maxBytes) errors.push(issue('content', 'max-size', `content must be at most ${maxBytes} bytes (got ${n})`));
  }
  if (errors.length > 0) return { ok: false, errors, warnings: [] };
  return { ok: true, value: { suggestedName: r.suggestedName as string, content: content as string | Uint8Array }, warnings: [] };
}

/**
 * The scenario as the text to write: validated, then serialised (the size limit applies to that
 * text). Structured clone carries cycles across IPC and JSON cannot, so a failed JSON.stringify
 * is an issue too.
 */
export function checkScenarioForSave(v: unknown, validate: ScenarioValidator, maxBytes: number): Result<{ text: string }> {
  const r = validate(v);
  if (!r.ok) return { ok: false, errors: r.errors, warnings: r.warnings };
  let text: string;
  try {
    text = JSON.stringify(v, null, 2) + '\n';
  } catch (e) {
    return {
      ok: false,
      errors: [issue('', 'serialisable', `the scenario cannot be written as JSON: ${(e as Error).message}`)],
      warnings: r.warnings,
    };
  }
  const n = utf8ByteLength(text);
  if (n > maxBytes)
    return {
      ok: false,
      errors: [issue('', 'max-size', `the scenario file would be ${n} bytes; at most ${maxBytes} are allowed`)],
      warnings: r.warnings,
    };
  return { ok: true, value: { text }, warnings: r.warnings };
}

/** A scenario file's bytes (size, UTF-8, JSON object), then the validator; every outcome is a result. */
export function parseScenarioBytes(bytes: Uint8Array, validate: ScenarioValidator, maxBytes: number): Result<unknown> {
  const doc = scenarioDocumentFromBytes(bytes, maxBytes);
  if (!doc.ok) return doc;
  return validated(doc.value.json, validate);
}

function validated(json: unknown, validate: ScenarioValidator): Result<unknown> {
  const v = validate(json);
  return v.ok ? { ok: true, value: json, warnings: v.warnings } : v;
}
