/**
 * Checks on option values, one helper for every numeric option so each refusal reads the same:
 * it names the option, the rule and the value given. Also the reproducible-export settings
 * (--creation-date, --message-id, SOURCE_DATE_EPOCH).
 */
import { parseIsoUtcMs } from '../../app/engine/scenario/utc';
import { isKvnText } from '../../app/engine/export/kvn';

export type OptionValue<T> = { ok: true; value: T } | { ok: false; message: string };

export interface NumberRule {
  /** Whole numbers only (written as plain decimal digits: no sign, exponent or point). */
  integer?: boolean;
  min: number;
  max: number;
  /** Unit shown after the range, e.g. "Hz". */
  unit?: string;
  /** The rule in words when the bare range would mislead, e.g. "a number from 0.001 Hz up to …". */
  text?: string;
}

const DECIMAL = /^[+]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
const DIGITS = /^\d+$/;

function ruleText(r: NumberRule): string {
  if (r.text) return r.text;
  const unit = r.unit ? ` ${r.unit}` : '';
  return `${r.integer ? 'a whole number' : 'a number'} from ${r.min} to ${r.max}${unit}`;
}

/**
 * `raw` as a number under `rule`, or a message naming `--name`. Accepts plain decimal notation only:
 * no "Infinity", "NaN", hex, empty strings or surrounding text (Number() would take several).
 */
export function numberOption(name: string, raw: string, rule: NumberRule): OptionValue<number> {
  const refuse = (): OptionValue<number> => ({
    ok: false,
    message: `--${name} must be ${ruleText(rule)} (got ${JSON.stringify(raw.length > 40 ? raw.slice(0, 40) + '…' : raw)})`,
  });
  const s = raw.trim();
  if (!(rule.integer ? DIGITS : DECIMAL).test(s)) return refuse();
  const v = Number(s);
  if (!Number.isFinite(v) || v < rule.min || v > rule.max) return refuse();
  return { ok: true, value: v };
}

/** Optional numeric options of a command: undefined when absent, every refusal collected. */
export function numberOptions<K extends string>(
  values: Readonly<Record<string, string>>,
  rules: Readonly<Record<K, NumberRule>>,
): { ok: true; values: Partial<Record<K, number>> } | { ok: false; messages: string[] } {
  const out: Partial<Record<K, number>> = {};
  const messages: string[] = [];
  for (const name of Object.keys(rules) as K[]) {
    const raw = values[name];
    if (raw === undefined) continue;
    const r = numberOption(name, raw, rules[name]);
    if (r.ok) out[name] = r.value;
    else messages.push(r.message);
  }
  return messages.length ? { ok: false, messages } : { ok: true, values: out };
}

/** Export sample rate: at least one line per 1000 s; the upper end is the scenario's control rate. */
const MIN_EXPORT_RATE_HZ = 1e-3;
/** Checked before the scenario is loaded; its own control rate (compute.ts) is the real limit. */
export const EXPORT_RATE_RULE: NumberRule = {
  min: MIN_EXPORT_RATE_HZ,
  max: 1e6,
  text: `a number of samples per second from ${MIN_EXPORT_RATE_HZ} Hz up to the scenario's control rate`,
};

export const STUDY_LIMITS = {
  runs: { integer: true, min: 1, max: 10_000_000 },
  workers: { integer: true, min: 1, max: 64 },
  seed: { integer: true, min: 0, max: 4294967295 },
  case: { integer: true, min: 0, max: 0x0fffffff },
} as const satisfies Record<string, NumberRule>;

/** The AEM header fields that otherwise depend on the clock: CREATION_DATE and MESSAGE_ID. */
export interface ExportStamp {
  creationDateUtc?: string;
  messageId?: string;
}

/**
 * --creation-date (ISO 8601 UTC, `YYYY-MM-DDThh:mm:ss[.sss]Z`), --message-id (KVN text: letters,
 * digits and _-.:+/ space, one case, at most 64 characters) and, when --creation-date is absent,
 * SOURCE_DATE_EPOCH (reproducible-builds.org: whole seconds since 1970-01-01T00:00:00Z as decimal
 * digits; a malformed value is an error, as the specification asks).
 */
export function exportStamp(
  values: Readonly<Record<string, string>>,
  env: Readonly<Record<string, string | undefined>>,
): OptionValue<ExportStamp> {
  const out: ExportStamp = {};
  const messages: string[] = [];
  const date = values['creation-date'];
  if (date !== undefined) {
    if (parseIsoUtcMs(date) === null)
      messages.push(`--creation-date must be an ISO 8601 UTC time like 2030-03-13T08:00:00Z (got ${JSON.stringify(date)})`);
    else out.creationDateUtc = date;
  } else if (env.SOURCE_DATE_EPOCH !== undefined && env.SOURCE_DATE_EPOCH !== '') {
    // Empty counts as unset, as build tools commonly treat it.
    const raw = env.SOURCE_DATE_EPOCH;
    const seconds = DIGITS.test(raw) ? Number(raw) : NaN;
    // Year 9999 is the last one ISO 8601 writes with four digits.
    if (!Number.isSafeInteger(seconds) || seconds > 253402300799)
      messages.push(`SOURCE_DATE_EPOCH must be whole seconds since 1970-01-01T00:00:00Z, written as digits (got ${JSON.stringify(raw)})`);
    else out.creationDateUtc = new Date(seconds * 1000).toISOString().replace(/\.\d{3}Z$/, 'Z');
  }
  const id = values['message-id'];
  if (id !== undefined) {
    if (id.length > 64 || id !== id.trim() || !isKvnText(id))
      messages.push(
        `--message-id must be 1 to 64 characters of letters, digits, "_", "-", ".", ":", "+", "/" or inner spaces, all upper or all lower case (got ${JSON.stringify(id.slice(0, 70))})`,
      );
    else out.messageId = id;
  }
  return messages.length ? { ok: false, message: messages.join('\n') } : { ok: true, value: out };
}
