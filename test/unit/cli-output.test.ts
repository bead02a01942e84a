/**
 * The CLI's helpers below the commands: the one numeric-option rule, the export stamp, the
 * folder maker that cannot loop (Node's recursive mkdir spins forever under /proc), interruptible
 * atomic text writes, and the stdout/stderr writer that survives a closed pipe.
 */
import { EventEmitter } from 'node:events';
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { lineWriter } from '../../main/cli/main';
import { exportStamp, numberOption } from '../../main/cli/options';
import { ensureFolder, writeTextAtomic } from '../../main/cli/output';
import { tempDir } from './main-fakes';

let dir: string;
beforeEach(async () => {
  dir = await tempDir();
});
afterEach(() => fsp.rm(dir, { recursive: true, force: true }));

describe('numberOption', () => {
  const rule = { min: 0.5, max: 10, unit: 'Hz' };
  it('accepts plain decimals in range and refuses everything Number() would also take', () => {
    expect(numberOption('rate', '2.5', rule)).toEqual({ ok: true, value: 2.5 });
    expect(numberOption('rate', '1e0', rule)).toEqual({ ok: true, value: 1 });
    for (const raw of ['Infinity', '-Infinity', 'NaN', '', ' ', '0x5', '0b1', '5 Hz', '1e400', '0.4', '10.0001'])
      expect(numberOption('rate', raw, rule), raw).toEqual({
        ok: false,
        message: `--rate must be a number from 0.5 to 10 Hz (got ${JSON.stringify(raw)})`,
      });
    expect(numberOption('runs', '3.0', { integer: true, min: 1, max: 9 }).ok).toBe(false);
  });
});

describe('exportStamp', () => {
  it('takes --creation-date over SOURCE_DATE_EPOCH, treats an empty SOURCE_DATE_EPOCH as unset', () => {
    // 0 s is the epoch itself; 253402300799 s is 9999-12-31T23:59:59Z (the last four-digit year).
    expect(exportStamp({}, { SOURCE_DATE_EPOCH: '0' })).toEqual({ ok: true, value: { creationDateUtc: '1970-01-01T00:00:00Z' } });
    expect(exportStamp({}, { SOURCE_DATE_EPOCH: '253402300799' })).toEqual({
      ok: true,
      value: { creationDateUtc: '9999-12-31T23:59:59Z' },
    });
    expect(exportStamp({}, { SOURCE_DATE_EPOCH: '' })).toEqual({ ok: true, value: {} });
    expect(exportStamp({ 'creation-date': '2030-01-02T03:04:05.678Z' }, { SOURCE_DATE_EPOCH: '0' })).toEqual({
      ok: true,
      value: { creationDateUtc: '2030-01-02T03:04:05.678Z' },
    });
    expect(exportStamp({}, { SOURCE_DATE_EPOCH: '253402300800' }).ok).toBe(false);
    expect(exportStamp({ 'message-id': ' PADDED' }, {}).ok).toBe(false);
    expect(exportStamp({ 'message-id': 'X'.repeat(65) }, {}).ok).toBe(false);
  });
});

describe('ensureFolder', () => {
  it('makes nested folders, accepts an existing one, and refuses a file on the way', async () => {
    const deep = path.join(dir, 'a/b/c');
    expect(await ensureFolder(deep, '--out')).toEqual({ ok: true });
    expect((await fsp.stat(deep)).isDirectory()).toBe(true);
    expect(await ensureFolder(deep, '--out')).toEqual({ ok: true });
    await fsp.writeFile(path.join(dir, 'f'), '');
    expect(await ensureFolder(path.join(dir, 'f/x/y'), '--out')).toEqual({
      ok: false,
      message: `--out ${path.join(dir, 'f/x/y')}: ${path.join(dir, 'f')} is a file, not a folder`,
    });
    expect((await ensureFolder('', '--out')).ok).toBe(false);
  });

  it('returns (does not spin) where the parent exists but refuses children: /proc and a dangling link', async () => {
    expect(await ensureFolder('/proc/a/b', '--out')).toEqual({
      ok: false,
      message: '--out /proc/a/b: cannot create the folder /proc/a: the folder above it does not accept new folders',
    });
    const link = path.join(dir, 'dangling');
    await fsp.symlink(path.join(dir, 'nowhere/deeper'), link);
    const r = await ensureFolder(path.join(link, 'out'), '--out');
    expect(r.ok).toBe(false);
  });
});

describe('writeTextAtomic', () => {
  it('an abort before or during the write keeps the old file whole and leaves no temp file', async () => {
    const target = path.join(dir, 'big.csv');
    await fsp.writeFile(target, 'old\n');
    const stop = new AbortController();
    stop.abort();
    expect(await writeTextAtomic(target, 'x'.repeat(5 << 20), stop.signal)).toMatchObject({ ok: false, interrupted: true });
    expect(await fsp.readFile(target, 'utf8')).toBe('old\n');
    expect(await fsp.readdir(dir)).toEqual(['big.csv']);
    // Abort after the first chunk has been queued (the write loop checks the signal between chunks).
    const mid = new AbortController();
    const p = writeTextAtomic(target, 'y'.repeat(8 << 20), mid.signal);
    setImmediate(() => mid.abort());
    const r = await p;
    if (r.ok) expect(await fsp.readFile(target, 'utf8')).toHaveLength(8 << 20);
    else expect(await fsp.readFile(target, 'utf8')).toBe('old\n');
    expect(await fsp.readdir(dir)).toEqual(['big.csv']);
  });

  it('keeps a surrogate pair whole across a chunk boundary', async () => {
    const target = path.join(dir, 'u.txt');
    const text = 'a'.repeat((1 << 20) - 1) + '𝄞' + 'b';
    expect(await writeTextAtomic(target, text)).toEqual({ ok: true });
    expect(await fsp.readFile(target, 'utf8')).toBe(text);
  });
});

describe('lineWriter', () => {
  it('mutes a stream after EPIPE instead of throwing or crashing on the error event', () => {
    const writes: string[] = [];
    const stream = Object.assign(new EventEmitter(), {
      write: (s: string) => {
        writes.push(s);
        return true;
      },
    });
    const line = lineWriter(stream as never);
    line('one');
    stream.emit('error', Object.assign(new Error('write EPIPE'), { code: 'EPIPE' }));
    line('two');
    expect(writes).toEqual(['one\n']);
  });
});
