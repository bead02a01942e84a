import type { ParsedArgs } from './args';
import type { CliIo } from './index';

/** Placeholder until the study module lands (same session). */
export async function runStudyCli(_json: unknown, _a: ParsedArgs, io: CliIo): Promise<number> {
  io.err('the study command is not built yet');
  return 1;
}
