/**
 * Form fields bound to a scenario path. Each shows its unit, writes through the store (one undo
 * step per field burst), and shows the engine's messages for its path beside it.
 *
 * Number fields keep the text being typed as a local draft and store a number when the text
 * parses, otherwise the text itself, so the engine's validator names the problem. A change from
 * outside (undo, open) replaces the draft.
 */
import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import type { Issue } from '../../engine/errors';
import { useApp, useIssuesAt, useScenarioValue } from '../context';
import { numberText, parseNumberText } from '../format';
import { IssueList } from '../issues/IssueList';

export function IssueText({ errors, warnings = [] }: { errors: readonly Issue[]; warnings?: readonly Issue[] }) {
  return <IssueList errors={errors} warnings={warnings} />;
}

interface NumberInputProps {
  path: string;
  /** Accessible name when there is no visible label (matrix cells). */
  ariaLabel?: string;
  title?: string;
  step?: number;
  className?: string;
  /** Show issues beside the input (default true; matrix editors list them once below). */
  showIssues?: boolean;
  /** Also write the value here in the same undo step (symmetric matrix entries). */
  mirrorPath?: string;
  /** Mark invalid for a problem of the enclosing group (e.g. the matrix is not positive definite). */
  groupInvalid?: boolean;
}

/** A bare number input bound to `path`. */
export function NumberInput({
  path,
  ariaLabel,
  title,
  step,
  className,
  showIssues = true,
  mirrorPath,
  groupInvalid = false,
}: NumberInputProps) {
  const app = useApp();
  const value = useScenarioValue(path);
  const { errors, warnings } = useIssuesAt(path);
  const [draft, setDraft] = useState<string | null>(null);
  const committed = useRef<unknown>(value);

  useEffect(() => {
    // The value moved without us (undo, redo, open): drop the draft.
    if (!Object.is(value, committed.current)) {
      committed.current = value;
      setDraft(null);
    }
  }, [value]);

  const text = draft ?? numberText(value);
  const invalid = errors.length > 0 || groupInvalid;
  const write = (v: unknown) => {
    committed.current = v;
    if (mirrorPath)
      app.store.editMany(
        [
          [path, v],
          [mirrorPath, v],
        ],
        { coalesceKey: path },
      );
    else app.store.edit(path, v);
  };
  return (
    <>
      <input
        className={`num ${invalid ? 'invalid' : ''} ${className ?? ''}`}
        type="text"
        inputMode="decimal"
        spellCheck={false}
        aria-label={ariaLabel}
        aria-invalid={invalid}
        title={title}
        data-path={path}
        value={text}
        onChange={(e) => {
          const t = e.target.value;
          setDraft(t);
          write(parseNumberText(t));
        }}
        onBlur={() => setDraft(null)}
        onKeyDown={(e) => {
          if ((e.key === 'ArrowUp' || e.key === 'ArrowDown') && typeof value === 'number' && step) {
            e.preventDefault();
            setDraft(null);
            write(Number((value + (e.key === 'ArrowUp' ? step : -step)).toPrecision(12)));
          }
        }}
      />
      {showIssues && <IssueText errors={errors} warnings={warnings} />}
    </>
  );
}

interface FieldRowProps {
  label: string;
  unit?: string;
  title?: string;
  children: ReactNode;
}

/** Label | control | unit, one row of a form grid. */
export function FieldRow({ label, unit, title, children }: FieldRowProps) {
  return (
    <div className="field-row" title={title}>
      <span className="field-label">{label}</span>
      <span className="field-control">{children}</span>
      <span className="field-unit">{unit ?? ''}</span>
    </div>
  );
}

export function NumberField(props: { path: string; label: string; unit?: string; title?: string; step?: number }) {
  const { errors, warnings } = useIssuesAt(props.path);
  return (
    <div className="field">
      <FieldRow label={props.label} unit={props.unit} title={props.title}>
        <NumberInput path={props.path} ariaLabel={props.label} step={props.step} showIssues={false} />
      </FieldRow>
      <IssueText errors={errors} warnings={warnings} />
    </div>
  );
}

/**
 * Three numbers (a vector). `stacked` puts the inputs on their own full-width line under the
 * label, for vectors whose components need more digits than a narrow column shows.
 */
export function VectorField(props: {
  path: string;
  label: string;
  unit?: string;
  title?: string;
  names?: [string, string, string];
  stacked?: boolean;
}) {
  const names = props.names ?? ['x', 'y', 'z'];
  const own = useIssuesAt(props.path);
  const e0 = useIssuesAt(`${props.path}[0]`);
  const e1 = useIssuesAt(`${props.path}[1]`);
  const e2 = useIssuesAt(`${props.path}[2]`);
  const inputs = (
    <span className="vec">
      {[0, 1, 2].map((k) => (
        <NumberInput key={k} path={`${props.path}[${k}]`} ariaLabel={`${props.label} ${names[k]}`} showIssues={false} />
      ))}
    </span>
  );
  return (
    <div className={`field ${props.stacked ? 'stacked' : ''}`}>
      {props.stacked ? (
        <div className="stacked-field" title={props.title}>
          <span className="field-label">{props.label}</span>
          <span className="field-unit">{props.unit ?? ''}</span>
          <span className="stacked-inputs">{inputs}</span>
        </div>
      ) : (
        <FieldRow label={props.label} unit={props.unit} title={props.title}>
          {inputs}
        </FieldRow>
      )}
      <IssueText
        errors={[...own.errors, ...e0.errors, ...e1.errors, ...e2.errors]}
        warnings={[...own.warnings, ...e0.warnings, ...e1.warnings, ...e2.warnings]}
      />
    </div>
  );
}

export function TextField(props: { path: string; label: string; title?: string }) {
  const app = useApp();
  const value = useScenarioValue(props.path);
  const { errors, warnings } = useIssuesAt(props.path);
  return (
    <div className="field">
      <FieldRow label={props.label} title={props.title}>
        <input
          className={`text ${errors.length ? 'invalid' : ''}`}
          type="text"
          aria-label={props.label}
          data-path={props.path}
          value={typeof value === 'string' ? value : ''}
          onChange={(e) => app.store.edit(props.path, e.target.value)}
        />
      </FieldRow>
      <IssueText errors={errors} warnings={warnings} />
    </div>
  );
}

export interface Choice {
  value: string;
  label: string;
}

/** A select bound to a path, or driven by `onChoose` for compound changes (presets, forms). */
export function SelectField(props: {
  label: string;
  choices: readonly Choice[];
  path?: string;
  value?: string;
  onChoose?: (v: string) => void;
  title?: string;
  unit?: string;
}) {
  const app = useApp();
  const id = useId();
  const stored = useScenarioValue(props.path ?? '');
  const value = props.value ?? (typeof stored === 'string' ? stored : '');
  const { errors, warnings } = useIssuesAt(props.path ?? '\u0000');
  return (
    <div className="field">
      <FieldRow label={props.label} title={props.title} unit={props.unit}>
        <select
          id={id}
          aria-label={props.label}
          data-path={props.path}
          value={value}
          onChange={(e) => {
            if (props.onChoose) props.onChoose(e.target.value);
            else if (props.path) app.store.edit(props.path, e.target.value, { coalesceKey: null });
          }}
        >
          {props.choices.map((c) => (
            <option key={c.value} value={c.value}>
              {c.label}
            </option>
          ))}
        </select>
      </FieldRow>
      <IssueText errors={errors} warnings={warnings} />
    </div>
  );
}

/** A collapsible section of the left column. */
export function Section(props: { title: string; children: ReactNode; open?: boolean; badge?: ReactNode; testId?: string }) {
  return (
    <details className="section" open={props.open ?? true} data-testid={props.testId}>
      <summary>
        <span className="section-title">{props.title}</span>
        {props.badge}
      </summary>
      <div className="section-body">{props.children}</div>
    </details>
  );
}
