/**
 * The parts of a scenario file's controller entry that every law shares: id, label and gains.
 * Each law adds its own fields (laws/<law>/schema.ts); fileSchema.ts joins them into one union.
 * Units are in the keys (DegPerS …) or in the descriptions; the file format is described in
 * scenario/schema.ts.
 */
import { z } from 'zod';

const KpKdGainsSchema = z.strictObject({
  kp: z.number().positive().describe('Stiffness gain, SI; what it multiplies depends on the law (see the law’s gain names).'),
  kd: z.number().positive().describe('Damping gain, SI; what it multiplies depends on the law (see the law’s gain names).'),
});

const BandwidthGainsSchema = z.strictObject({
  bandwidthRadPerS: z
    .number()
    .positive()
    .max(100)
    .describe('Small-error closed-loop natural frequency ω_n, rad/s; the law derives its gains from ω_n, ζ and the inertia.'),
  dampingRatio: z.number().positive().max(10).describe('Small-error damping ratio ζ (dimensionless).'),
});

const GainsSchema = z
  .union([KpKdGainsSchema, BandwidthGainsSchema])
  .describe('Either explicit gains { kp, kd } or a bandwidth and damping ratio { bandwidthRadPerS, dampingRatio }.');

export const controllerBaseShape = {
  id: z
    .string()
    .min(1)
    .max(64)
    .regex(/^[A-Za-z0-9_.-]+$/)
    .describe('Unique key: letters, digits, "_", ".", "-".'),
  label: z.string().min(1).max(200).describe('Name shown in the comparison table and exports.'),
  gains: GainsSchema,
};

/** A 3-vector of finite numbers. */
export const vec3Schema = (what: string) => z.array(z.number()).length(3).describe(what);

export type FileGains = z.infer<typeof GainsSchema>;
