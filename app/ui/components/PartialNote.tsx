/**
 * The "n of m runs" note shown where an incomplete pass must not read as finished (comparison
 * table, best marks, warnings count, export): the plots already show the arrived runs.
 */
import { useAppState } from '../context';

/** `inline`: a span for a heading line (no line of its own, so nothing below it moves). */
export function PartialNote({ what, inline = false }: { what: string; inline?: boolean }) {
  const partial = useAppState((s) => s.partial);
  const running = useAppState((s) => s.pipeline.status === 'running' || s.pipeline.status === 'waiting');
  if (!partial) return null;
  const text = running
    ? `Waiting for the remaining runs (${partial.done} of ${partial.total} runs done)`
    : `Incomplete pass: ${partial.done} of ${partial.total} runs (the rest was not flown)`;
  const Tag = inline ? 'span' : 'div';
  return (
    <Tag className="muted partial-note" data-testid={`partial-note-${what}`} role="status">
      {text}
    </Tag>
  );
}
