/**
 * Exports of orbit scenarios and UTC labels across a leap second.
 * - Leap second: IERS Bulletin C 52 (2016) announced a positive leap second at the end of
 *   2016-12-31, so from 2016-12-31T23:59:50Z, t = 10 s is 2016-12-31T23:59:60.000 and t = 11 s is
 *   2017-01-01T00:00:00.000 (CCSDS 504.0-B-2 §6.8.9 allows seconds = 60 in UTC epochs).
 * - Orbit scenarios: the CSV header, the JSON document and the AEM COMMENT lines name the frame
 *   (EME2000), the element set, each segment's target and site and the windows; the AEM reads
 *   back with the project's reader (checked against the standard in export-aem-read.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { writeAem } from '../../app/engine/export/aem-write';
import { parseAem } from '../../app/engine/export/aem-read';
import { writeCsv } from '../../app/engine/export/csv';
import { writeJson } from '../../app/engine/export/json';
import { runPipeline } from '../../app/engine/pipeline/run';
import { exampleSummary } from './scenario-fixtures';
import { META, makeTrace } from './export-fixtures';
import { asset, runInProcess } from './cli-harness';
import { readFileSync } from 'node:fs';

describe('AEM epochs are UTC with leap seconds counted', () => {
  it('2016-12-31T23:59:50Z + 10 s is labelled 2016-12-31T23:59:60.000 (IERS Bulletin C 52)', () => {
    const s = { ...exampleSummary('lumen6-imaging'), epochUtc: '2016-12-31T23:59:50Z', epochUnixMs: Date.UTC(2016, 11, 31, 23, 59, 50) };
    const tr = makeTrace({ n: 41, dt: 0.5, nWheels: 4, q0: [0, 0, 0, 1], omega: [0.001, 0, 0] });
    const r = writeAem(tr, s, META, { creationDateUtc: '2030-03-13T08:00:00Z' });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const epochs = r.value
      .split('\n')
      .filter((l) => /^\d{4}-\d\d-\d\dT/.test(l))
      .map((l) => l.split(' ')[0]);
    expect(epochs[0]).toBe('2016-12-31T23:59:50.000');
    expect(epochs[20]).toBe('2016-12-31T23:59:60.000');
    expect(epochs[21]).toBe('2016-12-31T23:59:60.500');
    expect(epochs[22]).toBe('2017-01-01T00:00:00.000');
    expect(epochs[40]).toBe('2017-01-01T00:00:09.000');
    expect(r.value).toContain('STOP_TIME = 2017-01-01T00:00:09.000');
    expect(parseAem(r.value).ok).toBe(true);
  });
});

describe('orbit scenario exports name the frame, targets, sites and windows', () => {
  const j = JSON.parse(readFileSync(asset('lumen6-orbit-day.scenario.json'), 'utf8'));
  // Keep the test short: image the two sites only, one controller.
  j.targets = j.targets.slice(0, 3);
  j.orbit.horizonS = 900;
  j.simulation.mode = 'follow-plan';
  j.controllers = j.controllers.slice(0, 1);
  const out = runPipeline(j);
  if (!out.ok) throw new Error(JSON.stringify(out.errors));
  const o = out.value;
  const run = o.runs[0]!;
  const meta = { ...META, controllerLabel: run.label, controllerId: run.controllerId };

  it('the pipeline output carries the orbit for views: track, sites with passes, windows', () => {
    expect(o.orbit?.inertialFrame).toBe('EME2000');
    expect(o.orbit!.track.t.length).toBe(16);
    expect(o.orbit!.sites.map((s) => s.id)).toEqual(['aldermoor', 'brisk-plain', 'harrowgate']);
    expect(o.orbit!.windows.map((w) => [w.kind, w.siteId])).toEqual([
      ['sun', null],
      ['site', 'aldermoor'],
      ['site', 'brisk-plain'],
    ]);
    // Geodetic height of the track: the invented orbit is ~560–590 km up (15.2 rev/day).
    for (const h of o.orbit!.track.heightM) {
      expect(h).toBeGreaterThan(500e3);
      expect(h).toBeLessThan(650e3);
    }
    expect(run.windowErrors?.length).toBe(3);
    for (const t of o.scenario.targets) for (const x of t.q) expect(Number.isFinite(x)).toBe(true);
  });

  it('CSV header lines', () => {
    const r = writeCsv(run.trace, o.scenario, meta);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const head = r.value.split('\n').filter((l) => l.startsWith('#'));
    expect(head.some((l) => l.includes('reference frame: EME2000'))).toBe(true);
    expect(head.some((l) => l.includes('orbit: LUMEN-6 (INVENTED)'))).toBe(true);
    expect(head.some((l) => /target 2 "Image Aldermoor": site aldermoor \(Aldermoor test field \(invented\)\)/.test(l))).toBe(true);
    expect(head.some((l) => l.includes('pass window to'))).toBe(true);
    expect(head.some((l) => l.startsWith('# eclipses (conical shadow)'))).toBe(true);
  });

  it('JSON document', () => {
    const r = writeJson(run.trace, o.scenario, meta);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const doc = JSON.parse(r.value);
    expect(doc.inertialFrame).toBe('EME2000');
    expect(doc.orbit.windows[1].siteId).toBe('aldermoor');
    expect(doc.orbit.sites[0].passes.length).toBeGreaterThan(0);
  });

  it('AEM: header COMMENTs, a COMMENT naming each segment’s target and site, and it reads back', () => {
    const r = writeAem(run.trace, o.scenario, meta, { creationDateUtc: '2030-03-13T08:00:00Z' });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const doc = parseAem(r.value);
    expect(doc.ok).toBe(true);
    expect(r.value).toContain('COMMENT reference frame: EME2000');
    expect(r.value).toMatch(/COMMENT target 3 "Image Brisk Plain": site brisk-plain/);
    expect(r.value).toContain('REF_FRAME_A = EME2000');
  });
});

describe('CLI on an orbit scenario', () => {
  it('plan prints the passes, eclipses and planned windows with UTC labels', async () => {
    const r = await runInProcess(['plan', asset('lumen6-orbit-day.scenario.json')]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('frame EME2000');
    expect(r.stdout).toMatch(/aldermoor\s+2026-03-20T22:02:40\.\dZ/);
    expect(r.stdout).toContain('Planned windows');
    expect(r.stdout).toMatch(/5\. Downlink Harrowgate\s+station\s+harrowgate/);
  }, 60_000);

  it('a TLE with a wrong checksum is refused naming the line and column', async () => {
    const j = JSON.parse(readFileSync(asset('lumen6-orbit-day.scenario.json'), 'utf8'));
    const l1: string = j.orbit.tle[1];
    j.orbit.tle[1] = l1.slice(0, 68) + String((Number(l1[68]) + 1) % 10);
    const { mkdtempSync, writeFileSync } = await import('node:fs');
    const dir = mkdtempSync('/tmp/slewsmith-orbit-');
    const f = `${dir}/bad.scenario.json`;
    writeFileSync(f, JSON.stringify(j));
    const r = await runInProcess(['plan', f]);
    expect(r.code).toBe(2);
    expect(r.stderr + r.stdout).toMatch(/orbit\.tle.*line 1.*column 69/is);
  }, 60_000);
});
