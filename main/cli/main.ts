/**
 * The `slewsmith` process around runCli (bin/slewsmith.mjs calls `main`): standard streams, Ctrl-C
 * and the exit status.
 *
 * - A closed pipe is not an error. When the reader of stdout or stderr goes away (`slewsmith plan
 *   x | head -3`), writes fail with EPIPE; that stream is then muted and the command finishes its
 *   work (files are still written) and exits with its own status: no stack trace, no "write EPIPE".
 * - Ctrl-C: fly and compare subscribe through `onInterrupt` while they simulate or write; their
 *   handler stops the work and they exit 130 with a one-line message. A second Ctrl-C exits 130 at
 *   once. Outside those steps no handler is installed, so Node's default (terminate, 130 in the
 *   shell) applies. `study` keeps its own handler (main/cli/study.ts).
 * - fly and compare simulate in a worker thread (compute-thread.ts) so Ctrl-C is seen at once.
 */
import { runCli } from './index';
import { threadComputer } from './compute-thread';

type Stream = NodeJS.WriteStream;

/** Writes a line to `stream` unless its reader has gone; EPIPE mutes the stream for good. */
export function lineWriter(stream: Pick<Stream, 'write' | 'on'>): (s: string) => void {
  let closed = false;
  // EPIPE is the expected one; any other stream error has nowhere to be reported either, so the
  // stream is muted the same way rather than crashing the process with an unhandled 'error'.
  stream.on('error', () => {
    closed = true;
  });
  return (s) => {
    if (closed) return;
    try {
      stream.write(s + '\n');
    } catch {
      closed = true;
    }
  };
}

export async function main(argv: readonly string[], proc: NodeJS.Process = process): Promise<number> {
  const out = lineWriter(proc.stdout);
  const err = lineWriter(proc.stderr);
  const handlers = new Set<() => void>();
  let interrupts = 0;
  const onSigint = () => {
    interrupts++;
    if (interrupts > 1) proc.exit(130);
    for (const h of handlers) h();
  };
  const code = await runCli(
    argv,
    { out, err },
    {
      env: proc.env,
      compute: threadComputer,
      onInterrupt(handler) {
        handlers.add(handler);
        if (handlers.size === 1) proc.on('SIGINT', onSigint);
        return () => {
          handlers.delete(handler);
          if (handlers.size === 0) proc.removeListener('SIGINT', onSigint);
        };
      },
    },
  );
  return code;
}
