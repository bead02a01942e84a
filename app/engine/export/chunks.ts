/**
 * Streamed exports: every writer (csv.ts, json.ts, aem-write.ts) checks its inputs first and then
 * hands its text out piece by piece as a chunk source — a generator of strings, each a run of
 * whole lines of about CHUNK_CHARS characters, whose return value is the list of problems found
 * while writing (empty when the text is complete). Nothing holds the whole file: a 24 h run's
 * 600 MB CSV never becomes one string (V8 refuses strings past about 2^29 characters with
 * "Invalid string length"). The caller drains the source into a sink: the CLI through
 * main/atomic-stream.ts (awaiting its back-pressure between chunks), the app and the tests through
 * the string wrappers writeCsv / writeJson / writeAem, which collect the chunks (collectChunks).
 *
 * A source whose return value lists problems has produced text that must be discarded (the
 * atomic writer aborts, the wrapper returns the problems): an export is complete or not written.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';

/** Chunks of text; the generator's return value lists the problems that stopped it (empty: complete). */
export type ChunkSource = Generator<string, Issue[], void>;

/** A writer's result before any text: its problems, or the source of its text. */
export type ChunkedExport = Result<ChunkSource>;

/** About this many characters per chunk (256 Ki): large enough to amortise a write, small enough to stay flat. */
export const CHUNK_CHARS = 1 << 18;

/**
 * The most characters a string wrapper collects (2^28, 256 Mi): below V8's string limit (about 2^29
 * on 64-bit builds, v8/include/v8-primitive.h kMaxLength), leaving room for the caller's copies.
 */
export const MAX_STRING_CHARS = 1 << 28;

/** Groups lines (each given without its line ending) into chunks of about CHUNK_CHARS characters. */
export class LineChunker {
  private parts: string[] = [];
  private size = 0;

  constructor(private readonly eol: string) {}

  /** Adds a line; returns a full chunk when one is ready, else null. */
  add(line: string): string | null {
    this.parts.push(line, this.eol);
    this.size += line.length + this.eol.length;
    return this.size >= CHUNK_CHARS ? this.take() : null;
  }

  /** What is left, or null when nothing is. */
  flush(): string | null {
    return this.size > 0 ? this.take() : null;
  }

  private take(): string {
    const s = this.parts.join('');
    this.parts = [];
    this.size = 0;
    return s;
  }
}

/** Drains a source into a synchronous sink; the problems that stopped it, if any. */
export function pipeChunks(src: ChunkSource, sink: (chunk: string) => void): Result<void> {
  for (;;) {
    const r = src.next();
    if (r.done) return r.value.length ? fail(r.value) : ok(undefined);
    sink(r.value);
  }
}

/** The whole text of a chunked export (for tests, the app's download and small files). */
export function collectChunks(x: ChunkedExport, maxChars = MAX_STRING_CHARS): Result<string> {
  if (!x.ok) return x;
  const parts: string[] = [];
  let size = 0;
  for (;;) {
    const r = x.value.next();
    if (r.done) return r.value.length ? fail(r.value) : ok(parts.join(''), x.warnings);
    size += r.value.length;
    if (size > maxChars) {
      x.value.return([]);
      return fail([
        {
          path: 'options.sampleRateHz',
          rule: 'too-large',
          message: `the export is longer than ${maxChars} characters, more than one piece of text can hold; choose a lower sample rate, or write it to a file with the slewsmith command line (which streams it)`,
        },
      ]);
    }
    parts.push(r.value);
  }
}
