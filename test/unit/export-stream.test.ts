/**
 * Streamed exports (app/engine/export/chunks.ts): the chunks of every writer join to exactly the
 * text of its string wrapper; no chunk splits a line; the JSON layout is JSON.stringify's own
 * (ECMA-262 §25.5.2 JSON.stringify, the reference); a run that ended early says so in the header
 * of every format (issue 17 item 3), and the AEM with that note still passes its reader.
 */
import { describe, expect, it } from 'vitest';
import { CHUNK_CHARS, collectChunks, pipeChunks } from '../../app/engine/export/chunks';
import { csvChunks, writeCsv } from '../../app/engine/export/csv';
import { jsonChunks, writeJson } from '../../app/engine/export/json';
import { aemChunks, writeAem } from '../../app/engine/export/aem-write';
import { parseAem } from '../../app/engine/export/aem-read';
import { runEndNote } from '../../app/engine/pipeline/outcome';
import { exampleSummary } from './scenario-fixtures';
import { META, makeTrace } from './export-fixtures';

const s = exampleSummary('lumen6-imaging');
const q0 = [0.1, -0.2, 0.3, Math.sqrt(0.86)];
// Big enough for several chunks in every format (about 6,000 rows).
const big = makeTrace({ n: 6000, dt: 0.05, nWheels: 4, q0, omega: [0.01, -0.02, 0.03], segmentStarts: [300], jumpsAfter: [4000] });
const AEM = { creationDateUtc: '2030-03-13T08:00:00Z' };

function chunksOf(x: ReturnType<typeof csvChunks>): string[] {
  if (!x.ok) throw new Error(JSON.stringify(x.errors));
  const parts: string[] = [];
  const r = pipeChunks(x.value, (c) => parts.push(c));
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return parts;
}

describe('chunked writers', () => {
  it('CSV: several chunks, each whole lines of about CHUNK_CHARS, joined equal to writeCsv', () => {
    const parts = chunksOf(csvChunks(big, s, META));
    expect(parts.length).toBeGreaterThan(3);
    for (const p of parts) expect(p.endsWith('\n')).toBe(true);
    for (const p of parts.slice(0, -1)) expect(p.length).toBeLessThan(2 * CHUNK_CHARS);
    const whole = writeCsv(big, s, META);
    expect(whole.ok && whole.value).toBe(parts.join(''));
  });

  it('JSON: chunks join to a document equal to JSON.stringify of its parse, compact and indented', () => {
    for (const indent of [0, 2]) {
      const parts = chunksOf(jsonChunks(big, s, META, { indent }));
      expect(parts.length).toBeGreaterThan(3);
      const text = parts.join('');
      // Reference layout: the built-in JSON.stringify with the same indentation (ECMA-262 §25.5.2).
      expect(text).toBe(JSON.stringify(JSON.parse(text), null, indent || undefined) + '\n');
      const doc = JSON.parse(text) as { channels: Record<string, number[]>; samples: { count: number } };
      expect(doc.channels.t_s!.length).toBe(big.n);
      expect(doc.channels.t_s![big.n - 1]).toBe(big.t[big.n - 1]);
      const whole = writeJson(big, s, META, { indent });
      expect(whole.ok && whole.value).toBe(text);
    }
  });

  it('AEM: chunks join to writeAem, and the streamed read-back agrees with parseAem', () => {
    const parts = chunksOf(aemChunks(big, s, META, AEM));
    expect(parts.length).toBeGreaterThan(1);
    const whole = writeAem(big, s, META, AEM);
    expect(whole.ok && whole.value).toBe(parts.join(''));
    const doc = parseAem(parts.join(''));
    expect(doc.ok).toBe(true);
  });

  it('collectChunks refuses text past its limit naming the sample rate, instead of a V8 "Invalid string length"', () => {
    const r = collectChunks(csvChunks(big, s, META), 1000);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.path).toBe('options.sampleRateHz');
  });
});

describe('a run that ended early says so in every export (issue 17 item 3)', () => {
  const small = makeTrace({ n: 101, dt: 0.1, nWheels: 4, q0, omega: [0.01, -0.02, 0.03] });
  const note = runEndNote({
    outcome: { status: 'max-steps', message: 'stopped at the step limit (1000 steps)', t: 10, j: 0, plannedEndS: 2278 },
  })!;
  const meta = { ...META, incomplete: note };

  it('runEndNote: none for a completed run, TRUNCATED for a step cap, FAILED for a non-finite value', () => {
    expect(runEndNote({ outcome: { status: 'completed', message: 'done', t: 5, j: 0 } })).toBeUndefined();
    expect(note.startsWith('RUN TRUNCATED at t = 10 s of a planned 2278 s')).toBe(true);
    const f = runEndNote({ outcome: { status: 'non-finite', message: 'torqueCmdBody is NaN at t = 3 s', t: 3, j: 0 } });
    expect(f?.startsWith('RUN FAILED')).toBe(true);
  });

  it('CSV: a comment line right after the caution', () => {
    const r = writeCsv(small, s, meta);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const lines = r.value.split('\n');
    expect(lines[2]).toBe(`# ${note}`);
    expect(writeCsv(small, s, META).ok && (writeCsv(small, s, META) as { value: string }).value).not.toContain('RUN TRUNCATED');
  });

  it('JSON: an "incomplete" member; absent for a complete run', () => {
    const r = writeJson(small, s, meta);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect((JSON.parse(r.value) as { incomplete?: string }).incomplete).toBe(note);
    const c = writeJson(small, s, META);
    expect(c.ok && 'incomplete' in (JSON.parse(c.value) as object)).toBe(false);
  });

  it('AEM: COMMENT lines carrying the whole sentence within the KVN line limit, and the file still parses', () => {
    const r = writeAem(small, s, meta, AEM);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const comments = r.value
      .split('\n')
      .filter((l) => l.startsWith('COMMENT '))
      .map((l) => l.slice(8));
    const start = comments.findIndex((c) => c.startsWith('RUN TRUNCATED'));
    expect(start).toBeGreaterThan(0);
    expect(comments.slice(start).join(' ')).toContain(note);
    expect(parseAem(r.value).ok).toBe(true);
  });
});
