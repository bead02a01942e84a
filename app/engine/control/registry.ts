/**
 * The control laws Slewsmith knows, one registry entry each (laws/<law>/definition.ts). The
 * scenario file, the pipeline, the study and the UI all read a law's facts from here.
 */
import type { Issue, Result } from '../errors';
import type { LawDefinition, ParamsOf } from './definition';
import type { FileEntryOf } from './fileSchema';
import { eigenaxis } from './laws/eigenaxis/definition';
import { hysteretic } from './laws/hysteretic/definition';
import { quaternionPd } from './laws/quaternion-pd/definition';
import { signSwitch } from './laws/sign-switch/definition';
import { synergistic } from './laws/synergistic/definition';
import { pointingPd } from './laws/pointing-pd/definition';
import { pointingSynergistic } from './laws/pointing-synergistic/definition';
import type { ControllerCommon, ControllerParams, LawId } from './params';
import type { AttitudeController, DesignModel } from './types';

type Registry = { readonly [L in LawId]: LawDefinition<L> };

export const LAWS: Registry = {
  'quaternion-pd': quaternionPd,
  'sign-switch': signSwitch,
  eigenaxis,
  hysteretic,
  synergistic,
  'pointing-pd': pointingPd,
  'pointing-synergistic': pointingSynergistic,
};

/** Law ids in the order the UI offers them. */
export const LAW_IDS: readonly LawId[] = [
  'quaternion-pd',
  'sign-switch',
  'eigenaxis',
  'hysteretic',
  'synergistic',
  'pointing-pd',
  'pointing-synergistic',
];

export function lawDefinition<L extends LawId>(law: L): LawDefinition<L> {
  return LAWS[law];
}

/** A valid file entry's law parameters (SI). */
export function resolveLawFields<L extends LawId>(entry: FileEntryOf<L> & { law: L }): ParamsOf<L> {
  return LAWS[entry.law].resolve(entry);
}

/** Cross-field checks of a structurally valid file entry. */
export function checkLawFields<L extends LawId>(
  entry: FileEntryOf<L> & { law: L },
  path: string,
  errors: Issue[],
  warnings: Issue[],
): void {
  LAWS[entry.law].check(entry, path, errors, warnings);
}

/** Build a controller from its parameters for a design model; a refusal comes back as issues under `path`. */
export function buildController(c: ControllerParams, design: DesignModel, path = 'controller'): Result<AttitudeController> {
  return buildWith(LAWS[c.law], c, design, path);
}

function buildWith<L extends LawId>(
  def: LawDefinition<L>,
  c: ControllerParams,
  design: DesignModel,
  path: string,
): Result<AttitudeController> {
  return def.build(c as ControllerCommon & ParamsOf<L>, design, path);
}

/** What the gains of a controller ask of the wheels, in words. */
export function gainNoteOf(c: ControllerParams, design: DesignModel): string {
  const def = LAWS[c.law] as LawDefinition<LawId>;
  return def.gainNote(c as ControllerCommon & ParamsOf<LawId>, design);
}
