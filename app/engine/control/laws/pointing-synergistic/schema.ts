import { z } from 'zod';
import { controllerBaseShape } from '../../fileBase';

export const PointingSynergisticFileSchema = z.strictObject({
  ...controllerBaseShape,
  law: z
    .literal('pointing-synergistic')
    .describe(
      'Synergistic hybrid pointing-only law on the sphere: one body axis on its direction, roll free (pointing-only targets only).',
    ),
  warpGain: z
    .number()
    .positive()
    .max(100)
    .describe(
      'Warp gain k in θ(y) = k·V(y), rad per unit of V = 1 − cos φ; the warp stays a diffeomorphism of the sphere for k < 1 (the certificate checks it).',
    ),
  warpAzimuthsDeg: z
    .array(z.number().min(-360).max(360))
    .min(2)
    .max(12)
    .describe(
      'Warp directions ⊥ the pointed axis, one member of the family each, as azimuths about the axis, degrees; only their differences matter (e.g. [0, 120, 240]).',
    ),
  gapThreshold: z
    .number()
    .positive()
    .describe('Jump threshold δ on the synergy gap V_q − min_p V_p, in units of V = 1 − cos φ; must be below the certified gap δ*.'),
  requireCertificate: z
    .boolean()
    .optional()
    .describe(
      'true or absent: the controller is built only when the synergy-gap certificate admits gapThreshold (0 < δ < δ*). false: built anyway, the refusal reported as a warning (a robustness sweep of the jump threshold writes false so that it can fly cells beyond δ*).',
    ),
});
