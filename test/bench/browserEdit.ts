/**
 * Edit → updated plots on the bundled demo (browser.ts, measurement 2), two kinds of edit:
 *
 *  - 'vehicle': the Jxx field filled as a user types (alternately 0.13 and 0.11): every run
 *    changes. The plots show the first run (pd, follow-plan) as the app does after a load.
 *  - 'gain': the hysteretic law's bandwidth filled (alternately 0.22 and 0.18): only that law's
 *    two runs change (the worker's run cache flies those alone). Before the edits the bench ticks
 *    pd and hysteretic (follow-plan) so the error-angle overlay shows the edited run; the per-run
 *    plots stay on pd, whose data does not change.
 *
 * Each edit is timed from the input event to the first moment the error-angle plot's pixels
 * change after an output holding the edited run's new trace reached the store, with the phases
 * between: the runner's debounce (input → 'running'), 'running' → that output in the store,
 * store → plot pixels (React render plus chart draw), and the worker round trip ('running' →
 * 'done', of which the engine's own elapsedMs). A second figure: edit → complete pass shown
 * ('done' and the frame after it: comparison table, best marks, warnings). The probe never
 * hangs: after EDIT_TIMEOUT_MS without an update the edit is counted as "no update seen".
 */
import type { BrowserContext, Page } from 'playwright-core';

export type EditKind = 'vehicle' | 'gain';

/** The run whose error-angle series the gain edit changes. */
const GAIN_RUN = 'hysteretic:follow-plan';
const EDIT_TIMEOUT_MS = 8000;

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  if (s.length === 0) return NaN;
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

const ms = (x: number) => (Number.isFinite(x) ? `${x.toFixed(x < 10 ? 2 : 0)} ms` : 'n/a');

interface EditTimes {
  input: number;
  running: number;
  /** The first new output in the store holding the watched run's new trace (partial or complete). */
  firstOut: number;
  /** Whether that output was partial. */
  partial: boolean;
  done: number;
  /** The frame after 'done' (the complete pass shown: comparison table, best marks, warnings). */
  doneFrame: number;
  /** The run status shown as done in the DOM (React committed the new output). */
  commit: number;
  painted: number;
  elapsed: number;
  /** Time inside the 3D view's setRuns and render calls between the edit and the updated plot. */
  setRunsMs: number;
  renderMs: number;
  renders: number;
  /** True when the probe gave up (EDIT_TIMEOUT_MS). */
  timedOut: boolean;
}

/**
 * Arms the page-side recorder for one edit (resolved in window.__benchEdit). `watch`: the key of
 * the run whose new trace the output must hold before the plot's pixels are watched.
 */
async function armEdit(page: Page, watch: string, timeoutMs: number): Promise<void> {
  await page.evaluate(
    ({ watch, timeoutMs }) => {
      type Run = { key: string; trace: { n: number; errorAngle: Float64Array } };
      type Out = { elapsedMs: number; runs: Run[] };
      type St = { pipeline: { status: string }; output: Out | null; partial?: unknown };
      const app = (window as unknown as { __slewsmith: { store: { getState(): St; subscribe(l: (s: St, p: St) => void): () => void } } })
        .__slewsmith;
      const store = app.store;
      const canvasOf = () => document.querySelector<HTMLCanvasElement>('.plot-card[data-plot="error-angle"] canvas');
      const checksum = (c: HTMLCanvasElement | null) => {
        if (!c) return -1;
        const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
        let h = 0;
        for (let i = 0; i < d.length; i += 4) h = (Math.imul(h, 31) + d[i]! + 7 * d[i + 1]! + 13 * d[i + 2]!) | 0;
        return h;
      };
      const prevOut = store.getState().output;
      // The watched run's error angle before the edit (copied: the array is the output's own).
      const before = prevOut?.runs.find((r) => r.key === watch);
      const angle0 = before ? Array.from(before.trace.errorAngle.subarray(0, before.trace.n)) : null;
      const changed = (o: Out | null) => {
        const r = o?.runs.find((x) => x.key === watch);
        if (!r || !angle0) return r !== undefined;
        if (r.trace.n !== angle0.length) return true;
        const a = r.trace.errorAngle;
        for (let k = 0; k < angle0.length; k++) if (!Object.is(a[k], angle0[k])) return true;
        return false;
      };
      const sum0 = checksum(canvasOf());
      const view = (window as unknown as { __bench: { view: { setRunsMs: number; renderMs: number; renders: number } } }).__bench.view;
      const view0 = { ...view };
      const rec = {
        input: NaN,
        running: NaN,
        firstOut: NaN,
        partial: false,
        done: NaN,
        doneFrame: NaN,
        commit: NaN,
        painted: NaN,
        elapsed: NaN,
        setRunsMs: NaN,
        renderMs: NaN,
        renders: NaN,
        timedOut: false,
      };
      const status = document.querySelector('[data-testid=run-status]')!;
      const mo = new MutationObserver(() => {
        if (!Number.isNaN(rec.done) && Number.isNaN(rec.commit) && status.getAttribute('data-status') === 'done')
          rec.commit = performance.now();
      });
      mo.observe(status, { attributes: true, attributeFilter: ['data-status'] });
      const w = window as unknown as { __benchEdit: Promise<typeof rec> };
      w.__benchEdit = new Promise((resolve) => {
        let settled = false;
        const onInput = () => {
          if (Number.isNaN(rec.input)) rec.input = performance.now();
        };
        window.addEventListener('input', onInput, true);
        const ch = new MessageChannel();
        const end = () => {
          if (settled) return;
          settled = true;
          clearTimeout(timer);
          mo.disconnect();
          window.removeEventListener('input', onInput, true);
          unsub();
          ch.port1.onmessage = null;
          resolve(rec);
        };
        const finish = () => {
          if (!Number.isNaN(rec.painted) && !Number.isNaN(rec.doneFrame)) end();
        };
        const timer = setTimeout(() => {
          rec.timedOut = true;
          end();
        }, timeoutMs);
        // From the first output holding the watched run's new trace on, poll between tasks
        // (sub-millisecond) for the plot's pixels to change.
        ch.port1.onmessage = () => {
          if (settled) return;
          if (checksum(canvasOf()) !== sum0) {
            rec.painted = performance.now();
            rec.setRunsMs = view.setRunsMs - view0.setRunsMs;
            rec.renderMs = view.renderMs - view0.renderMs;
            rec.renders = view.renders - view0.renders;
            finish();
          } else ch.port2.postMessage(0);
        };
        const unsub = store.subscribe((s, p) => {
          const now = performance.now();
          if (s.output !== p.output && s.output !== prevOut && Number.isNaN(rec.firstOut) && changed(s.output)) {
            rec.firstOut = now;
            rec.partial = s.partial != null;
            ch.port2.postMessage(0);
          }
          if (s.pipeline.status === p.pipeline.status) return;
          if (s.pipeline.status === 'running') rec.running = now;
          if (s.pipeline.status === 'done' && s.output !== prevOut && Number.isNaN(rec.done)) {
            rec.done = now;
            rec.elapsed = s.output ? s.output.elapsedMs : NaN;
            requestAnimationFrame(() =>
              setTimeout(() => {
                rec.doneFrame = performance.now();
                finish();
              }, 0),
            );
          }
        });
      });
    },
    { watch, timeoutMs },
  );
}

/** The field and values of each kind, and the runs ticked before the edits (null: leave the app's choice). */
function kindOf(page: Page, kind: EditKind) {
  if (kind === 'vehicle')
    return {
      field: page.getByLabel('Jxx', { exact: true }),
      values: ['0.13', '0.11'],
      watch: 'pd:follow-plan',
      tick: null,
      what: 'edit (Jxx) → error-angle plot updated, demo with 3 controllers × 2 modes (every run changes)',
    };
  return {
    field: page.getByTestId('controller-hysteretic').getByLabel('Bandwidth ωn', { exact: true }),
    values: ['0.22', '0.18'],
    watch: GAIN_RUN,
    tick: ['pd:follow-plan', GAIN_RUN],
    what: 'edit (hysteretic bandwidth) → its error-angle series updated, pd and hysteretic ticked (2 of 6 runs change)',
  };
}

/**
 * `open` gives a fresh page with browser.ts's probes installed. `skip3d`: the 3D view's render()
 * does nothing during the edits, which isolates what one 3D frame costs the main thread here
 * (shader programs rebuilt for the new run set, then the compositor waiting for SwiftShader and
 * reading the preserved drawing buffer back: software-GL artefacts).
 */
export async function editToPlots(
  open: () => Promise<{ context: BrowserContext; page: Page }>,
  url: string,
  edits: number,
  skip3d: boolean,
  kind: EditKind,
): Promise<void> {
  const { context, page } = await open();
  await page.goto(url, { waitUntil: 'load' });
  await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
  await page.waitForFunction(() => (window as unknown as { __bench: { painted: number | null } }).__bench.painted !== null, null, {
    timeout: 120_000,
  });
  await page.evaluate((skip) => ((window as unknown as { __benchSkipRender: boolean }).__benchSkipRender = skip), skip3d);
  const k = kindOf(page, kind);
  if (k.tick) {
    await page.evaluate(
      (keys) => (window as unknown as { __slewsmith: { store: { selectRuns(k: string[]): void } } }).__slewsmith.store.selectRuns(keys),
      k.tick,
    );
    await page.waitForTimeout(500);
  }
  const times: EditTimes[] = [];
  for (let e = 0; e < edits; e++) {
    await armEdit(page, k.watch, EDIT_TIMEOUT_MS);
    await k.field.fill(k.values[e % 2]!);
    const r = await page.evaluate(() => (window as unknown as { __benchEdit: Promise<EditTimes> }).__benchEdit);
    times.push(r);
    // Let a pass the probe gave up on finish before the next edit.
    if (r.timedOut) await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
    await page.waitForTimeout(300);
  }
  await context.close();
  const seen = times.filter((t) => !t.timedOut && Number.isFinite(t.painted));
  const missed = edits - seen.length;
  const what = skip3d ? `same (${kind}), 3D view render() skipped` : k.what;
  if (seen.length === 0) {
    console.log(`   ${what}: no update seen in ${edits} edits (probe timeout ${EDIT_TIMEOUT_MS} ms each)`);
    return;
  }
  const total = seen.map((t) => t.painted - t.input);
  const complete = seen.map((t) => t.doneFrame - t.input);
  const partials = seen.filter((t) => t.partial).length;
  const debounce = seen.map((t) => t.running - t.input);
  const toFirst = seen.map((t) => t.firstOut - t.running);
  const worker = seen.map((t) => t.done - t.running);
  const engine = seen.map((t) => t.elapsed);
  const render = seen.map((t) => t.painted - t.firstOut);
  const commit = seen.map((t) => t.commit - t.done);
  const setRuns = seen.map((t) => t.setRunsMs);
  const view = seen.map((t) => t.renderMs);
  const renders = seen.map((t) => t.renders);
  console.log(
    `   ${what}: first updated plot median ${ms(median(total))} (min ${ms(Math.min(...total))}, max ${ms(Math.max(...total))}, ` +
      `${seen.length} edits, ${partials} from a partial pass${missed ? `; no update seen in ${missed}` : ''})${skip3d ? '' : '   [target ≤ 50 ms]'}`,
  );
  console.log(
    `     edit → complete pass shown (status 'done', then the next frame: comparison, best marks, warnings): ` +
      `median ${ms(median(complete))} (min ${ms(Math.min(...complete))}, max ${ms(Math.max(...complete))})`,
  );
  console.log(
    `     phases (medians): debounce of the runner ${ms(median(debounce))}; 'running' → edited run's output in the store ` +
      `${ms(median(toFirst))}; that output → plot pixels ${ms(median(render))}; 'running' → 'done' ${ms(median(worker))} ` +
      `(engine pipeline ${ms(median(engine))}, messaging and transfer ${ms(median(worker.map((w, i) => w - engine[i]!)))}; ` +
      `'done' → React commit of the complete output ${ms(median(commit))})`,
  );
  console.log(
    `     main-thread time inside the 3D view between edit and updated plot (medians): setRuns ${ms(median(setRuns))}, ` +
      `render ${ms(median(view))} over ${median(renders)} call(s)`,
  );
}
