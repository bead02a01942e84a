/**
 * The constraint form's words and starting values (ConstraintsPanel.tsx and issues/fieldLabels.ts
 * share them, so a message names the field as the form labels it). Pure data.
 */
import type { Choice } from './components/fields';

/** Labels of the constraint form, keyed by the file key. */
export const CONSTRAINT_FIELDS = {
  name: 'Name',
  kind: 'Keep',
  bodyAxis: 'Body axis',
  halfAngleDeg: 'Half-angle',
  marginDeg: 'Margin',
  direction: 'Direction',
  inertialDirection: 'Inertial direction',
  latitudeDeg: 'Station latitude',
  longitudeDeg: 'Station longitude',
  altitudeM: 'Station altitude',
  startS: 'Window start',
  endS: 'Window end',
} as const;

export const DIRECTION_CHOICES: readonly Choice[] = [
  { value: 'fixed', label: 'Fixed inertial direction' },
  { value: 'sun', label: 'Sun' },
  { value: 'moon', label: 'Moon' },
  { value: 'earth-centre', label: 'Earth centre (needs an orbit)' },
  { value: 'earth-limb', label: 'Earth limb (needs an orbit)' },
  { value: 'ground-station', label: 'Ground station (needs an orbit)' },
];

/** The direction object of a kind with starting values for its own fields. */
export function directionDefaults(kind: string): Record<string, unknown> {
  if (kind === 'fixed') return { kind, inertialDirection: [1, 0, 0] };
  if (kind === 'ground-station') return { kind, latitudeDeg: 0, longitudeDeg: 0, altitudeM: 0 };
  return { kind };
}

/** A new keep-out constraint on +Z against the Sun, named so that it is unique in `existing`. */
export function newConstraint(existing: readonly unknown[]): Record<string, unknown> {
  const names = new Set(existing.map((c) => (c && typeof c === 'object' ? (c as Record<string, unknown>).name : undefined)));
  let k = existing.length + 1;
  while (names.has(`Cone ${k}`)) k++;
  return { name: `Cone ${k}`, kind: 'keep-out', bodyAxis: [0, 0, 1], halfAngleDeg: 30, marginDeg: 0, direction: directionDefaults('sun') };
}
