import { z } from 'zod';
import { controllerBaseShape } from '../../fileBase';

export const HystereticFileSchema = z.strictObject({
  ...controllerBaseShape,
  law: z.literal('hysteretic').describe('Hysteretic hybrid quaternion feedback with logic h ∈ {−1, 1}.'),
  hysteresis: z.number().gt(0).lt(1).describe('Hysteresis δ on h·η (dimensionless, 0 < δ < 1): the logic h flips when h·η ≤ −δ.'),
});
