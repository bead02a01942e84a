/**
 * How the app names a run's mode (the scenario keys stay 'follow-plan' and 'step-target'): one
 * short name for table headers, plot legends and the 3D view, one sentence for hovers and the
 * legend, so a newcomer reads what each mode does without knowing the keys.
 */
import type { RunMode } from '../engine/pipeline/types';

export interface ModeText {
  /** A few words: what the controller is given. */
  short: string;
  /** One sentence for hovers and the legend. */
  long: string;
}

export const MODE_TEXT: Readonly<Record<RunMode, ModeText>> = {
  'follow-plan': {
    short: 'follows the plan',
    long: 'Follows the planned slew: the controller tracks the planned attitude, rate and acceleration from each slew start to its target.',
  },
  'step-target': {
    short: 'target at once',
    long: 'Commanded to the target at once: when a slew is due the controller is handed the target attitude, at rest, and finds its own way there.',
  },
};

/** The scenario's simulation.mode values, for the editor's choice list. */
export const SIMULATION_MODE_CHOICES: readonly { value: string; label: string; help: string }[] = [
  { value: 'both', label: 'Both ways', help: 'Every controller flies twice: following the plan, and commanded to each target at once.' },
  { value: 'follow-plan', label: 'Follow the plan', help: MODE_TEXT['follow-plan'].long },
  { value: 'step-target', label: 'Target at once', help: MODE_TEXT['step-target'].long },
];

export function modeShort(mode: RunMode): string {
  return MODE_TEXT[mode]?.short ?? mode;
}

/** "Quaternion PD · follows the plan": the name of a run everywhere the app writes one. */
export function runName(r: { label: string; mode: RunMode }): string {
  return `${r.label} · ${modeShort(r.mode)}`;
}
