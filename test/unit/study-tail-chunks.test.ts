/**
 * How the parallel study hands out its cases (study/parallel.ts): chunks of `chunkSize` in case
 * order, then the last workers × chunkSize cases one by one so the workers finish close together
 * (a scheduling choice, common practice, no source). Checked on in-thread ports that record every
 * chunk they are sent: each case is sent exactly once, the tail goes singly, and the result equals
 * the single-thread runner's (each case depends only on (seed, index)).
 */
import { describe, expect, it } from 'vitest';
import { inThreadPort, startStudyParallel, type StudyWorkerPort } from '../../app/engine/study/parallel';
import { runStudy } from '../../app/engine/study/runner';
import { testVehicleScenario } from './study-fixtures';

const json = testVehicleScenario({
  runs: 23,
  seed: 99,
  durationS: 30,
  stopAfterSettledForS: 5,
  controllers: ['pd'],
  dispersions: { initialAttitude: { mode: 'uniform' }, initialRateDegPerS: 0.05 },
});

function recordingPorts(n: number, sent: number[][]): StudyWorkerPort[] {
  return Array.from({ length: n }, () => {
    const p = inThreadPort();
    return {
      post: (m) => {
        if (m.type === 'run') sent.push(m.indices.slice());
        p.post(m);
      },
      listen: (a, b) => p.listen(a, b),
    };
  });
}

describe('parallel study chunks', () => {
  for (const [workers, chunkSize] of [
    [2, 4],
    [3, 2],
    [2, 30],
  ] as const) {
    it(`${workers} workers, chunks of ${chunkSize}: every case once, the last ${workers * chunkSize} one by one`, async () => {
      const sent: number[][] = [];
      const r = await startStudyParallel(json, recordingPorts(workers, sent), { chunkSize }).result;
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      const all = sent.flat().sort((a, b) => a - b);
      expect(all).toEqual(Array.from({ length: 23 }, (_, i) => i));
      const tail = Math.min(23, workers * chunkSize);
      const singles = sent.filter((c) => c.length === 1).flat();
      expect(singles.slice(-tail)).toEqual(Array.from({ length: tail }, (_, i) => 23 - tail + i));
      for (const c of sent) expect(c.length).toBeLessThanOrEqual(chunkSize);
      const ref = runStudy(json);
      if (!ref.ok) throw new Error('study refused');
      expect(JSON.stringify(r.value.summary)).toBe(JSON.stringify(ref.value.summary));
    });
  }
});
