/** Shared payload checks: UTF-8 sizes, file names, keyboard chords for the browser shell. */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { checkFileName, contentByteLength, utf8ByteLength, withJsonExtension } from '../../app/bridge/checks';
import { commandForChord } from '../../app/bridge/commands';

describe('utf8ByteLength', () => {
  it("agrees with Node's Buffer.byteLength on any string, lone surrogates included", () => {
    // Reference: Node's own UTF-8 encoder (lone surrogates become U+FFFD, 3 bytes).
    fc.assert(
      fc.property(fc.string({ unit: 'binary' }), (s) => utf8ByteLength(s) === Buffer.byteLength(s, 'utf8')),
      { numRuns: 2000 },
    );
    for (const s of ['', 'a', 'é', '€', '😀', '\ud800', '\udc00x', 'a\ud83d'])
      expect(utf8ByteLength(s), JSON.stringify(s)).toBe(Buffer.byteLength(s, 'utf8'));
    expect(contentByteLength(new Uint8Array(7))).toBe(7);
  });
});

describe('checkFileName', () => {
  it('accepts ordinary export names', () => {
    for (const n of ['lumen6-slew1.aem', 'run 3 (hybrid).csv', 'plan.v2.json', 'ünïcode-名前.csv'])
      expect(checkFileName(n, 'n'), n).toEqual([]);
  });
  it('rejects folders, control and reserved characters, device names, dots and empties', () => {
    const rules = (n: unknown) => checkFileName(n, 'n').map((i) => i.rule);
    expect(rules('a/b')).toEqual(['bare-name']);
    expect(rules('..')).toEqual(['bare-name', 'trailing']);
    expect(rules('a:b')).toEqual(['characters']);
    expect(rules('LPT1.csv')).toEqual(['reserved']);
    expect(rules('name.')).toEqual(['trailing']);
    expect(rules('  ')).toEqual(['length', 'trailing']);
    expect(rules(3)).toEqual(['type']);
  });
  it('adds .json only when there is no extension', () => {
    expect(withJsonExtension('plan')).toBe('plan.json');
    expect(withJsonExtension('plan.scenario.json')).toBe('plan.scenario.json');
    expect(withJsonExtension('/dir.v2/plan')).toBe('/dir.v2/plan.json');
  });
});

describe('commandForChord', () => {
  const chord = (key: string, mods: Partial<{ ctrlKey: boolean; metaKey: boolean; shiftKey: boolean; altKey: boolean }>) => ({
    key,
    ctrlKey: false,
    metaKey: false,
    shiftKey: false,
    altKey: false,
    ...mods,
  });
  it('maps Ctrl chords off macOS and Cmd chords on macOS', () => {
    expect(commandForChord(chord('s', { ctrlKey: true }), false)).toBe('save');
    expect(commandForChord(chord('S', { ctrlKey: true, shiftKey: true }), false)).toBe('save-as');
    expect(commandForChord(chord('z', { metaKey: true }), true)).toBe('undo');
    expect(commandForChord(chord('Z', { metaKey: true, shiftKey: true }), true)).toBe('redo');
    expect(commandForChord(chord('r', { ctrlKey: true }), false)).toBe('run');
    expect(commandForChord(chord('e', { ctrlKey: true }), false)).toBe('export');
  });
  it('ignores chords with the wrong or extra modifiers', () => {
    expect(commandForChord(chord('s', {}), false)).toBeNull();
    expect(commandForChord(chord('s', { metaKey: true }), false)).toBeNull();
    expect(commandForChord(chord('s', { ctrlKey: true }), true)).toBeNull();
    expect(commandForChord(chord('s', { ctrlKey: true, altKey: true }), false)).toBeNull();
    expect(commandForChord(chord('q', { ctrlKey: true }), false)).toBeNull();
  });
});
