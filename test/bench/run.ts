export {};
/**
 * `npm run bench`: prints the speed figures of every part that has a target. Figures only; no
 * assertions (speed is never checked by timed tests). Each module exports one async function.
 */
type Bench = { file: string; fn: string; title: string };

const benches: Bench[] = [
  { file: './engine.ts', fn: 'benchEngine', title: 'Engine: 600 s gyrostat run, 10 Hz zero-order hold' },
  { file: './loop.ts', fn: 'benchLoop', title: 'Closed loop against a bare RK4 loop of the same dynamics (issue 12 ratios)' },
  { file: './memory.ts', fn: 'benchMemory', title: 'Day-long runs: peak memory and trace bytes per sample' },
  { file: './control.ts', fn: 'benchControl', title: 'Synergistic flow-set check over uniform attitudes' },
  { file: './wheels.ts', fn: 'benchWheels', title: 'Wheel allocation, limiting, envelopes' },
  { file: './plan.ts', fn: 'benchPlan', title: 'Slew planner' },
  { file: './constraints.ts', fn: 'benchConstraints', title: 'Attitude constraints: constrained slew and history check' },
  { file: './pipeline.ts', fn: 'benchPipeline', title: 'Scenario pipeline (plan + closed-loop runs)' },
  { file: './view3d.ts', fn: 'benchView3d', title: '3D view: scene update per new time' },
  { file: './study.ts', fn: 'benchStudy', title: 'Robustness study in worker threads' },
  { file: './cliStudy.ts', fn: 'benchCliStudy', title: '10,000 dispersed slews from the CLI, two workers' },
  { file: './orbit.ts', fn: 'benchOrbit', title: 'Orbit: one day of ephemeris, windows, per-sample evaluation' },
  { file: './campaign.ts', fn: 'benchCampaign', title: 'Campaign statistics: add, and merge 1,000 shard files' },
  {
    file: './study-campaign.ts',
    fn: 'benchStudyCampaign',
    title: 'Study campaign: merge 1,000 real-format shard files, per-shard overhead',
  },
  { file: './sweep.ts', fn: 'benchSweep', title: 'Robustness sweep from the CLI: 10 × 10 cells × 3 laws, two workers' },
  { file: './browser.ts', fn: 'benchBrowser', title: 'Renderer in headless Chromium' },
];

const only = process.argv.slice(2);
for (const b of benches) {
  if (only.length && !only.some((o) => b.file.includes(o))) continue;
  console.log(`\n== ${b.title} (${b.file})`);
  try {
    const mod = (await import(b.file)) as Record<string, () => Promise<void>>;
    await mod[b.fn]!();
  } catch (e) {
    console.log(`   could not run: ${(e as Error).message.split('\n')[0]}`);
  }
}
