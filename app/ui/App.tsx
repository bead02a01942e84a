/**
 * Minimal shell page (the UI work replaces this file): the caution strip, the product name, and
 * which shell and document the bridge reports, so the browser tests have something real to read.
 * Keep `data-testid="caution-strip"` on the strip: test/e2e/smoke.test.ts looks for it.
 */
import { useEffect, useState } from 'react';
import { getBridge } from '../bridge';

export const CAUTION_TEXT = 'CAUTION: planning aid, not flight software — verify before flight use';

export function App() {
  const [status, setStatus] = useState('starting');
  useEffect(() => {
    const bridge = getBridge();
    let live = true;
    void bridge.initialScenario().then((r) => {
      if (!live) return;
      if (r.status === 'opened') setStatus(`${bridge.shell} shell · ${r.file.name}`);
      else if (r.status === 'invalid') setStatus(`${bridge.shell} shell · ${r.file.name} has ${r.errors.length} problem(s)`);
      else setStatus(`${bridge.shell} shell · no scenario`);
    });
    return () => {
      live = false;
    };
  }, []);
  return (
    <div style={{ fontFamily: 'system-ui, sans-serif', margin: 0 }}>
      <div role="note" data-testid="caution-strip" style={{ background: '#f2c200', color: '#111', padding: '6px 12px', fontWeight: 600 }}>
        {CAUTION_TEXT}
      </div>
      <main style={{ padding: '16px' }}>
        <h1 style={{ margin: 0 }}>Slewsmith</h1>
        <p data-testid="shell-status">{status}</p>
      </main>
    </div>
  );
}
