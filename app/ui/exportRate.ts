/**
 * The export dialog's sample-rate field: empty keeps every sample; otherwise a number of samples
 * per second from 0.001 Hz (one line per 1000 s) up to the control rate the run was sampled at
 * (the same range the CLI's --rate accepts, main/cli/options.ts EXPORT_RATE_RULE). The reason
 * comes back in words while the field is invalid, and the dialog keeps Export disabled.
 */
import { parseNumberText } from './format';

export const MIN_EXPORT_RATE_HZ = 1e-3;

/** Why `text` is not a usable export rate for a run sampled at `controlRateHz`, or null when it is. */
export function exportRateProblem(text: string, controlRateHz: number): string | null {
  if (text.trim() === '') return null;
  const v = parseNumberText(text);
  if (typeof v !== 'number')
    return `The sample rate must be a number of samples per second (got "${text.trim()}"); leave it empty to export every sample.`;
  if (v < MIN_EXPORT_RATE_HZ) return `The sample rate must be at least ${MIN_EXPORT_RATE_HZ} Hz, one line per 1000 s (got ${v}).`;
  if (v > controlRateHz)
    return `The sample rate must be at most the control rate the run was sampled at, ${controlRateHz} Hz (got ${v}); leave it empty to export every sample.`;
  return null;
}
