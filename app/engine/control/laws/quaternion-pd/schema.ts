import { z } from 'zod';
import { controllerBaseShape } from '../../fileBase';

export const QuaternionPdFileSchema = z.strictObject({
  ...controllerBaseShape,
  law: z.literal('quaternion-pd').describe('Continuous quaternion PD (unwinds from the far hemisphere).'),
});
