/** Export dialog: format, run, sample rate; writes through the engine and saves through the bridge. */
import { useEffect, useRef, useState } from 'react';
import type { Issue } from '../../engine/errors';
import { useApp, useAppState } from '../context';
import { EXPORT_FORMATS, exportRun, type ExportFormat } from '../exporting';
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
  const dialog = useRef<HTMLDialogElement>(null);

  useEffect(() => {
    const d = dialog.current;
    if (!d) return;
    if (open && !d.open) {
      d.showModal();
      setIssues([]);
      if (output && !output.runs.some((r) => r.key === runKey)) setRunKey(selected[0] ?? output.runs[0]?.key ?? '');
    } else if (!open && d.open) d.close();
  }, [open, output, runKey, selected]);

  const close = () => app.ui.setState({ exportOpen: false });
  const rateProblem = exportRateProblem(rateText, output ? output.scenario.file.vehicle.controlRateHz : Infinity);
  const rate = rateText.trim() === '' || rateProblem ? null : (parseNumberText(rateText) as number);

  const doExport = async () => {
    if (!output || rateProblem || partial) return;
    setBusy(true);
    try {
      // A long run kept a display trace and is flown again for its export: let the busy state paint first.
      if (output.runs.find((x) => x.key === runKey)?.traceKind === 'display') await new Promise((ok) => setTimeout(ok, 0));
      const r = exportRun(output, { format, runKey, sampleRateHz: rate });
      if (!r.ok) {
        setIssues(r.errors);
        return;
      }
      const res = await app.bridge.exportFile({ suggestedName: r.value.name, content: r.value.content });
      if (res.status === 'exported') {
        app.notify(`Exported ${res.file.name}`);
        close();
      } else if (res.status === 'invalid') setIssues(res.errors);
      else if (res.status === 'failed') setIssues([{ path: '', rule: 'write', message: res.message }]);
    } finally {
      setBusy(false);
    }
  };

  return (
    <dialog ref={dialog} className="export-dialog" onClose={close} onCancel={close} data-testid="export-dialog">
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
        <button onClick={close}>Cancel</button>
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
  );
}
