/**
 * The main window (design.md "Main window"): caution strip, top bar, editors on the left, the 3D
 * view over the synchronised plots in the centre, plan and comparison on the right, the playback
 * bar at the bottom, and the export dialog.
 */
import { lazy, Suspense, useEffect, useRef, useState } from 'react';
import { alternateCommandForChord, commandForChord } from '../bridge/commands';
import type { AppController } from './appController';
import { AppContext } from './context';
import { startFrameLoop } from './playback/clock';
import { CautionStrip, TopBar } from './components/Chrome';
import { VehiclePanel } from './components/VehiclePanel';
import { ManeuverPanel } from './components/ManeuverPanel';
import { ControllersPanel } from './components/ControllersPanel';
import { ConstraintsPanel } from './components/ConstraintsPanel';
import { RunSettingsPanel } from './components/RunSettingsPanel';
import { OrbitPanel } from './orbit/OrbitPanel';
import { PassesView } from './orbit/PassesView';
import { SkyView } from './orbit/SkyView';
import { ComparisonTable, PlanSummary, RunStatus } from './components/Results';
import { Scrubber } from './components/Scrubber';
import { ExportDialog } from './components/ExportDialog';
import { PlotsPanel } from './plots/PlotsPanel';
import { useStoreSlice } from './store/hooks';
import { studySessionOf } from './study/registry';

// three.js (the 3D views, the study's outcome map) loads after the first plot: these two panels come
// in their own chunks, so the first pass's plots do not wait for a third of the bundle.
const View3DPanel = lazy(() => import('./view/View3DPanel').then((m) => ({ default: m.View3DPanel })));
const StudyWorkspace = lazy(() => import('./study/StudyWorkspace').then((m) => ({ default: m.StudyWorkspace })));

/**
 * True from the end of the first pass on (its output, or a first document that cannot run): the 3D
 * panel's chunk (three.js) is fetched, compiled and mounted only then, so at a cold start it does
 * not compete with the first plots for the main thread. Its place is held by the same empty box.
 */
function useFirstPassOver(app: AppController): boolean {
  const over = useStoreSlice(app.store, (s) => s.output !== null || s.pipeline.status === 'invalid' || s.pipeline.status === 'failed');
  const latched = useRef(false);
  if (over) latched.current = true;
  return latched.current;
}

/**
 * True from the frame after the one that showed the first pass (`over`): a panel mounted only then
 * (the sky view, whose scene costs tens of milliseconds of Sun, Moon and body-axis directions)
 * does not hold back the first plots' frame; it appears one frame later.
 */
function useFrameAfter(over: boolean): boolean {
  const [after, setAfter] = useState(false);
  useEffect(() => {
    if (!over || after) return;
    let timer: ReturnType<typeof setTimeout> | undefined;
    // The animation frame callback runs before that frame's paint; the task it queues runs after it.
    const frame = requestAnimationFrame(() => (timer = setTimeout(() => setAfter(true), 0)));
    return () => {
      cancelAnimationFrame(frame);
      if (timer !== undefined) clearTimeout(timer);
    };
  }, [over, after]);
  return after;
}

function isEditable(t: EventTarget | null): boolean {
  const el = t as HTMLElement | null;
  if (!el || typeof el.tagName !== 'string') return false;
  const tag = el.tagName.toLowerCase();
  return tag === 'input' || tag === 'textarea' || tag === 'select' || el.isContentEditable;
}

/**
 * Undo/redo inside a text field edits the document too (the fields commit as you type, so the
 * field's own undo would fight the store). The desktop menu already sends the command; the
 * browser bridge leaves text fields alone, so here we send it ourselves.
 */
function useFieldUndo(app: AppController) {
  useEffect(() => {
    const isMac = /Mac|iPhone|iPad/.test(navigator.platform);
    const onKey = (e: KeyboardEvent) => {
      // The desktop menu has no item for an alternate chord (Ctrl+Y): answer it here.
      const alt = app.bridge.shell === 'desktop' && !isEditable(e.target) ? alternateCommandForChord(e, isMac) : null;
      if (alt) {
        e.preventDefault();
        app.command(alt);
        return;
      }
      const c = commandForChord(e, isMac);
      if ((c !== 'undo' && c !== 'redo') || !isEditable(e.target)) return;
      e.preventDefault();
      // In a text field the desktop menu sends menu chords itself; alternate ones (Ctrl+Y) it does not.
      if (app.bridge.shell === 'browser' || alternateCommandForChord(e, isMac)) app.command(c);
    };
    window.addEventListener('keydown', onKey, { capture: true });
    return () => window.removeEventListener('keydown', onKey, { capture: true });
  }, [app]);
}

export function App({ app }: { app: AppController }) {
  useFieldUndo(app);
  useEffect(() => startFrameLoop(app.clock), [app]);
  const show3d = useFirstPassOver(app);
  const showSky = useFrameAfter(show3d);
  // The study view takes the centre and right columns while it is open.
  const studyOpen = useStoreSlice(studySessionOf(app).store, (s) => s.open);
  return (
    <AppContext.Provider value={app}>
      <div className="app">
        <CautionStrip />
        <TopBar />
        <main className={`workspace ${studyOpen ? 'study-open' : ''}`}>
          <aside className="left" aria-label="Scenario editors">
            <VehiclePanel />
            <OrbitPanel />
            <ManeuverPanel />
            <ControllersPanel />
            <ConstraintsPanel />
            <RunSettingsPanel />
          </aside>
          {studyOpen ? (
            <Suspense fallback={<section className="center" aria-busy="true" aria-label="Study loading" />}>
              <StudyWorkspace />
            </Suspense>
          ) : (
            <>
              <section className="center" aria-label="3D view and plots">
                <Suspense fallback={<div className="view3d" aria-busy="true" aria-label="3D view loading" />}>
                  {show3d ? <View3DPanel /> : <div className="view3d" aria-busy="true" aria-label="3D view loading" />}
                </Suspense>
                <PlotsPanel />
              </section>
              <aside className="right" aria-label="Plan and comparison">
                <RunStatus />
                <PlanSummary />
                <PassesView />
                {showSky ? <SkyView /> : null}
              </aside>
              {/* Under the centre and right columns, so every run fits side by side at 1280 px. */}
              <section className="compare-band" aria-label="Comparison of runs">
                <ComparisonTable />
              </section>
            </>
          )}
        </main>
        <Scrubber />
        <ExportDialog />
      </div>
    </AppContext.Provider>
  );
}
