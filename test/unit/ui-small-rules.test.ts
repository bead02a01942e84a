/**
 * Small pure rules of the app's issue-10 changes: δ* printed rounded down (checked against
 * decimal.js through mathjs BigNumber, ROUND_FLOOR to significant digits), the export dialog's
 * rate rule (bounds as the CLI's --rate: main/cli/options.ts), Ctrl+Y as a second redo chord off
 * macOS, File › New's starter scenario being valid and not the demo, and the plot PNG caption.
 */
import { describe, expect, it } from 'vitest';
import { create, all } from 'mathjs';
import { fmtFloor } from '../../app/ui/formatFloor';
import { exportRateProblem } from '../../app/ui/exportRate';
import { commandForChord } from '../../app/bridge/commands';
import { STARTER_NAME, starterScenario } from '../../app/ui/starter';
import { validateScenario } from '../../app/engine/scenario/validate';
import { runPipeline } from '../../app/engine/pipeline/run';
import { captionLines, wrapText } from '../../app/ui/plots/pngCaption';
import { CAUTION_TEXT, INERTIAL_FRAME } from '../../app/engine/caution';

const math = create(all!, { number: 'BigNumber', precision: 64 });
// decimal.js rounding mode 3 = ROUND_FLOOR (towards −∞).
const ROUND_FLOOR = 3;

function floorRef(v: number, digits: number): number {
  const b = math.bignumber(v.toPrecision(17)) as unknown as { toSignificantDigits(d: number, r: number): { toNumber(): number } };
  return b.toSignificantDigits(digits, ROUND_FLOOR).toNumber();
}

describe('fmtFloor: δ* rounded down to the digits shown', () => {
  it('prints 0.031249… as 0.03124, never 0.03125 (issue 10)', () => {
    expect(fmtFloor(0.031249999999999997, 4)).toBe('0.03124');
    expect(fmtFloor(0.03125, 4, true)).toBe('0.03124');
    expect(fmtFloor(0.03125, 4)).toBe('0.03125');
  });

  it('matches decimal.js ROUND_FLOOR and is never above the value', () => {
    let seed = 12345;
    const rand = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    for (let i = 0; i < 2000; i++) {
      const v = (rand() - 0.3) * 10 ** Math.floor(rand() * 8 - 4);
      const d = 1 + Math.floor(rand() * 6);
      const got = Number(fmtFloor(v, d));
      expect(got, `${v} to ${d}`).toBe(floorRef(v, d));
      expect(got).toBeLessThanOrEqual(v);
    }
  });
});

describe('export rate rule', () => {
  it('accepts empty and in-range rates, refuses the rest with a reason', () => {
    expect(exportRateProblem('', 10)).toBeNull();
    expect(exportRateProblem('1', 10)).toBeNull();
    expect(exportRateProblem('10', 10)).toBeNull();
    expect(exportRateProblem('abc', 10)).toMatch(/number/);
    expect(exportRateProblem('0', 10)).toMatch(/at least/);
    expect(exportRateProblem('-1', 10)).toMatch(/at least/);
    expect(exportRateProblem('2000', 10)).toMatch(/at most the control rate.*10 Hz \(got 2000\)/);
  });
});

describe('redo chords', () => {
  const chord = (key: string, o: Partial<{ ctrlKey: boolean; metaKey: boolean; shiftKey: boolean; altKey: boolean }>) => ({
    key,
    ctrlKey: false,
    metaKey: false,
    shiftKey: false,
    altKey: false,
    ...o,
  });
  it('Ctrl+Y and Ctrl+Shift+Z redo off macOS; Ctrl+Y is nothing on macOS', () => {
    expect(commandForChord(chord('y', { ctrlKey: true }), false)).toBe('redo');
    expect(commandForChord(chord('Z', { ctrlKey: true, shiftKey: true }), false)).toBe('redo');
    expect(commandForChord(chord('z', { ctrlKey: true }), false)).toBe('undo');
    expect(commandForChord(chord('y', { ctrlKey: true }), true)).toBeNull();
    expect(commandForChord(chord('y', { ctrlKey: true, shiftKey: true }), false)).toBeNull();
  });
});

describe('File › New starter scenario', () => {
  it('is valid, runs, is named "New scenario" and is not the demo', () => {
    const s = starterScenario();
    expect(s.name).toBe(STARTER_NAME);
    expect(validateScenario(s).ok).toBe(true);
    const r = runPipeline(s, { modes: ['follow-plan'] });
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.value.plan.feasible).toBe(true);
    expect(JSON.stringify(s)).not.toMatch(/Lumen|Tern|Kestrel/);
  });
});

describe('plot PNG caption', () => {
  it('carries the title, the scenario name, the time axis with the epoch and frame, and the caution', () => {
    const lines = captionLines('Attitude error angle', { scenarioName: 'Invented pass', epochUtc: '2030-03-14T10:00:00Z' });
    const text = lines.map((l) => l.text).join('\n');
    expect(lines[0]).toEqual({ text: 'Attitude error angle', kind: 'title' });
    expect(text).toContain('Scenario: Invented pass');
    expect(text).toContain('seconds from the scenario epoch 2030-03-14T10:00:00Z (UTC)');
    expect(text).toContain(INERTIAL_FRAME);
    expect(lines.find((l) => l.kind === 'caution')!.text).toContain(CAUTION_TEXT);
  });

  it('wraps greedily without losing or reordering words', () => {
    const words = 'one two three four five six seven eight nine ten'.split(' ');
    const measure = (s: string) => s.length;
    for (const width of [3, 8, 13, 20, 100]) {
      const lines = wrapText(words.join(' '), width, measure);
      expect(lines.join(' ')).toBe(words.join(' '));
      for (const l of lines) expect(l.length <= width || !l.includes(' ')).toBe(true);
      // Greedy: the next line's first word would not have fitted on this one.
      for (let i = 0; i + 1 < lines.length; i++) expect(`${lines[i]} ${lines[i + 1]!.split(' ')[0]}`.length).toBeGreaterThan(width);
    }
  });
});
