/**
 * Scenario (resolved, SI) → engine objects: inertia, wheel array, gyrostat, envelopes, plan
 * limits and controllers. Every problem found is reported with the scenario's own field path so
 * the UI can put the message beside the field that caused it.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { validateInertia, type InertiaInfo } from '../body/inertia';
import { makeGyrostat, type Gyrostat } from '../body/gyrostat';
import { makeWheelArray, type WheelArray, type WheelSpec } from '../wheels/array';
import { orthogonalTriad, pyramid } from '../wheels/presets';
import { envelopeCapacity, momentumEnvelope, torqueEnvelope, type Zonotope } from '../wheels/envelope';
import { makeController, type AttitudeController, type PlantModel } from '../control/index';
import { gainsFromBandwidth } from '../control/gains';
import type { ResolvedController, ResolvedScenario } from '../scenario/resolve';
import { m3ToRows } from '../math/mat3';
import type { PlanLimits } from '../plan/types';

export interface VehicleModel {
  inertia: InertiaInfo;
  wheels: WheelArray;
  plant: Gyrostat;
  torqueZ: Zonotope;
  momentumZ: Zonotope;
  plantModel: PlantModel;
}

export interface BuiltController {
  id: string;
  label: string;
  law: ResolvedController['law'];
  controller: AttitudeController;
  gainNote: string;
}

function wheelSpecs(s: ResolvedScenario): WheelSpec[] {
  const w = s.vehicle.wheels;
  if (w.layout === 'pyramid') {
    return pyramid({
      count: w.count,
      cantAngleRad: w.cantAngleRad,
      azimuthOffsetRad: w.azimuthOffsetRad,
      maxTorqueNm: w.maxTorqueNm,
      maxMomentumNms: w.maxMomentumNms,
      rotorInertiaKgm2: w.rotorInertiaKgm2,
    });
  }
  if (w.layout === 'triad') return orthogonalTriad(w);
  return w.wheels.map((x) => ({
    axis: Array.from(x.axis),
    maxTorqueNm: x.maxTorqueNm,
    maxMomentumNms: x.maxMomentumNms,
    rotorInertiaKgm2: x.rotorInertiaKgm2,
  }));
}

/** Prefix issue paths from a sub-builder with the scenario field they came from. */
function rebase(issues: readonly Issue[], from: string, to: string): Issue[] {
  return issues.map((i) => ({
    ...i,
    path: i.path.startsWith(from) ? to + i.path.slice(from.length) : `${to}.${i.path}`,
    message: i.message.split(from).join(to),
  }));
}

export function buildVehicle(
  s: ResolvedScenario,
  overrides?: { wheelSpecs?: WheelSpec[]; inertiaRows?: number[][] },
): Result<VehicleModel> {
  const errors: Issue[] = [];
  const warnings: Issue[] = [];
  const rows = overrides?.inertiaRows ?? m3ToRows(s.vehicle.inertiaKgm2);
  const inertia = validateInertia(rows, 'vehicle.inertiaKgm2');
  if (!inertia.ok) errors.push(...inertia.errors);
  else warnings.push(...inertia.warnings);
  const specs = overrides?.wheelSpecs ?? wheelSpecs(s);
  const wheelPath = s.vehicle.wheels.layout === 'custom' ? 'vehicle.wheels.wheels' : 'vehicle.wheels';
  const wheels = makeWheelArray(specs, wheelPath);
  if (!wheels.ok) errors.push(...wheels.errors);
  else warnings.push(...wheels.warnings);
  if (!inertia.ok || !wheels.ok) return fail(errors, warnings);

  const fr = s.vehicle.wheelFriction;
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
  const torqueZ = torqueEnvelope(wheels.value);
  const momentumZ = momentumEnvelope(wheels.value);
  return ok(
    {
      inertia: inertia.value,
      wheels: wheels.value,
      plant: plant.value,
      torqueZ,
      momentumZ,
      plantModel: { Jperp: plant.value.Jperp, nWheels: wheels.value.n, axes: wheels.value.axes },
    },
    [...warnings, ...plant.warnings],
  );
}

export function planLimits(s: ResolvedScenario, v: VehicleModel): PlanLimits {
  return {
    torqueCapacity: (d) => envelopeCapacity(v.torqueZ, d),
    momentumCapacity: (d) => envelopeCapacity(v.momentumZ, d),
    torqueMargin: s.planning.torqueMargin,
    momentumMargin: s.planning.momentumMargin,
    slewRateLimitRadPerS: s.planning.slewRateLimitRadPerS > 0 ? s.planning.slewRateLimitRadPerS : undefined,
  };
}

/**
 * The scenario file's controller entry → the control module's spec. The file's generic gain
 * names map per law: {kp, kd} are k_p/k_d for the quaternion laws, k/c of the inertia-normalised
 * eigenaxis loop, and k_R/K_ω for the synergistic law; {bandwidthRadPerS, dampingRatio} map to
 * ω_n, ζ (see control/gains.ts for what they imply).
 */
export function controllerSpec(c: ResolvedController, v: VehicleModel): Record<string, unknown> {
  const g = c.gains;
  const names: Record<string, [string, string]> = {
    'quaternion-pd': ['kp', 'kd'],
    'sign-switch': ['kp', 'kd'],
    hysteretic: ['kp', 'kd'],
    eigenaxis: ['k', 'c'],
    synergistic: ['kR', 'kOmega'],
  };
  const [sn, dn] = names[c.law]!;
  const gains = g.form === 'kp-kd' ? { [sn]: g.kp, [dn]: g.kd } : { omegaN: g.bandwidthRadPerS, zeta: g.dampingRatio };
  const base = { kind: c.law, label: c.label, gains };
  if (c.law === 'eigenaxis') {
    // Torque limit per body axis: the wheel envelope's capacity along each axis (the law's own
    // per-axis saturation; the wheel limiter still guards the delivered torque).
    const cap = [0, 1, 2].map((i) => envelopeCapacity(v.torqueZ, [i === 0 ? 1 : 0, i === 1 ? 1 : 0, i === 2 ? 1 : 0]));
    return { ...base, maxRateRadPerS: c.maxRateRadPerS, torqueLimitNm: cap };
  }
  if (c.law === 'hysteretic') return { ...base, hysteresis: c.hysteresis };
  if (c.law === 'synergistic') {
    const V = c.potentialAxes;
    return {
      ...base,
      potential: { eigenvalues: Array.from(c.potentialWeights), axes: [0, 1, 2].map((k) => [V[3 * k], V[3 * k + 1], V[3 * k + 2]]) },
      warpGain: c.warpGain,
      warpDirections: c.warpDirections.map((u) => Array.from(u)),
      hysteresis: c.hysteresis,
    };
  }
  return base;
}

export function buildControllers(s: ResolvedScenario, v: VehicleModel, only?: readonly string[]): Result<BuiltController[]> {
  const errors: Issue[] = [];
  const warnings: Issue[] = [];
  const out: BuiltController[] = [];
  s.controllers.forEach((c, i) => {
    if (only && !only.includes(c.id)) return;
    const path = `controllers[${i}]`;
    const r = makeController(controllerSpec(c, v), v.plantModel, path);
    if (!r.ok) {
      errors.push(...r.errors);
      return;
    }
    warnings.push(...r.warnings);
    out.push({ id: c.id, label: c.label, law: c.law, controller: r.value, gainNote: gainNote(c, v) });
  });
  if (only)
    for (const id of only)
      if (!s.controllers.some((c) => c.id === id))
        errors.push({
          path: 'controllers',
          rule: 'unknown-id',
          message: `no controller with id "${id}" in the scenario (have: ${s.controllers.map((c) => c.id).join(', ')})`,
        });
  return errors.length ? fail(errors, warnings) : ok(out, warnings);
}

function gainNote(c: ResolvedController, v: VehicleModel): string {
  const g = c.gains;
  if (g.form === 'bandwidth' && c.law !== 'synergistic') {
    const b = gainsFromBandwidth(v.plant.Jperp, g.bandwidthRadPerS, g.dampingRatio);
    if (c.law === 'eigenaxis')
      return `k = ${b.kEigen.toPrecision(3)} s⁻², c = ${b.cEigen.toPrecision(3)} s⁻¹ (ω_n ${g.bandwidthRadPerS} rad/s, ζ ${g.dampingRatio})`;
    return `k_p = ${b.kp.toPrecision(3)} N·m, k_d = ${b.kd.toPrecision(3)} N·m·s; asks ${(b.torqueAtErrorNm * 1e3).toPrecision(3)} mN·m at a 90° error`;
  }
  if (g.form === 'kp-kd') {
    const tau = c.law === 'quaternion-pd' || c.law === 'sign-switch' || c.law === 'hysteretic' ? g.kp * Math.SQRT1_2 : NaN;
    return Number.isFinite(tau) ? `asks ${(tau * 1e3).toPrecision(3)} mN·m at a 90° error (k_p sin 45°)` : `gains ${g.kp}, ${g.kd}`;
  }
  return `ω_n ${g.bandwidthRadPerS} rad/s, ζ ${g.dampingRatio}`;
}
