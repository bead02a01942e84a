import { z } from 'zod';
import { controllerBaseShape } from '../../fileBase';

export const SignSwitchFileSchema = z.strictObject({
  ...controllerBaseShape,
  law: z.literal('sign-switch').describe('Memoryless shortest-path PD, torque −kp·sgn(η)·ε − kd·ω.'),
});
