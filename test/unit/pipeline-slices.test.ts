/**
 * A pass shared by several workers (runPipeline's runSlice + mergeRunSlices) gives the output one
 * worker gives: same runs in the same order, same comparison and best marks, bit for bit.
 * (Plumbing, no outside source: the reference is the undivided pass itself.)
 */
import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { mergeRunSlices, sliceLength } from '../../app/engine/pipeline/slices';
import type { PipelineOutput } from '../../app/engine/pipeline/types';

const load = (f: string): unknown => JSON.parse(fs.readFileSync(new URL(`../../assets/${f}`, import.meta.url), 'utf8'));
const value = (r: ReturnType<typeof runPipeline>): PipelineOutput => {
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
};
const sameButTime = (a: PipelineOutput, b: PipelineOutput) => expect({ ...a, elapsedMs: 0 }).toEqual({ ...b, elapsedMs: 0 });

describe('runSlice / mergeRunSlices', () => {
  it('sliceLength counts the runs of each slice (k ≡ index mod of)', () => {
    expect([0, 1, 2].map((index) => sliceLength(7, { index, of: 3 }))).toEqual([3, 2, 2]);
    expect(sliceLength(1, { index: 1, of: 2 })).toBe(0);
    expect(sliceLength(0, { index: 0, of: 1 })).toBe(0);
  });

  for (const file of ['lumen6-imaging.scenario.json', 'tern12-reversal.scenario.json']) {
    const json = load(file);
    const whole = value(runPipeline(json));
    for (const of of [2, 3, 4]) {
      it(`${file}: ${of} slices merge to the undivided pass`, () => {
        const parts = Array.from({ length: of }, (_, index) => value(runPipeline(json, { runSlice: { index, of } })));
        expect(parts.reduce((n, p) => n + p.runs.length, 0)).toBe(whole.runs.length);
        sameButTime(mergeRunSlices(parts), whole);
      });
    }
  }

  it('a slice outside [0, of) is refused naming the field', () => {
    const r = runPipeline(load('lumen6-imaging.scenario.json'), { runSlice: { index: 2, of: 2 } });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.path).toBe('runSlice.index');
  });
});
