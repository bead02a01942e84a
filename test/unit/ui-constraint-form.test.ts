/**
 * The Constraints panel's words and starting values (app/ui/constraintForms.ts) against the
 * engine's own validator (scenario/validate.ts): a new constraint is valid as added, every
 * direction kind's starting values pass the schema, names stay unique, and each problem the
 * engine reports for a constraint is named with the form's label at its own field, with a
 * suggestion that clears it.
 */
import { describe, expect, it } from 'vitest';
import { validateScenario } from '../../app/engine/scenario/validate';
import { presentIssues } from '../../app/ui/issues/present';
import { CONSTRAINT_FIELDS, DIRECTION_CHOICES, directionDefaults, newConstraint } from '../../app/ui/constraintForms';
import { parsePath, setIn } from '../../app/ui/store/paths';
import demo from '../../assets/lumen6-imaging.scenario.json';

const withConstraints = (list: unknown[]) => ({ ...demo, constraints: list });

describe('constraint form', () => {
  it('adds a valid keep-out constraint with a unique name', () => {
    const a = newConstraint([]);
    const b = newConstraint([a]);
    expect(a.name).toBe('Cone 1');
    expect(b.name).toBe('Cone 2');
    expect(newConstraint([{ name: 'Cone 2' }]).name).toBe('Cone 3');
    const v = validateScenario(withConstraints([a, b]));
    expect(v.ok ? [] : v.errors).toEqual([]);
  });

  it('starting values of every fixed, Sun and Moon direction pass the schema', () => {
    for (const c of DIRECTION_CHOICES) {
      const v = validateScenario(withConstraints([{ ...newConstraint([]), direction: directionDefaults(c.value) }]));
      const errors = v.ok ? [] : v.errors;
      // Earth and station directions need an orbit (the demo has none): the engine says so, at the direction.
      if (['fixed', 'sun', 'moon'].includes(c.value)) expect(errors, c.value).toEqual([]);
      else
        expect(
          errors.every((e) => e.path.startsWith('constraints[0]')),
          c.value,
        ).toBe(true);
    }
    expect(directionDefaults('ground-station')).toEqual({ kind: 'ground-station', latitudeDeg: 0, longitudeDeg: 0, altitudeM: 0 });
  });

  const cases: [string, unknown, string][] = [
    ['halfAngleDeg', 190, CONSTRAINT_FIELDS.halfAngleDeg],
    ['marginDeg', -1, CONSTRAINT_FIELDS.marginDeg],
    ['bodyAxis', [0, 0, 0], CONSTRAINT_FIELDS.bodyAxis],
    ['name', '', CONSTRAINT_FIELDS.name],
    ['window', { startS: 50, endS: 10 }, CONSTRAINT_FIELDS.endS],
    ['direction', { kind: 'fixed', inertialDirection: [0, 0, 0] }, CONSTRAINT_FIELDS.inertialDirection],
  ];
  for (const [key, bad, label] of cases)
    it(`names a bad ${key} with the form's label “${label}”`, () => {
      const json = withConstraints([newConstraint([]), { ...newConstraint([]), name: 'Second', [key]: bad }]);
      const v = validateScenario(json);
      expect(v.ok).toBe(false);
      const shown = presentIssues(v.ok ? [] : v.errors, json);
      expect(shown).toHaveLength(1);
      const p = shown[0]!;
      expect(p.path.startsWith('constraints[1]')).toBe(true);
      expect(p.label).toBe(label);
      expect(p.title).toBe(`Constraints › constraint 2${key === 'name' ? '' : ' “Second”'} › ${label}`);
      expect(p.text).not.toMatch(/constraints\[/);
      if (p.suggestion !== null) {
        const fixed = setIn(json, parsePath(p.path), JSON.parse(p.suggestion));
        const again = validateScenario(fixed);
        expect((again.ok ? [] : again.errors).filter((e) => e.path === p.path)).toEqual([]);
      }
    });
});
