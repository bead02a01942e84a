import { z } from 'zod';
import { controllerBaseShape, vec3Schema } from '../../fileBase';

export const SynergisticFileSchema = z.strictObject({
  ...controllerBaseShape,
  law: z.literal('synergistic').describe('Synergistic hybrid feedback over a family of warped trace potentials.'),
  potentialWeights: z
    .array(z.number().positive())
    .length(3)
    .describe('Eigenvalues of the potential matrix A in Φ(R) = tr(A(I − R)), dimensionless, positive and distinct.'),
  potentialAxes: z
    .array(z.array(z.number()).length(3))
    .length(3)
    .optional()
    .describe('Unit eigenvectors of A, one per weight, body axes of the error frame; orthonormal. Default: x, y, z.'),
  warpGain: z
    .number()
    .positive()
    .max(100)
    .describe('Warping gain k in θ(R) = k·Φ(R), rad per unit potential; (A, k) → (cA, k/c) keeps the family’s shape.'),
  warpDirections: z
    .array(vec3Schema('A warping direction (non-zero; normalised on load).'))
    .min(2)
    .max(12)
    .optional()
    .describe('Warping directions u_q, one potential per direction. Default: potentialAxes.'),
  gapThreshold: z
    .number()
    .positive()
    .describe('Jump threshold δ on the synergy gap V_q − min_p V_p, in potential units; must be below the certified gap δ*.'),
  requireCertificate: z
    .boolean()
    .optional()
    .describe(
      'true or absent: the controller is built only when the synergy-gap certificate admits gapThreshold (0 < δ < δ*). false: built anyway, the refusal reported as a warning (a robustness sweep of the jump threshold writes false so that it can fly cells beyond δ*).',
    ),
});
