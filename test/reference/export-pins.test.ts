/**
 * Pinned exports of the bundled examples: every run of every example scenario, exported as CSV,
 * JSON and CCSDS AEM (fixed creation date), hashed with SHA-256 and compared with the hashes in
 * test/golden/export-pins.json. A second, tolerance-based pin keeps 101 evenly spaced samples of
 * the physical channels of every run, so a change that is meant to move the numerics (a faster
 * integrator, say) can be checked against the previous output within a stated tolerance.
 *
 * The pins change only in commits that intend a change of meaning, and those commits say why.
 * Regenerate with `SLEWSMITH_UPDATE_PINS=1 npx vitest run test/reference/export-pins.test.ts`.
 * (Reference: the project's own earlier output; no outside source.)
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync, mkdirSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { exportRun, EXPORT_FORMATS } from '../../app/engine/export/runExport';

const root = path.resolve(__dirname, '../..');
const PIN_FILE = path.join(root, 'test/golden/export-pins.json');
const EXAMPLES = ['lumen6-imaging', 'tern12-reversal', 'kestrel60-momentum', 'petrel16-pointing'];
const SAMPLES = 101;

interface RunPin {
  hashes: Record<string, string>;
  /** t, q(4), ω(3), h(N) at SAMPLES evenly spaced sample indices. */
  samples: number[][];
}
type Pins = Record<string, Record<string, RunPin>>;

function sha(s: string): string {
  return createHash('sha256').update(s).digest('hex');
}

function currentPins(): Pins {
  const pins: Pins = {};
  for (const name of EXAMPLES) {
    const json = JSON.parse(readFileSync(path.join(root, 'assets', `${name}.scenario.json`), 'utf8'));
    const out = runPipeline(json);
    if (!out.ok) throw new Error(`${name} does not run`);
    pins[name] = {};
    for (const run of out.value.runs) {
      const hashes: Record<string, string> = {};
      for (const f of EXPORT_FORMATS) {
        const text = exportRun(f, run, out.value, {
          toolName: 'Slewsmith',
          toolVersion: '0.1.0',
          creationDateUtc: '2030-01-01T00:00:00Z',
        });
        if (!text.ok) throw new Error(`${name} ${run.key} ${f} refused`);
        hashes[f] = sha(text.value);
      }
      const tr = run.trace;
      const N = tr.nWheels;
      const samples: number[][] = [];
      for (let s = 0; s < SAMPLES; s++) {
        const k = Math.round((s * (tr.n - 1)) / (SAMPLES - 1));
        samples.push([
          tr.t[k]!,
          ...Array.from(tr.q.subarray(4 * k, 4 * k + 4)),
          ...Array.from(tr.omega.subarray(3 * k, 3 * k + 3)),
          ...Array.from(tr.hWheel.subarray(N * k, N * k + N)),
        ]);
      }
      pins[name][run.key] = { hashes, samples };
    }
  }
  return pins;
}

describe('pinned exports of the bundled examples', () => {
  const pins = currentPins();
  if (process.env.SLEWSMITH_UPDATE_PINS === '1' || !existsSync(PIN_FILE)) {
    mkdirSync(path.dirname(PIN_FILE), { recursive: true });
    writeFileSync(PIN_FILE, JSON.stringify(pins, null, 1) + '\n');
  }
  const pinned = JSON.parse(readFileSync(PIN_FILE, 'utf8')) as Pins;

  it('has the same runs as when pinned', () => {
    for (const name of EXAMPLES) expect(Object.keys(pins[name]!).sort()).toEqual(Object.keys(pinned[name]!).sort());
  });

  it('writes byte-identical CSV, JSON and AEM exports', () => {
    const changed: string[] = [];
    for (const name of EXAMPLES)
      for (const [key, pin] of Object.entries(pinned[name]!))
        for (const [f, h] of Object.entries(pin.hashes)) if (pins[name]![key]?.hashes[f] !== h) changed.push(`${name} ${key} ${f}`);
    expect(changed).toEqual([]);
  });

  it('keeps the physical channels within 1e-9 (relative to each channel’s scale) of the pinned run', () => {
    const worst: string[] = [];
    for (const name of EXAMPLES)
      for (const [key, pin] of Object.entries(pinned[name]!)) {
        const now = pins[name]![key]!.samples;
        const cols = pin.samples[0]!.length;
        for (let c = 0; c < cols; c++) {
          let scale = 0;
          for (const row of pin.samples) scale = Math.max(scale, Math.abs(row[c]!));
          for (let s = 0; s < pin.samples.length; s++) {
            const d = Math.abs(now[s]![c]! - pin.samples[s]![c]!);
            if (d > 1e-9 * Math.max(scale, 1e-12)) worst.push(`${name} ${key} sample ${s} column ${c}: ${d.toExponential(2)}`);
          }
        }
      }
    expect(worst.slice(0, 10)).toEqual([]);
  });
});
