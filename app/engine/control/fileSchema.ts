/**
 * A scenario file's controller entry: one strict object per law, told apart by "law". Each law
 * declares its own fields in laws/<law>/schema.ts; adding a law adds its schema here.
 */
import { z } from 'zod';
import { EigenaxisFileSchema } from './laws/eigenaxis/schema';
import { HystereticFileSchema } from './laws/hysteretic/schema';
import { QuaternionPdFileSchema } from './laws/quaternion-pd/schema';
import { SignSwitchFileSchema } from './laws/sign-switch/schema';
import { SynergisticFileSchema } from './laws/synergistic/schema';
import { PointingPdFileSchema } from './laws/pointing-pd/schema';
import { PointingSynergisticFileSchema } from './laws/pointing-synergistic/schema';
import type { LawId } from './params';

export const ControllerFileSchema = z.discriminatedUnion('law', [
  QuaternionPdFileSchema,
  SignSwitchFileSchema,
  EigenaxisFileSchema,
  HystereticFileSchema,
  SynergisticFileSchema,
  PointingPdFileSchema,
  PointingSynergisticFileSchema,
]);

export type ControllerFileEntry = z.infer<typeof ControllerFileSchema>;

/** The file entry of one law. */
export type FileEntryOf<L extends LawId> = Extract<ControllerFileEntry, { law: L }>;
