/**
 * Stage 3 of the pipeline, build: the resolved vehicle → engine objects (inertia with its
 * physical checks, wheel array, gyrostat, torque and momentum envelopes, the design model its
 * controllers know), and the resolved controllers → laws behind one interface, each through its
 * registry entry (the synergistic law only with an admissible certificate). Problems are
 * reported with the scenario file's own field paths.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { validateInertia } from '../body/inertia';
import { makeGyrostat } from '../body/gyrostat';
import { makeWheelArray } from '../wheels/array';
import { envelopeCapacity, momentumEnvelope, torqueEnvelope } from '../wheels/envelope';
import { buildController, gainNoteOf, lawDefinition } from '../control/registry';
import type { DesignModel } from '../control/types';
import { m3ToRows, v3Create } from '../math/mat3';
import type { ResolvedController, ResolvedVehicle } from '../scenario/resolve';
import type { BuiltController, Vehicle } from './types';

/** Prefix issue paths from a sub-builder with the scenario field they came from. */
function rebase(issues: readonly Issue[], from: string, to: string): Issue[] {
  return issues.map((i) => ({
    ...i,
    path: i.path.startsWith(from) ? to + i.path.slice(from.length) : `${to}.${i.path}`,
    message: i.message.split(from).join(to),
  }));
}

/** Stage 3a: the vehicle. */
export function buildVehicle(v: ResolvedVehicle): Result<Vehicle> {
  const errors: Issue[] = [];
  const warnings: Issue[] = [];
  const inertia = validateInertia(m3ToRows(v.inertiaKgm2), 'vehicle.inertiaKgm2');
  if (!inertia.ok) errors.push(...inertia.errors);
  else warnings.push(...inertia.warnings);
  const wheelPath = v.wheelLayout === 'custom' ? 'vehicle.wheels.wheels' : 'vehicle.wheels';
  const wheels = makeWheelArray(v.wheels, wheelPath);
  if (!wheels.ok) errors.push(...wheels.errors);
  else warnings.push(...wheels.warnings);
  if (!inertia.ok || !wheels.ok) return fail(errors, warnings);

  const fr = v.wheelFriction;
  const plant = makeGyrostat(
    inertia.value.J,
    wheels.value,
    fr ? { viscousNmsPerRad: fr.viscousNmPerRadPerS, coulombNm: fr.coulombNm } : undefined,
  );
  if (!plant.ok)
    return fail(
      rebase(plant.errors, 'wheels', 'vehicle.wheels').map((i) =>
        i.path.startsWith('vehicle.wheels.inertia') ? { ...i, path: 'vehicle.inertiaKgm2' } : i,
      ),
      warnings,
    );
  // What the controllers and the planner believe: the model inertia when the file gives one.
  let Jdesign = plant.value.Jperp;
  if (v.modelInertiaKgm2) {
    const model = validateInertia(m3ToRows(v.modelInertiaKgm2), 'vehicle.modelInertiaKgm2');
    const modelPlant = model.ok ? makeGyrostat(model.value.J, wheels.value) : null;
    if (!model.ok) return fail(model.errors, warnings);
    if (!modelPlant || !modelPlant.ok)
      return fail(modelPlant ? rebase(modelPlant.errors, 'wheels', 'vehicle.modelInertiaKgm2') : [], warnings);
    Jdesign = modelPlant.value.Jperp;
  }
  const torqueZ = torqueEnvelope(wheels.value);
  const momentumZ = momentumEnvelope(wheels.value);
  // The eigenaxis law's per-axis torque limit: the envelope's capacity along body x, y, z.
  const axisTorque = v3Create(
    envelopeCapacity(torqueZ, [1, 0, 0]),
    envelopeCapacity(torqueZ, [0, 1, 0]),
    envelopeCapacity(torqueZ, [0, 0, 1]),
  );
  const design: DesignModel = { Jperp: Jdesign, nWheels: wheels.value.n, axes: wheels.value.axes, bodyAxisTorqueNm: axisTorque };
  return ok(
    {
      name: v.name,
      inertia: inertia.value,
      wheels: wheels.value,
      plant: plant.value,
      torqueEnvelope: torqueZ,
      momentumEnvelope: momentumZ,
      design,
      frictionFeedforward: fr?.compensatedFraction ?? 0,
    },
    [...warnings, ...plant.warnings],
  );
}

/** One controller for a design model; refusals name `controllers[index]`'s fields. */
export function buildOneController(c: ResolvedController, index: number, design: DesignModel): Result<BuiltController> {
  const r = buildController(c, design, `controllers[${index}]`);
  if (!r.ok) return fail(r.errors, r.warnings);
  return ok(
    {
      id: c.id,
      label: c.label,
      law: c.law,
      logicKind: lawDefinition(c.law).logicKind,
      liftDependent: lawDefinition(c.law).liftDependent,
      controller: r.value,
      gainNote: gainNoteOf(c, design),
    },
    r.warnings,
  );
}

/** Stage 3b: the controllers (all, or only the ids in `only`), built for the vehicle's design model. */
export function buildControllers(
  list: readonly ResolvedController[],
  design: DesignModel,
  only?: readonly string[],
): Result<BuiltController[]> {
  const errors: Issue[] = [];
  const warnings: Issue[] = [];
  const out: BuiltController[] = [];
  list.forEach((c, i) => {
    if (only && !only.includes(c.id)) return;
    const r = buildOneController(c, i, design);
    if (!r.ok) errors.push(...r.errors);
    else out.push(r.value);
    warnings.push(...r.warnings);
  });
  if (only)
    for (const id of only)
      if (!list.some((c) => c.id === id))
        errors.push({
          path: 'controllers',
          rule: 'unknown-id',
          message: `no controller with id "${id}" in the scenario (have: ${list.map((c) => c.id).join(', ')})`,
        });
  return errors.length ? fail(errors, warnings) : ok(out, warnings);
}
