/**
 * A control law's registry entry: everything the rest of Slewsmith needs to know about a law,
 * declared once in laws/<law>/definition.ts — its file fields and their checks, the conversion to
 * SI parameters and back, how it is built, what its gains mean, its logic kind and the fields the
 * UI shows. registry.ts lists the entries; adding a law touches its folder and that list.
 */
import type { Issue, Result } from '../errors';
import type { FileEntryOf } from './fileSchema';
import type { ControllerCommon, LawId, LawParams } from './params';
import type { AttitudeController, DesignModel, LogicKind } from './types';

/** The parameters of one law. */
export type ParamsOf<L extends LawId> = Extract<LawParams, { law: L }>;

/** A law's fields of the file entry (id, label, gains and law are common). */
export type LawFileFields<L extends LawId> = Omit<FileEntryOf<L>, 'id' | 'label' | 'gains' | 'law'>;

/** What one gain multiplies, for people. */
export interface GainMeaning {
  /** Symbol as the law's paper writes it, e.g. "k_p". */
  symbol: string;
  /** SI unit of the gain. */
  unit: string;
  /** What it multiplies, in a few words. */
  meaning: string;
}

/** One field a law adds to the controller editor, in the words the UI and the messages use. */
export interface LawField {
  /** Key in the scenario file's controller entry. */
  key: string;
  /** The one name of the quantity (form label, messages, run labels). */
  label: string;
  /** Unit as shown ("—" for dimensionless). */
  unit: string;
  /** number; vector3; a list of numbers (2 to 12); or a list of unit vectors the user may leave out (default given in `help`). */
  kind: 'number' | 'vector3' | 'number-list' | 'optional-axes' | 'optional-directions';
  step?: number;
  /** One sentence: what it does and the rule it must keep. */
  help: string;
  /** A sensible value to suggest in messages. */
  suggested?: number | number[];
}

export interface LawDefinition<L extends LawId> {
  readonly law: L;
  /** Name in the law picker. */
  readonly title: string;
  /** One sentence: what the law does. */
  readonly summary: string;
  /** Where the law is published (cited beside the code too). */
  readonly source: string;
  readonly logicKind: LogicKind;
  /** True when the law acts on the quaternion and so picks one of ±q (unwinding is about that choice). */
  readonly liftDependent: boolean;
  /** True for a law that controls one body axis and leaves the roll free: it flies only pointing-only targets. */
  readonly pointingOnly?: boolean;
  /** The certificate its build computes, when it has one: on SO(3) or on the sphere S². */
  readonly certificate?: 'SO(3)' | 'S2';
  readonly gains: { stiffness: GainMeaning; damping: GainMeaning };
  readonly fields: readonly LawField[];
  /** The law's own fields for a new controller of this law (display units). */
  readonly fileDefaults: LawFileFields<L>;
  /** Rules that need more than one field (the file schema checks each field alone). */
  check(entry: FileEntryOf<L>, path: string, errors: Issue[], warnings: Issue[]): void;
  /** A valid file entry → SI parameters (no checks: the entry has passed validation). */
  resolve(entry: FileEntryOf<L>): ParamsOf<L>;
  /** SI parameters → the law's file fields (the inverse of resolve). */
  toFile(p: ParamsOf<L>): LawFileFields<L>;
  /** The controller; a refusal (e.g. the synergistic certificate) comes back as issues under `path`. */
  build(c: ControllerCommon & ParamsOf<L>, design: DesignModel, path: string): Result<AttitudeController>;
  /** What the gains ask of the wheels, in words, for the UI's read-out. */
  gainNote(c: ControllerCommon & ParamsOf<L>, design: DesignModel): string;
}
