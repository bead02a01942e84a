/**
 * Engine issues as the user should read them: one message per field, named with the form's own
 * labels (fieldLabels.ts) instead of internal paths, with the rule and a suggested value; the
 * engine's further findings for the same field (a certificate lists every failing member) are
 * kept, folded under the first. Internal paths inside a message are replaced by the field they
 * name, and references to documents the user cannot see ("methods §4.2") are dropped.
 */
import type { Issue } from '../../engine/errors';
import { parsePath, getIn } from '../store/paths';
import { describeField, fieldTitle, type FieldDescription } from './fieldLabels';

export interface PresentedIssue {
  /** The issue path (one presented issue per path). */
  path: string;
  rule: string;
  /** "Vehicle › Reaction wheels › Max torque" (the raw path only when the form has no such field). */
  title: string;
  /** The field's own label ("Max torque"). */
  label: string;
  /** The message without the path, first letter capitalised. */
  text: string;
  /** "0.2" or null: a value that satisfies the field's own rule. */
  suggestion: string | null;
  /** Further findings for the same field, cleaned the same way. */
  more: string[];
  /** How many problems a capped list's summary stands for. */
  count?: number;
}

const TOP_KEYS = new Set([
  'vehicle',
  'initial',
  'targets',
  'controllers',
  'planning',
  'simulation',
  'keepOut',
  'constraints',
  'study',
  'epochUtc',
]);

/** Path-like words inside a message: `vehicle.actuation.mode`, `controllers[0]`. */
const PATH_WORD = /\b[a-z][A-Za-z0-9]*(?:\[\d+\]|\.[A-Za-z][A-Za-z0-9]*)+/g;
/** References to documents that are not part of the app. */
const DOC_REFERENCE =
  /\s*\((?:see\s+)?(?:methods|references|design)(?:\.md)?\s*§\s*[\d.]*\d[^)]*\)|\s*\b(?:methods|references)(?:\.md)?\s*§\s*[\d.]*\d/gi;

function describeOrNull(path: string, scenario: unknown): FieldDescription | null {
  try {
    return describeField(path, scenario);
  } catch {
    return null;
  }
}

function capitalise(s: string): string {
  return s.length ? s[0]!.toUpperCase() + s.slice(1) : s;
}

/** The message in the form's words: own path dropped, other paths named, document references removed. */
export function cleanMessage(message: string, path: string, scenario: unknown): string {
  let m = message;
  if (path && m.startsWith(path)) {
    const rest = m.slice(path.length);
    if (rest === '' || /^[\s:]/.test(rest)) m = rest.replace(/^:?\s*/, '');
  }
  m = m.replace(PATH_WORD, (word) => {
    const head = parsePath(word)[0];
    if (typeof head !== 'string' || !TOP_KEYS.has(head)) return word;
    const d = describeOrNull(word, scenario);
    return d ? `“${fieldTitle(d)}”` : word;
  });
  m = m.replace(DOC_REFERENCE, '');
  return capitalise(m.trim());
}

/** The text with a full stop unless it already ends a sentence. */
export function sentence(t: string): string {
  return /[.!?…]$/.test(t) ? t : `${t}.`;
}

function formatValue(v: unknown): string {
  if (typeof v === 'string') return `"${v}"`;
  if (Array.isArray(v)) return `[${v.map(formatValue).join(', ')}]`;
  return String(v);
}

/** The field's suggestion when it differs from what the field holds now. */
export function suggestionFor(d: FieldDescription | null, path: string, scenario: unknown): string | null {
  if (!d || d.suggest === undefined) return null;
  const now = path ? getIn(scenario, parsePath(path)) : undefined;
  if (JSON.stringify(now) === JSON.stringify(d.suggest)) return null;
  return formatValue(d.suggest);
}

/** One presented issue per path, in the order the paths first appear. */
export function presentIssues(issues: readonly Issue[], scenario: unknown): PresentedIssue[] {
  const byPath = new Map<string, PresentedIssue>();
  const seen = new Set<string>();
  for (const i of issues) {
    const text = cleanMessage(i.message, i.path, scenario);
    const key = `${i.path}|${text}`;
    if (seen.has(key)) continue;
    seen.add(key);
    const have = byPath.get(i.path);
    if (have) {
      have.more.push(text);
      continue;
    }
    const d = describeOrNull(i.path, scenario);
    byPath.set(i.path, {
      path: i.path,
      rule: i.rule,
      title: d ? fieldTitle(d) : i.path || 'Scenario file',
      label: d ? d.label : i.path || 'Scenario file',
      text,
      suggestion: i.rule === 'more' ? null : suggestionFor(d, i.path, scenario),
      more: [],
      count: i.count,
    });
  }
  return [...byPath.values()];
}

/** One line of plain text (notices, tooltips): "Max torque: Must be greater than zero (got 0). Suggested: 1. [positive]". */
export function issueLine(p: PresentedIssue, withTitle = true): string {
  const more = p.more.length ? ` (+${p.more.length} related finding${p.more.length === 1 ? '' : 's'})` : '';
  const sug = p.suggestion ? ` Suggested: ${p.suggestion}.` : '';
  return `${withTitle ? p.title : p.label}: ${sentence(p.text)}${more}${sug} [${p.rule}]`;
}
