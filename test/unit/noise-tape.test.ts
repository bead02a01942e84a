/**
 * The sensor-noise tape (sim/noiseTape.ts): a study case's laws read one realisation of the
 * sensor noise instead of each drawing it again. Pinned bit for bit to the path it replaces:
 *  - measureFromTape against measure (sim/sensors.ts) drawing from its own generator, over random
 *    noise levels (each σ zero or not, so the generator's cached spare crosses samples when only
 *    one is drawn), biases with −0, the worst-case reflection on or off, and one tape reused by
 *    runs of different lengths (shorter, then longer than the tape so far) interleaved with runs of
 *    another seed, stream or σ (which must start it afresh): equal by Object.is at every sample;
 *  - flights: every law of dispersed tern12 and petrel16 cases flown with one shared tape against
 *    the same flights drawing their own noise: the same metrics, verdict and study row;
 *  - runCase with shareNoise (the default) against shareNoise: false: the same records.
 * Reference: the drawing path (measure over Rng) is the definition; the tape must change no bit.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { differences } from './exact-differences';
import { makeRng, type Rng } from '../../app/engine/math/prng';
import { measure, measureFromTape, type SensorModel } from '../../app/engine/sim/sensors';
import { SensorNoiseTape } from '../../app/engine/sim/noiseTape';
import { makeStudyContext } from '../../app/engine/study/context';
import { caseErrorGrid, caseRunOnline, prepareCase, runCase } from '../../app/engine/study/runCase';
import { flyOnline, onlineFlightPossible } from '../../app/engine/pipeline/flyOnline';

const root = path.resolve(__dirname, '../..');
const asset = (name: string): unknown => JSON.parse(fs.readFileSync(path.join(root, 'assets', name), 'utf8'));

function unitQuat(rng: Rng, out: Float64Array): void {
  let n = 0;
  while (n < 1e-3) {
    for (let i = 0; i < 4; i++) out[i] = rng.normal();
    n = Math.hypot(out[0]!, out[1]!, out[2]!, out[3]!);
  }
  for (let i = 0; i < 4; i++) out[i] = out[i]! / n;
}

describe('measureFromTape', () => {
  it('the same measured state as measure drawing its own noise, one tape shared by runs of any length', () => {
    const pick = makeRng(20261204, 25);
    const tape = new SensorNoiseTape();
    const qa = new Float64Array(4),
      qb = new Float64Array(4),
      wa = new Float64Array(3),
      wb = new Float64Array(3),
      qT = new Float64Array(4),
      wT = new Float64Array(3),
      qR = new Float64Array(4);
    let restarts = 0,
      reused = 0;
    let last = '';
    for (let trial = 0; trial < 60; trial++) {
      // Every third trial repeats the last inputs (a case's next law); the others change one of them.
      const family = Math.floor(trial / 3);
      const seed = 1000 + (family % 5);
      const stream = family % 3;
      const model: SensorModel = {
        attitudeSigmaRad: family % 4 === 1 ? 0 : 4e-5 * (1 + (family % 7)),
        rateSigmaRadPerS: family % 4 === 2 ? 0 : 9e-5 * (1 + (family % 3)),
        rateBiasRadPerS: [1e-5 * (family % 2), family % 2 ? -0 : 2e-6, 0],
        adversarialEta: family % 5 === 0 ? 0.04 : 0,
      };
      const key = `${seed}/${stream}/${model.attitudeSigmaRad}/${model.rateSigmaRadPerS}`;
      const before = tape.drawn;
      tape.begin(seed, stream, model.attitudeSigmaRad, model.rateSigmaRadPerS);
      if (key === last) {
        expect(tape.drawn).toBe(before);
        reused++;
      } else {
        expect(tape.drawn).toBe(0);
        restarts++;
      }
      last = key;
      const drawn = makeRng(seed, stream);
      // lengths 1…400: later runs of a family go both below and past what the tape holds
      const samples = 1 + ((trial * 137) % 400);
      for (let k = 0; k < samples; k++) {
        unitQuat(pick, qT);
        unitQuat(pick, qR);
        for (let i = 0; i < 3; i++) wT[i] = k % 17 === 0 ? -0 : 0.05 * pick.normal();
        measure(qa, wa, model, drawn, qT, wT, qR);
        measureFromTape(qb, wb, model, tape, k, qT, wT, qR);
        for (let i = 0; i < 4; i++) expect(Object.is(qa[i], qb[i]), `trial ${trial} sample ${k} q[${i}]`).toBe(true);
        for (let i = 0; i < 3; i++) expect(Object.is(wa[i], wb[i]), `trial ${trial} sample ${k} ω[${i}]`).toBe(true);
      }
      expect(tape.drawn).toBeGreaterThanOrEqual(samples);
    }
    expect(restarts).toBeGreaterThan(10);
    expect(reused).toBeGreaterThan(10);
  });
});

describe('a study case flown with a shared noise tape', () => {
  for (const [file, seed] of [
    ['tern12-reversal.scenario.json', 11],
    ['petrel16-pointing.scenario.json', 5],
  ] as const) {
    it(`${file}: every law reads the tape and flies as it would drawing its own noise`, () => {
      const c = makeStudyContext(asset(file), { runs: 40, seed });
      if (!c.ok) throw new Error(`${file} study context`);
      const ctx = c.value;
      const tape = new SensorNoiseTape();
      for (const i of [0, 3, 17, 38]) {
        const pc = prepareCase(ctx, i);
        if (!pc.ok) continue;
        expect(onlineFlightPossible(pc.prepared)).toBe(true);
        let longest = 0;
        for (const law of pc.prepared.controllers) {
          const shared = flyOnline(pc.prepared, law, ctx.def.mode, caseErrorGrid(ctx), undefined, tape);
          const own = flyOnline(pc.prepared, law, ctx.def.mode, caseErrorGrid(ctx));
          const where = `${file} case ${i} ${law.id}`;
          expect(differences(shared.metrics, own.metrics), where).toEqual([]);
          expect(shared.verdict, where).toEqual(own.verdict);
          expect(differences(caseRunOnline(ctx, pc.draw, shared), caseRunOnline(ctx, pc.draw, own)), where).toEqual([]);
          longest = Math.max(longest, shared.recorder.count);
        }
        // the laws read the tape: it holds the longest run's samples (the last may be an end state)
        expect(tape.drawn).toBeGreaterThanOrEqual(longest - 1);
        expect(tape.drawn).toBeGreaterThan(10);
      }
    });
  }

  it('runCase: the same records with the shared tape (default) and without', () => {
    const c = makeStudyContext(asset('tern12-reversal.scenario.json'), { runs: 50, seed: 11 });
    if (!c.ok) throw new Error('tern12 study context');
    for (const i of [1, 8, 23, 49]) {
      const a = runCase(c.value, i);
      const b = runCase(c.value, i, undefined, { shareNoise: false });
      expect(differences(a, b), `case ${i}`).toEqual([]);
    }
  });
});
