/**
 * The app's side of campaigns (app/ui/study/session.ts, app/engine/study/summaryRead.ts,
 * campaignFolder.ts):
 * - "Save as campaign…" exports one bash script; run with bash it writes the campaign folder
 *   (scenario, Slurm array and merge scripts, submit.sh, README.txt). Its array script, run as
 *   task 0 with SLURM_ARRAY_TASK_ID set (no scheduler: bash runs the body), and its merge script
 *   give a summary.json byte-identical to the app's own summary export of the same study.
 * - "Open results…" shows a summary.json (shares, map, worst cases); a worst case opens as a run
 *   exactly as from a study run in the app (studyCaseScenario of the scenario inside the file).
 * - Files that are not summaries, or of another version, are refused with a notice naming why.
 * - The CLI's share cell: 0 of 100 → rule-of-three bound 3/100 = 3.0 % (Wilson's interval itself
 *   is checked against the closed form in test/reference/stats-intervals.test.ts).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { runStudy, studyCaseScenario, summaryJson } from '../../app/engine/study';
import { readStudySummary } from '../../app/engine/study/summaryRead';
import { shareReport } from '../../app/engine/math/stats';
import { shareCell } from '../../main/cli/study';
import type { FromStudyWorker, StudyWorkerLike, ToStudyWorker } from '../../app/ui/study/protocol';
import { createStudySession } from '../../app/ui/study/session';
import { createAppStore } from '../../app/ui/store/document';
import { createClock } from '../../app/ui/playback/clock';
import { preflight } from '../../app/ui/preflight';
import type { ExportRequest, SlewsmithBridge } from '../../app/bridge/api';
import { testVehicleScenario } from './study-fixtures';

const repo = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const study = {
  runs: 6,
  seed: 31337,
  durationS: 60,
  stopAfterSettledForS: 5,
  controllers: ['pd', 'hyst'],
  dispersions: { initialAttitude: { mode: 'uniform' }, initialRateDegPerS: 0.05 },
};
const json = testVehicleScenario(study);
const root = mkdtempSync(path.join(tmpdir(), 'slewsmith-campaign-app-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** Answers only the case-scenario requests openCase makes (the study itself is not run here). */
class CaseWorker implements StudyWorkerLike {
  onmessage: ((ev: MessageEvent<FromStudyWorker>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  postMessage(m: ToStudyWorker) {
    setTimeout(() => {
      if (m.type === 'case-scenario')
        this.onmessage?.({
          data: { type: 'case-scenario', id: m.id, result: studyCaseScenario(m.json, m.overrides, m.index) },
        } as MessageEvent<FromStudyWorker>);
    }, 0);
  }
  terminate() {}
}

function setup() {
  const store = createAppStore(json, { validate: preflight });
  store.load(json, 'test.scenario.json', false);
  const exported: ExportRequest[] = [];
  const bridge = {
    shell: 'browser',
    exportFile: async (r: ExportRequest) => (exported.push(r), { status: 'exported', file: { path: null, name: r.suggestedName } }),
    newScenario: async () => ({ status: 'created' }),
  } as unknown as SlewsmithBridge;
  const notices: string[] = [];
  const clock = createClock();
  const session = createStudySession({
    app: { store, clock, bridge, notify: (t) => void notices.push(t) },
    spawn: () => new CaseWorker(),
    cores: 2,
  });
  return { session, store, exported, notices };
}

const ref = runStudy(json);
if (!ref.ok) throw new Error('study refused');
const refJson = summaryJson(ref.value.info, ref.value.summary, ref.value.map);

describe('opening a summary.json in the study view', () => {
  it('shows the summary and map of the file; a worst case opens as a run', async () => {
    const t = setup();
    expect(t.session.openResults(refJson, 'summary.json')).toBe(true);
    const s = t.session.store.getState();
    expect([s.phase, s.loadedFrom, s.open]).toEqual(['done', 'summary.json', true]);
    expect(s.summary).toEqual(ref.value.summary);
    expect(s.map).toEqual(ref.value.map);
    expect(s.info?.controllers).toEqual(ref.value.info.controllers);
    const worst = s.summary!.controllers[1]!.worst[0]!;
    await t.session.openCase(worst.index, 'hyst');
    const expected = studyCaseScenario(json, {}, worst.index);
    if (!expected.ok) throw new Error('case refused');
    expect(t.store.getState().scenario).toEqual(expected.value);
    expect(t.store.getState().excludedControllerIds).toEqual(['pd']);
  }, 60_000);

  it('refuses what is not a version-2 summary, saying why', () => {
    const t = setup();
    expect(t.session.openResults('{"format":"slewsmith-scenario"}', 'x.json')).toBe(false);
    expect(t.session.openResults(refJson.replace('"version": 2', '"version": 1'), 'old.json')).toBe(false);
    expect(t.session.openResults('not json', 'y.json')).toBe(false);
    expect(t.notices).toEqual([
      expect.stringMatching(/x\.json cannot be opened: this is not a Slewsmith study summary/),
      expect.stringMatching(/old\.json cannot be opened: summary version 1 cannot be opened; this Slewsmith opens version 2/),
      expect.stringMatching(/y\.json is not JSON/),
    ]);
    const broken = JSON.parse(refJson);
    broken.map[2].axis = [1, 2];
    const r = readStudySummary(broken);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.path).toBe('map[2]');
    expect(t.session.store.getState().summary).toBe(null);
  });
});

describe('saving a study as a campaign', () => {
  it('one script writes the campaign folder; its array and merge scripts reproduce the app’s summary byte for byte', async () => {
    const t = setup();
    await t.session.saveCampaign();
    const e = t.exported[0]!;
    expect(e.suggestedName).toBe('study-test-vehicle-campaign.sh');
    const script = path.join(root, e.suggestedName);
    writeFileSync(script, String(e.content));
    const dir = path.join(root, 'folder');
    execFileSync('bash', [script, dir], { cwd: root, encoding: 'utf8' });
    const scenario = JSON.parse(readFileSync(path.join(dir, 'scenario.json'), 'utf8'));
    expect(scenario.study).toMatchObject({ runs: 6, seed: 31337, controllers: ['pd', 'hyst'] });
    const shards = readFileSync(path.join(dir, 'slurm/shards.sbatch'), 'utf8');
    expect(shards).toContain('#SBATCH --array=0-0');
    expect(shards).toMatch(/#SBATCH --cpus-per-task=1\n#SBATCH --mem=1024M\n#SBATCH --time=01:00:00/);
    expect(readFileSync(path.join(dir, 'README.txt'), 'utf8')).toContain('--shard i/1 --out shards');
    for (const f of ['slurm/shards.sbatch', 'slurm/merge.sbatch', 'slurm/submit.sh']) execFileSync('bash', ['-n', path.join(dir, f)]);
    // Run the array task and the merge as Slurm would (bash runs the body; #SBATCH lines are comments).
    const env = { ...process.env, SLEWSMITH: `${process.execPath} ${path.join(repo, 'bin/slewsmith.mjs')}`, SLURM_ARRAY_TASK_ID: '0' };
    execFileSync('bash', ['slurm/shards.sbatch'], { cwd: dir, env, stdio: 'pipe' });
    execFileSync('bash', ['slurm/merge.sbatch'], { cwd: dir, env, stdio: 'pipe' });
    expect(readFileSync(path.join(dir, 'summary.json'), 'utf8')).toBe(refJson);
  }, 120_000);
});

describe('share cells with their interval', () => {
  it('0 of 100: the rule-of-three bound 3/100; otherwise the Wilson interval', () => {
    expect(shareCell(shareReport(0, 100))).toBe('0.0% [≤3.0]');
    // 5 of 100: Wilson 95 % interval 0.0215–0.1118 (closed form, Wilson 1927; checked in stats-intervals.test.ts).
    expect(shareCell(shareReport(5, 100))).toBe('5.0% [2.2–11.2]');
  });
});
