/**
 * Export dialog: format, run, sample rate; writes through the engine in the export worker
 * (exportClient.ts) and saves through the bridge. While the worker writes, the dialog is closed and
 * a progress strip with Cancel stands in its place, so the window stays usable.
 */
import { useEffect, useRef, useState } from 'react';
import type { Issue } from '../../engine/errors';
import { useApp, useAppState } from '../context';
import { EXPORT_FORMATS, toolVersion, type ExportFormat } from '../exporting';
import { appExportClient, type ExportJob } from '../exportClient';
import type { ExportProgress } from '../worker/exportProtocol';
import { useStoreSlice } from '../store/hooks';
import { runName } from '../modeNames';
import { IssueText } from './fields';
import { PartialNote } from './PartialNote';
import { exportRateProblem } from '../exportRate';
import { parseNumberText } from '../format';

export function ExportDialog() {
  const app = useApp();
  const open = useStoreSlice(app.ui, (u) => u.exportOpen);
  const output = useAppState((s) => s.output);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  const selected = useAppState((s) => s.selectedRunKeys);
  // A partial pass mixes new runs with the previous pass's: nothing is exported until it is complete.
  const partial = useAppState((s) => s.partial !== null);
  const [format, setFormat] = useState<ExportFormat>('aem');
  const [runKey, setRunKey] = useState('');
  const [rateText, setRateText] = useState('');
  const [issues, setIssues] = useState<Issue[]>([]);
  const [busy, setBusy] = useState(false);
  const [progress, setProgress] = useState<ExportProgress | null>(null);
  const [what, setWhat] = useState('');
  const job = useRef<ExportJob | null>(null);
  const dialog = useRef<HTMLDialogElement>(null);

  useEffect(() => {
    const d = dialog.current;
    if (!d) return;
    if (open && !d.open) {
      d.showModal();
      if (output && !output.runs.some((r) => r.key === runKey)) setRunKey(selected[0] ?? output.runs[0]?.key ?? '');
    } else if (!open && d.open) d.close();
  }, [open, output, runKey, selected]);

  const close = () => app.ui.setState({ exportOpen: false });
  // Closed by the user: the next opening starts without the last export's problems.
  const dismiss = () => {
    setIssues([]);
    close();
  };
  const rateProblem = exportRateProblem(rateText, output ? output.scenario.file.vehicle.controlRateHz : Infinity);
  const rate = rateText.trim() === '' || rateProblem ? null : (parseNumberText(rateText) as number);

  const doExport = async () => {
    if (!output || rateProblem || partial || busy) return;
    const run = output.runs.find((x) => x.key === runKey);
    setBusy(true);
    setIssues([]);
    setWhat(run ? runName(run) : runKey);
    setProgress(null);
    // The dialog closes while the worker writes: the progress strip below has the Cancel.
    close();
    const j = appExportClient().start(output, { format, runKey, sampleRateHz: rate }, { toolVersion: toolVersion() }, setProgress);
    job.current = j;
    try {
      const o = await j.done;
      if (o.status === 'cancelled') {
        app.notify('Export cancelled');
        return;
      }
      if (o.status === 'crash') {
        app.notify(`The export stopped: ${o.message}`, 'error');
        return;
      }
      const r = o.result;
      if (!r.ok) {
        setIssues(r.errors);
        app.ui.setState({ exportOpen: true });
        return;
      }
      const res = await app.bridge.exportFile({ suggestedName: r.value.name, content: r.value.content });
      if (res.status === 'exported') app.notify(`Exported ${res.file.name}`);
      else if (res.status === 'invalid' || res.status === 'failed') {
        setIssues(res.status === 'invalid' ? res.errors : [{ path: '', rule: 'write', message: res.message }]);
        app.ui.setState({ exportOpen: true });
      }
    } finally {
      if (job.current === j) job.current = null;
      setBusy(false);
      setProgress(null);
    }
  };

  return (
    <>
      {busy && (
        <div className="export-progress" role="status" data-testid="export-progress">
          <span>
            Exporting {what}: {progressText(progress)}
          </span>
          <progress max={1} value={progress?.phase === 'fly' ? progress.done / progress.total : undefined} aria-label="export progress" />
          <button onClick={() => job.current?.cancel()} data-testid="export-cancel">
            Cancel
          </button>
        </div>
      )}
      <dialog ref={dialog} className="export-dialog" onClose={dismiss} onCancel={dismiss} data-testid="export-dialog">
        <h2>Export a run</h2>
        {!output ? (
          <p>Nothing to export yet: no run has been computed.</p>
        ) : (
          <>
            <PartialNote what="export" />
            {!current && <p className="issue warning">The scenario changed since this run; the export is of the last computed run.</p>}
            <fieldset>
              <legend>Format</legend>
              {EXPORT_FORMATS.map((f) => (
                <label key={f.value} className="radio">
                  <input
                    type="radio"
                    name="export-format"
                    value={f.value}
                    checked={format === f.value}
                    onChange={() => setFormat(f.value)}
                    data-testid={`format-${f.value}`}
                  />
                  <strong>{f.label}</strong> <span className="muted">{f.note}</span>
                </label>
              ))}
            </fieldset>
            <div className="field-row">
              <span className="field-label">Run</span>
              <span className="field-control">
                <select value={runKey} onChange={(e) => setRunKey(e.target.value)} aria-label="run to export" data-testid="export-run">
                  {output.runs.map((r) => (
                    <option key={r.key} value={r.key}>
                      {runName(r)}
                    </option>
                  ))}
                </select>
              </span>
              <span className="field-unit" />
            </div>
            <div className="field-row">
              <span className="field-label">Sample rate</span>
              <span className="field-control">
                <input
                  className={`num ${rateProblem ? 'invalid' : ''}`}
                  aria-invalid={rateProblem !== null}
                  aria-describedby={rateProblem ? 'export-rate-problem' : undefined}
                  type="text"
                  inputMode="decimal"
                  placeholder="every sample"
                  value={rateText}
                  onChange={(e) => setRateText(e.target.value)}
                  aria-label="export sample rate"
                  data-testid="export-rate"
                />
              </span>
              <span className="field-unit">Hz</span>
            </div>
            {rateProblem && (
              <div className="issue error" id="export-rate-problem" data-testid="export-rate-problem" role="alert">
                {rateProblem}
              </div>
            )}
            <IssueText errors={issues} />
          </>
        )}
        <div className="dialog-buttons">
          <button onClick={dismiss}>Cancel</button>
          <button
            className="primary"
            disabled={!output || busy || !runKey || rateProblem !== null || partial}
            title={rateProblem ?? undefined}
            onClick={() => void doExport()}
            data-testid="export-go"
          >
            Export…
          </button>
        </div>
      </dialog>
    </>
  );
}

function progressText(p: ExportProgress | null): string {
  if (!p) return 'starting…';
  if (p.phase === 'write') return 'writing the file…';
  return `flying the run again at full rate, ${Math.floor((100 * p.done) / p.total)} %`;
}
