/**
 * The top bar's Study button, apart from the workspace so that the top bar does not pull the
 * workspace (and three.js, through the outcome map) into the first chunk the window loads.
 */
import { useSweepState } from './sweepRegistry';
import { useStudySession, useStudyState } from './registry';

/** The top bar's entry point: opens and closes the study view, with the progress while it runs. */
export function StudyToggle() {
  const session = useStudySession();
  const open = useStudyState((s) => s.open);
  const phase = useStudyState((s) => s.phase);
  const p = useStudyState((s) => s.progress);
  const active = phase === 'starting' || phase === 'running' || phase === 'cancelling';
  const sweepPct = useSweepState((s) =>
    s.progress && (s.phase === 'starting' || s.phase === 'running' || s.phase === 'cancelling')
      ? Math.floor((100 * s.progress.cellsDone) / Math.max(1, s.progress.cellsTotal))
      : null,
  );
  return (
    <button
      className={`toolbar-button study-toggle ${open ? 'on' : ''}`}
      aria-pressed={open}
      onClick={() => session.setOpen(!open)}
      title={open ? 'Back to the 3D view and plots' : 'Robustness study: many dispersed cases in workers'}
      data-testid="cmd-study"
    >
      Study{active && p ? ` ${Math.floor((100 * p.done) / Math.max(1, p.total))} %` : ''}
      {sweepPct !== null ? ` · sweep ${sweepPct} %` : ''}
    </button>
  );
}
