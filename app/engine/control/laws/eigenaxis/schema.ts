import { z } from 'zod';
import { controllerBaseShape } from '../../fileBase';

export const EigenaxisFileSchema = z.strictObject({
  ...controllerBaseShape,
  law: z.literal('eigenaxis').describe('Eigenaxis feedback with gyroscopic cancellation and a slew-rate limit.'),
  maxRateDegPerS: z.number().positive().max(360).describe('Slew-rate limit of the eigenaxis law, deg/s.'),
});
