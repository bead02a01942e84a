/**
 * The shared scenario-file reader's byte rules (app/bridge/scenario-bytes.ts) and the file-system
 * half used by the CLI and the app (main/scenario-file.ts).
 *
 * Reference for UTF-8: the Unicode Standard, Table 3-7 (well-formed byte sequences), and the
 * WHATWG Encoding Standard's UTF-8 decoder as Node implements it in `TextDecoder` with
 * `fatal: true` — the offset finder must agree with it on every input, checked on random bytes.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import fc from 'fast-check';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import {
  checkScenarioSize,
  decodeUtf8Strict,
  firstInvalidUtf8Offset,
  jsonNestingDepth,
  MAX_SCENARIO_DEPTH,
  parseScenarioDocument,
  scenarioDocumentFromBytes,
} from '../../app/bridge/scenario-bytes';
import { readScenarioFile } from '../../main/scenario-file';
import { tempDir } from './main-fakes';

const bytes = (...b: number[]) => Uint8Array.from(b);
const enc = (s: string) => new TextEncoder().encode(s);

describe('firstInvalidUtf8Offset', () => {
  // Each case: bytes and the offset of the first ill-formed sequence (Unicode Table 3-7).
  const cases: [string, Uint8Array, number][] = [
    ['ASCII', enc('{"a": 1}'), -1],
    ['2-, 3- and 4-byte characters (é, €, 𝄞)', enc('é€𝄞'), -1],
    ['largest code point U+10FFFF', bytes(0xf4, 0x8f, 0xbf, 0xbf), -1],
    ['lone continuation byte', bytes(0x41, 0x80), 1],
    ['overlong "/" C0 AF', bytes(0x41, 0x42, 0xc0, 0xaf), 2],
    ['overlong 3-byte E0 80 AF', bytes(0xe0, 0x80, 0xaf), 0],
    ['surrogate U+D800 as ED A0 80', bytes(0x20, 0xed, 0xa0, 0x80), 1],
    ['above U+10FFFF: F4 90 80 80', bytes(0xf4, 0x90, 0x80, 0x80), 0],
    ['F5 lead byte', bytes(0xf5, 0x80, 0x80, 0x80), 0],
    ['FF byte', bytes(0x61, 0xff), 1],
    ['truncated 3-byte sequence at the end', bytes(0x61, 0x62, 0xe2, 0x82), 2],
    ['Latin-1 é (E9) followed by ASCII', bytes(0x63, 0x61, 0x66, 0xe9, 0x22), 3],
  ];
  it.each(cases)('%s', (_name, b, at) => {
    expect(firstInvalidUtf8Offset(b)).toBe(at);
  });

  it('agrees with the fatal TextDecoder (WHATWG Encoding) on random byte strings', () => {
    const td = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
    // Bytes biased towards the interesting ranges: ASCII, continuation bytes and lead bytes.
    const byte = fc.oneof(fc.integer({ min: 0, max: 0x7f }), fc.integer({ min: 0x80, max: 0xbf }), fc.integer({ min: 0xc0, max: 0xff }));
    fc.assert(
      fc.property(fc.array(byte, { maxLength: 24 }), (arr) => {
        const b = Uint8Array.from(arr);
        let valid = true;
        try {
          td.decode(b);
        } catch {
          valid = false;
        }
        const at = firstInvalidUtf8Offset(b);
        expect(at === -1).toBe(valid);
        // The prefix before the offset decodes; the prefix through the offending sequence does not.
        if (!valid) expect(() => td.decode(b.subarray(0, at))).not.toThrow();
      }),
      { seed: 20260301, numRuns: 3000 },
    );
  });
});

describe('decodeUtf8Strict', () => {
  it('drops a leading UTF-8 BOM and keeps the rest exactly', () => {
    const r = decodeUtf8Strict(bytes(0xef, 0xbb, 0xbf, ...enc('{"é": 1}')));
    expect(r).toEqual({ ok: true, value: '{"é": 1}', warnings: [] });
  });

  it('never lets a replacement character through: invalid bytes are refused with their offset', () => {
    const r = decodeUtf8Strict(bytes(0xef, 0xbb, 0xbf, 0x7b, 0x22, 0xe9, 0x22));
    expect(r.ok).toBe(false);
    if (!r.ok)
      expect(r.errors).toEqual([
        {
          path: '',
          rule: 'utf-8',
          message: 'the file is not valid UTF-8: the first bad byte sequence starts at byte offset 5 (0xE9 0x22)',
        },
      ]);
  });

  it('names a UTF-16 file instead of reporting byte 0', () => {
    const r = decodeUtf8Strict(bytes(0xff, 0xfe, 0x7b, 0x00));
    expect(!r.ok && r.errors[0]!.message).toMatch(/UTF-16 byte-order mark \(0xFF 0xFE\)/);
  });
});

describe('parseScenarioDocument', () => {
  it.each([
    ['null', 'JSON null'],
    ['[]', 'a JSON array of 0 items'],
    ['[1]', 'a JSON array of 1 item'],
    ['-1.5e3', 'a JSON number (-1500)'],
    ['"lumen"', 'a JSON string of 5 characters'],
    ['true', 'a JSON boolean (true)'],
  ])('names %s for what it is', (text, what) => {
    expect(parseScenarioDocument(text)).toEqual({
      ok: false,
      errors: [{ path: '', rule: 'json-type', message: `the file holds ${what}; a scenario is a JSON object` }],
      warnings: [],
    });
  });

  it('says an empty file is empty, and passes an object with its text', () => {
    expect(!parseScenarioDocument(' \n').ok && parseScenarioDocument(' \n')).toMatchObject({ errors: [{ rule: 'json-syntax' }] });
    expect(parseScenarioDocument('{"a": 1}')).toEqual({ ok: true, value: { json: { a: 1 }, text: '{"a": 1}' }, warnings: [] });
  });

  it('refuses nesting deeper than MAX_SCENARIO_DEPTH before parsing (downstream walks would overflow the stack)', () => {
    expect(jsonNestingDepth('{"a": [1, {"b": "[[[{{{"}], "c": {}}')).toBe(3);
    expect(jsonNestingDepth('["\\"", ["x"]]')).toBe(2);
    const ok = `{"a": ${'['.repeat(MAX_SCENARIO_DEPTH - 1)}${']'.repeat(MAX_SCENARIO_DEPTH - 1)}}`;
    expect(parseScenarioDocument(ok).ok).toBe(true);
    const deep = `{"a": ${'['.repeat(50_000)}0${']'.repeat(50_000)}}`;
    expect(parseScenarioDocument(deep)).toMatchObject({ ok: false, errors: [{ rule: 'max-depth' }] });
    // The reason for the rule: JSON.parse copes, JSON.stringify (used downstream) does not.
    expect(() => JSON.stringify(JSON.parse(deep))).toThrow(RangeError);
  });

  it('keeps a "__proto__" key as plain data (JSON.parse defines an own property)', () => {
    const r = parseScenarioDocument('{"__proto__": {"polluted": true}}');
    expect(r.ok).toBe(true);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    if (r.ok) expect(Object.getPrototypeOf(r.value.json)).toBe(Object.prototype);
  });
});

describe('size', () => {
  it('states the limit in the message', () => {
    expect(checkScenarioSize(30 * 1024 * 1024, 20 * 1024 * 1024)[0]!.message).toBe(
      'the file is 31457280 bytes; a scenario file is at most 20971520 bytes (20 MiB)',
    );
    expect(checkScenarioSize(10, 10)).toEqual([]);
    const r = scenarioDocumentFromBytes(enc('{"a": 12345}'), 5);
    expect(!r.ok && r.errors[0]!.rule).toBe('max-size');
  });
});

describe('readScenarioFile (the CLI and the app share it)', () => {
  let dir: string;
  beforeEach(async () => {
    dir = await tempDir();
  });
  afterEach(() => fsp.rm(dir, { recursive: true, force: true }));
  const nodeFs = { stat: (p: string) => fsp.stat(p), readFile: (p: string) => fsp.readFile(p) };

  it('refuses a folder, a device and a missing file without reading, and an oversized file before reading it', async () => {
    expect(await readScenarioFile(nodeFs, dir, 100)).toMatchObject({
      status: 'unreadable',
      message: `${dir} is a folder, not a scenario file`,
    });
    // /dev/zero would never end if read: refused by its type.
    expect(await readScenarioFile(nodeFs, '/dev/zero', 100)).toMatchObject({ status: 'unreadable' });
    expect(await readScenarioFile(nodeFs, path.join(dir, 'nope.json'), 100)).toMatchObject({
      status: 'unreadable',
      message: `cannot read ${path.join(dir, 'nope.json')}: no such file`,
      code: 'ENOENT',
    });
    const big = path.join(dir, 'big.json');
    await fsp.writeFile(big, '{"x": "' + 'a'.repeat(200) + '"}');
    let reads = 0;
    const r = await readScenarioFile({ ...nodeFs, readFile: (p) => (reads++, fsp.readFile(p)) }, big, 100);
    expect(r).toMatchObject({ status: 'invalid', errors: [{ rule: 'max-size' }] });
    expect(reads).toBe(0);
  });

  it('reads a BOM file and returns the JSON object and its text', async () => {
    const f = path.join(dir, 'bom.json');
    await fsp.writeFile(f, Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('{"name": "x"}')]));
    expect(await readScenarioFile(nodeFs, f, 100)).toEqual({ status: 'ok', document: { json: { name: 'x' }, text: '{"name": "x"}' } });
  });
});
