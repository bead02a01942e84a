/**
 * `slewsmith certify`: the synergy-gap certificate of each selected synergistic controller, on
 * SO(3) (the full-attitude family) or on the sphere S² (the pointing family,
 * control/sphere/certificate.ts); the S² gap is printed rounded DOWN (shownGap.ts).
 *
 * Exit status by what failed, never by the wording of a message:
 * - 2, invalid input: the scenario does not validate, the vehicle cannot be built, a controller's
 *   own specification is refused (a hysteresis ≤ 0 or ≥ 1 is a bad number, not a certificate
 *   verdict), an unknown --controller id, or no synergistic controller to certify;
 * - 1, certificate refused: only what the certificate itself reports (`certified` or `admissible`
 *   false in its result). Each controller is built with `requireCertificate: false` so that its
 *   certificate is always computed and returned rather than turned into build errors.
 */
import { loadScenario } from '../../app/engine/scenario/load';
import { buildVehicle } from '../../app/engine/pipeline/build';
import { buildController } from '../../app/engine/control/registry';
import type { CertificateResult } from '../../app/engine/control/certificate';
import type { SphereCertificateResult } from '../../app/engine/control/sphere/certificate';
import { gapShownDown } from '../../app/engine/control/sphere/shownGap';
import { DEG_PER_RAD } from '../../app/engine/units';
import type { Issue } from '../../app/engine/errors';
import { fmtBelow } from '../../app/engine/control/certificateCritical';
import type { ParsedArgs } from './args';
import { printIssues, type CliContext } from './io';

type Certified =
  | { id: string; label: string; space: 'SO(3)'; certificate: CertificateResult }
  | { id: string; label: string; space: 'S2'; certificate: SphereCertificateResult };

/** The S² certificate: δ* (rounded down, with its bound) and every undesired critical point of every member. */
function printSphere(c: Certified & { space: 'S2' }, json: boolean, ctx: CliContext): void {
  const { io } = ctx;
  const k = c.certificate;
  if (json) {
    io.out(JSON.stringify({ controller: c.id, space: 'S2', ...k }, null, 2));
    return;
  }
  io.out(`${c.label} [${c.id}] (pointing family on the sphere S²): ${k.summary}`);
  io.out(
    `  δ* ≥ ${gapShownDown(k.deltaStar, k.deltaStarTolerance, 6)} (δ* = ${k.deltaStar} ± ${k.deltaStarTolerance.toExponential(1)}, shown rounded down), δ = ${k.delta}, margin ${k.margin.toFixed(6)}, recommended δ ≈ ${gapShownDown(k.recommendedDelta, 0, 4)}`,
  );
  io.out(`  diffeomorphism margin min(1 + k uᵀ(b × y)) = ${k.diffeomorphismMargin.toFixed(6)}`);
  io.out('  undesired critical points (member p, warp angle θ*, pointing error, V at the point, gap μ, jump to):');
  for (const cp of k.criticalPoints.filter((p) => p.kind === 'undesired'))
    io.out(
      `    p=${cp.member}  θ*=${cp.warpAngle.toFixed(6)}  φ=${(cp.pointingAngleRad * DEG_PER_RAD).toFixed(4)}°  V=(${cp.potentials.map((v) => v.toFixed(6)).join(', ')})  μ=${cp.gap.toFixed(6)}  → ${cp.jumpTo}`,
    );
  for (const w of k.warnings) io.err(`warning: ${w.message}`);
}

function print(c: Certified, json: boolean, ctx: CliContext): void {
  if (c.space === 'S2') return printSphere(c, json, ctx);
  const { io } = ctx;
  const k = c.certificate;
  if (json) {
    io.out(JSON.stringify({ controller: c.id, ...k }, null, 2));
    return;
  }
  io.out(`${c.label} [${c.id}]: ${k.summary}`);
  io.out(
    `  δ* = ${fmtBelow(k.deltaStar)}… (rounded down; ±${k.deltaStarTolerance.toExponential(1)}), δ = ${k.delta}, margin ${k.margin.toFixed(6)}, recommended δ ≈ ${k.recommendedDelta.toFixed(4)}`,
  );
  io.out(`  diffeomorphism margin min(1 + gᵀu) = ${k.diffeomorphismMargin.toFixed(6)}`);
  const rows = k.criticalPoints.filter((cp) => cp.target > 0);
  io.out('  undesired critical points (member q, Φ critical point i, warp angle θ*, V at the point, gap μ, jump to):');
  for (const cp of rows)
    io.out(
      `    q=${cp.member} i=${cp.target}  θ*=${cp.warpAngle.toFixed(6)}  V=(${cp.potentials.map((v) => v.toFixed(6)).join(', ')})  μ=${cp.gap.toFixed(6)}  → ${cp.jumpTo}`,
    );
  for (const w of k.warnings) io.err(`warning: ${w.message}`);
}

export async function runCertify(file: string, json: unknown, a: ParsedArgs, ctx: CliContext): Promise<number> {
  const { io } = ctx;
  const invalid = (errors: readonly Issue[]) => {
    printIssues(io, `${file} is not valid (invalid input, not a certificate verdict)`, errors);
    return 2;
  };
  const loaded = loadScenario(json);
  if (!loaded.ok) return invalid(loaded.errors);
  const s = loaded.value;
  const vehicle = buildVehicle(s.vehicle);
  if (!vehicle.ok) return invalid(vehicle.errors);
  const only = a.lists.controller;
  const unknown = (only ?? []).filter((id) => !s.controllers.some((c) => c.id === id));
  if (unknown.length)
    return invalid(
      unknown.map((id) => ({
        path: 'controllers',
        rule: 'unknown-id',
        message: `no controller with id "${id}" in the scenario (have: ${s.controllers.map((c) => c.id).join(', ')})`,
      })),
    );
  const errors: Issue[] = [];
  const certified: Certified[] = [];
  s.controllers.forEach((c, i) => {
    if (only && !only.includes(c.id)) return;
    const built = buildController({ ...c, requireCertificate: false }, vehicle.value.design, `controllers[${i}]`);
    if (!built.ok) errors.push(...built.errors);
    else if (built.value.certificate) certified.push({ id: c.id, label: c.label, space: 'SO(3)', certificate: built.value.certificate });
    else if (built.value.sphereCertificate)
      certified.push({ id: c.id, label: c.label, space: 'S2', certificate: built.value.sphereCertificate });
  });
  if (errors.length) return invalid(errors);
  if (certified.length === 0) {
    io.err('error: no synergistic controller (synergistic or pointing-synergistic) in the selection: nothing to certify');
    return 2;
  }
  let status = 0;
  for (const c of certified) {
    print(c, a.flags.has('json'), ctx);
    const k = c.certificate;
    if (!k.certified || !k.admissible) {
      status = 1;
      if (k.issues.length) printIssues(io, `certificate refused for ${c.label} [${c.id}]`, k.issues);
      else io.err(`certificate refused for ${c.label} [${c.id}]`);
    }
  }
  return status;
}
