/**
 * Form fields for the scenario's "study" block. Every edit goes through the document store (one
 * undo step per field burst, saved with the file) like the other editors (components/fields.tsx),
 * with two differences the study block needs: most of its fields are optional (an empty field
 * removes its key, and the placeholder shows the default the engine uses), and dispersion groups
 * left empty are removed, so the file keeps only what is dispersed.
 */
import { useEffect, useRef, useState } from 'react';
import type { AppStore } from '../store/document';
import { getIn, parsePath, setIn } from '../store/paths';
import { useApp, useIssuesAt, useIssuesUnder, useScenarioValue } from '../context';
import { numberText, parseNumberText } from '../format';
import { FieldRow, IssueText } from '../components/fields';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);

/** Drop keys whose value is an empty object, depth first (arrays are kept as they are). */
export function pruneEmpty(v: unknown): unknown {
  if (!isObj(v)) return v;
  const out: Obj = {};
  for (const [k, x] of Object.entries(v)) {
    const p = pruneEmpty(x);
    if (isObj(p) && Object.keys(p).length === 0) continue;
    out[k] = p;
  }
  return out;
}

/**
 * Set `path` (under "study") to `value` (undefined removes it) as one undo step that folds with
 * further edits of the same field, removing dispersion groups left empty.
 */
export function editStudy(store: AppStore, path: string, value: unknown, label?: string): void {
  const tokens = parsePath(path);
  if (tokens[0] !== 'study') throw new Error(`editStudy: ${path} is not under study`);
  const study = getIn(store.getState().scenario, ['study']);
  let next = setIn(study, tokens.slice(1), value) as Obj;
  if (isObj(next.dispersions)) {
    const d = pruneEmpty(next.dispersions) as Obj;
    next = { ...next };
    if (Object.keys(d).length === 0) delete next.dispersions;
    else next.dispersions = d;
  }
  store.edit('study', next, { coalesceKey: path, label: label ?? `Edit ${path}` });
}

/** An optional number: empty text removes the key; the placeholder says what "empty" means. */
export function OptNumberField(props: {
  path: string;
  label: string;
  unit?: string;
  placeholder?: string;
  title?: string;
  testId?: string;
}) {
  const app = useApp();
  const value = useScenarioValue(props.path);
  const { errors, warnings } = useIssuesAt(props.path);
  const [draft, setDraft] = useState<string | null>(null);
  const committed = useRef<unknown>(value);
  useEffect(() => {
    if (!Object.is(value, committed.current)) {
      committed.current = value;
      setDraft(null);
    }
  }, [value]);
  const text = draft ?? numberText(value);
  const invalid = errors.length > 0;
  return (
    <div className="field">
      <FieldRow label={props.label} unit={props.unit} title={props.title}>
        <input
          className={`num ${invalid ? 'invalid' : ''}`}
          type="text"
          inputMode="decimal"
          spellCheck={false}
          aria-label={props.label}
          aria-invalid={invalid}
          data-path={props.path}
          data-testid={props.testId}
          placeholder={props.placeholder}
          value={text}
          onChange={(e) => {
            const t = e.target.value;
            setDraft(t);
            const v = t.trim() === '' ? undefined : parseNumberText(t);
            committed.current = v;
            editStudy(app.store, props.path, v);
          }}
          onBlur={() => setDraft(null)}
        />
      </FieldRow>
      <IssueText errors={errors} warnings={warnings} />
    </div>
  );
}

/** Parse "5, 10, 20" into numbers; any token that is not a number keeps the raw text (the validator names it). */
export function parseNumberList(text: string): number[] | string | undefined {
  if (text.trim() === '') return undefined;
  const parts = text.split(/[,;\s]+/).filter((s) => s !== '');
  const nums = parts.map((p) => parseNumberText(p));
  return nums.every((n): n is number => typeof n === 'number') ? nums : text;
}

/** A list of numbers typed as text ("5, 10"); empty removes the key. */
export function NumberListField(props: { path: string; label: string; unit?: string; placeholder?: string; title?: string }) {
  const app = useApp();
  const value = useScenarioValue(props.path);
  const shown = Array.isArray(value) ? value.join(', ') : typeof value === 'string' ? value : '';
  const [draft, setDraft] = useState<string | null>(null);
  const own = useIssuesAt(props.path);
  const below = useIssuesUnder(props.path, [props.path]);
  return (
    <div className="field">
      <FieldRow label={props.label} unit={props.unit} title={props.title}>
        <input
          className={`text ${own.errors.length || below.length ? 'invalid' : ''}`}
          type="text"
          aria-label={props.label}
          data-path={props.path}
          placeholder={props.placeholder}
          value={draft ?? shown}
          onChange={(e) => {
            setDraft(e.target.value);
            editStudy(app.store, props.path, parseNumberList(e.target.value));
          }}
          onBlur={() => setDraft(null)}
        />
      </FieldRow>
      <IssueText errors={[...own.errors, ...below]} warnings={own.warnings} />
    </div>
  );
}

/** [min, max] pair with a shared default (both empty removes the key). */
export function RangeField(props: { path: string; label: string; unit?: string; defaults: [number, number]; title?: string }) {
  const app = useApp();
  const value = useScenarioValue(props.path);
  const pair = Array.isArray(value) ? value : null;
  const own = useIssuesAt(props.path);
  const e0 = useIssuesAt(`${props.path}[0]`);
  const e1 = useIssuesAt(`${props.path}[1]`);
  const [drafts, setDrafts] = useState<[string | null, string | null]>([null, null]);
  const set = (k: 0 | 1, t: string) => {
    const d: [string | null, string | null] = [...drafts] as [string | null, string | null];
    d[k] = t;
    setDrafts(d);
    const texts = [0, 1].map((i) => d[i] ?? (pair ? numberText(pair[i]) : ''));
    if (texts.every((x) => x.trim() === '')) {
      editStudy(app.store, props.path, undefined);
      return;
    }
    editStudy(
      app.store,
      props.path,
      texts.map((x, i) => (x.trim() === '' ? props.defaults[i] : parseNumberText(x))),
    );
  };
  const invalid = own.errors.length + e0.errors.length + e1.errors.length > 0;
  return (
    <div className="field">
      <FieldRow label={props.label} unit={props.unit} title={props.title}>
        <span className="vec2">
          {[0, 1].map((k) => (
            <input
              key={k}
              className={`num ${invalid ? 'invalid' : ''}`}
              type="text"
              inputMode="decimal"
              aria-label={`${props.label} ${k === 0 ? 'min' : 'max'}`}
              data-path={`${props.path}[${k}]`}
              placeholder={String(props.defaults[k])}
              value={drafts[k] ?? (pair ? numberText(pair[k]) : '')}
              onChange={(e) => set(k as 0 | 1, e.target.value)}
              onBlur={() => setDrafts([null, null])}
            />
          ))}
        </span>
      </FieldRow>
      <IssueText errors={[...own.errors, ...e0.errors, ...e1.errors]} warnings={own.warnings} />
    </div>
  );
}
