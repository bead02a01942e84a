/**
 * Exporters over random traces: valid ones always write, and the AEM reads back to the printed
 * precision with one hemisphere; corrupted ones (a NaN, a time step back, a non-unit quaternion
 * anywhere) always fail without text, never throw. Properties of our own contract.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { writeAem } from '../../app/engine/export/aem-write';
import { parseAem } from '../../app/engine/export/aem-read';
import { writeCsv } from '../../app/engine/export/csv';
import { writeJson } from '../../app/engine/export/json';
import { qCreate, qRandomUniform } from '../../app/engine/math/rotation';
import { makeRng } from '../../app/engine/math/prng';
import { exampleSummary } from '../unit/scenario-fixtures';
import { META, makeTrace } from '../unit/export-fixtures';

const res = { ok: true as const, value: exampleSummary('tern12-reversal') };
if (!res.ok) throw new Error('fixture');
const scenario = res.value;

function randomTrace(seed: number, n: number, dt: number, nJumps: number) {
  const rng = makeRng(seed, 9);
  const q0 = qRandomUniform(qCreate(), rng);
  const omega = [0.2 * rng.normal(), 0.2 * rng.normal(), 0.2 * rng.normal()];
  const jumpsAfter = Array.from({ length: nJumps }, () => Math.floor(rng.next() * n));
  const tr = makeTrace({ n, dt, nWheels: 3, q0, omega, jumpsAfter, segmentStarts: [n * dt * rng.next()] });
  // Random sign flips: the writer must restore one hemisphere.
  for (let k = 0; k < tr.n; k++) if (rng.next() < 0.3) for (let i = 0; i < 4; i++) tr.q[4 * k + i] = -tr.q[4 * k + i]!;
  return tr;
}

describe('random traces', () => {
  it('valid traces: all three writers succeed; the AEM round-trips in one hemisphere', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 1e6 }),
        fc.integer({ min: 1, max: 80 }),
        fc.constantFrom(0.001, 0.05, 0.1, 1, 7.3),
        fc.integer({ min: 0, max: 3 }),
        (seed, n, dt, nJ) => {
          const tr = randomTrace(seed, n, dt, nJ);
          expect(writeCsv(tr, scenario, META).ok).toBe(true);
          expect(writeJson(tr, scenario, META).ok).toBe(true);
          const r = writeAem(tr, scenario, META, { creationDateUtc: '2031-06-01T00:00:00Z' });
          if (!r.ok) throw new Error(JSON.stringify(r.errors));
          const doc = parseAem(r.value);
          if (!doc.ok) throw new Error(JSON.stringify(doc.errors));
          const lines = doc.value.segments.flatMap((g) => g.lines);
          for (let i = 1; i < lines.length; i++) {
            const a = lines[i - 1]!.values,
              b = lines[i]!.values;
            expect(a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]! + a[3]! * b[3]!).toBeGreaterThan(0);
          }
          for (const l of lines) {
            const t = l.time.unixS - scenario.epochUnixMs / 1000;
            let k = 0;
            while (Math.abs(tr.t[k]! - t) > 5e-4) k++;
            const s = Math.sign(
              l.values[0]! * tr.q[4 * k]! +
                l.values[1]! * tr.q[4 * k + 1]! +
                l.values[2]! * tr.q[4 * k + 2]! +
                l.values[3]! * tr.q[4 * k + 3]!,
            );
            for (let i = 0; i < 4; i++) expect(Math.abs(l.values[i]! - s * tr.q[4 * k + i]!)).toBeLessThanOrEqual(0.5e-10 + 1e-15);
          }
        },
      ),
      { numRuns: 150, seed: 42 },
    );
  });

  it('a corrupted sample anywhere makes every writer fail without output, never throw', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 1e6 }),
        fc.integer({ min: 2, max: 60 }),
        fc.nat(),
        fc.constantFrom('nan', 'back', 'norm', 'inf-wheel'),
        (seed, n, pick, how) => {
          const tr = randomTrace(seed, n, 0.1, 0);
          const k = 1 + (pick % (tr.n - 1));
          if (how === 'nan') tr.torqueCmdBody[3 * k + (pick % 3)] = Number.NaN;
          else if (how === 'back') tr.t[k] = tr.t[k - 1]! - 0.01;
          else if (how === 'norm') tr.q[4 * k + 3]! += 0.01;
          else tr.hWheel[3 * k] = -Infinity;
          for (const r of [
            writeCsv(tr, scenario, META),
            writeJson(tr, scenario, META),
            writeAem(tr, scenario, META, { creationDateUtc: '2031-06-01T00:00:00Z' }),
          ]) {
            expect(r.ok).toBe(false);
            if (!r.ok) expect(r.errors.some((e) => e.path.startsWith('trace.') && e.path.includes(`[${k}]`))).toBe(true);
          }
        },
      ),
      { numRuns: 150, seed: 43 },
    );
  });

  it('parseAem never throws on random text or mangled AEMs', () => {
    const good = writeAem(randomTrace(1, 20, 0.1, 1), scenario, META, { creationDateUtc: '2031-06-01T00:00:00Z' });
    if (!good.ok) throw new Error('fixture');
    const text = good.value;
    fc.assert(
      fc.property(fc.string({ maxLength: 400 }), fc.nat(), fc.nat(), (junk, a, b) => {
        expect(() => parseAem(junk)).not.toThrow();
        const i = a % text.length,
          j = Math.min(text.length, i + (b % 60));
        const r = parseAem(text.slice(0, i) + junk + text.slice(j));
        if (!r.ok) for (const e of r.errors) expect(e.path).toMatch(/^line \d+$|^$/);
      }),
      { numRuns: 400, seed: 44 },
    );
  });
});
