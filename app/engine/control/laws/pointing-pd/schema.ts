import { z } from 'zod';
import { controllerBaseShape } from '../../fileBase';

export const PointingPdFileSchema = z.strictObject({
  ...controllerBaseShape,
  law: z
    .literal('pointing-pd')
    .describe('Smooth pointing-only PD on the sphere: one body axis on its direction, roll free (pointing-only targets only).'),
});
