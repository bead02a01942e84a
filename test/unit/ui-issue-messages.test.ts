/**
 * Issue messages in the form's words (app/ui/issues): for every bundled example and every leaf
 * field broken in turn (numbers made negative, huge or non-numbers, strings replaced), every issue
 * the engine's validators produce (scenario/validate.ts and the pipeline's preparation) maps to a
 * label the form shows, never a raw internal path; one presented message per field; no references
 * to documents the user cannot see; and a field's suggested value, put back into the field, clears
 * that field's own problem. The warp gain k = 5 of issue 10 (about 20 messages before) gives one.
 */
import { describe, expect, it } from 'vitest';
import { validateScenario } from '../../app/engine/scenario/validate';
import { preparePipeline } from '../../app/engine/pipeline/run';
import type { Issue } from '../../app/engine/errors';
import { describeField } from '../../app/ui/issues/fieldLabels';
import { presentIssues } from '../../app/ui/issues/present';
import { parsePath, setIn } from '../../app/ui/store/paths';
import lumen from '../../assets/lumen6-imaging.scenario.json';
import tern from '../../assets/tern12-reversal.scenario.json';
import kestrel from '../../assets/kestrel60-momentum.scenario.json';

type Json = unknown;

function leaves(v: Json, path = ''): { path: string; value: Json }[] {
  if (Array.isArray(v)) return v.flatMap((x, i) => leaves(x, `${path}[${i}]`));
  if (v && typeof v === 'object')
    return Object.entries(v as Record<string, Json>).flatMap(([k, x]) => leaves(x, path ? `${path}.${k}` : k));
  return [{ path, value: v }];
}

function issuesOf(json: Json): Issue[] {
  const v = validateScenario(json);
  if (!v.ok) return [...v.errors];
  const p = preparePipeline(json);
  return p.ok ? [] : [...p.errors];
}

function broken(value: Json): Json[] {
  if (typeof value === 'number') return [-1e9, 1e12, 'x'];
  if (typeof value === 'string') return ['', 'not-a-value'];
  if (typeof value === 'boolean') return ['x'];
  return [];
}

// Paths that are internal in every message: "controllers[2].hysteresis", "vehicle.wheels.x".
const INTERNAL_PATH = /\b(?:vehicle|initial|targets|controllers|planning|simulation|keepOut|study)(?:\[\d+\]|\.[A-Za-z]+)+/;

const EXAMPLES: [string, Json][] = [
  ['lumen6', lumen],
  ['tern12', tern],
  ['kestrel60', kestrel],
];

describe('issue messages in the form’s words', () => {
  for (const [name, example] of EXAMPLES) {
    it(`${name}: every issue from every broken field names a form field, once, without internal paths`, () => {
      expect(issuesOf(example)).toEqual([]);
      let broke = 0;
      const unmapped = new Set<string>();
      for (const leaf of leaves(example)) {
        for (const bad of broken(leaf.value)) {
          const json = setIn(example, parsePath(leaf.path), bad);
          const issues = issuesOf(json);
          if (issues.length === 0) continue;
          broke++;
          const shown = presentIssues(issues, json);
          // One message per field.
          expect(new Set(shown.map((s) => s.path)).size, leaf.path).toBe(shown.length);
          for (const s of shown) {
            if (describeField(s.path, json) === null) unmapped.add(s.path);
            expect(s.text, `${leaf.path} = ${String(bad)}`).not.toMatch(INTERNAL_PATH);
            expect(s.text).not.toMatch(/§/);
            for (const m of s.more) expect(m).not.toMatch(INTERNAL_PATH);
          }
        }
      }
      expect(broke).toBeGreaterThan(20);
      expect([...unmapped]).toEqual([]);
    });
  }

  it('gives one message for the warp gain k = 5, with the rule and a value that clears it', () => {
    const json = setIn(lumen, parsePath('controllers[2].warpGain'), 5);
    const issues = issuesOf(json);
    expect(issues.length).toBeGreaterThan(0);
    const shown = presentIssues(issues, json);
    const warp = shown.filter((s) => s.path === 'controllers[2].warpGain');
    expect(warp).toHaveLength(1);
    expect(shown.length).toBeLessThanOrEqual(2);
    const w = warp[0]!;
    expect(w.rule).toBeTruthy();
    expect(w.suggestion).not.toBeNull();
    const fixed = setIn(json, parsePath(w.path), JSON.parse(w.suggestion!));
    expect(issuesOf(fixed).filter((i) => i.path === w.path)).toEqual([]);
  });
});
