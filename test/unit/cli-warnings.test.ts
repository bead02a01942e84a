/**
 * CLI warnings (main/cli/io.ts printWarnings): one line each, the field path once. The expected
 * text is this tool's own format (no outside source).
 */
import { describe, expect, it } from 'vitest';
import { printWarnings } from '../../main/cli/io';

describe('printWarnings', () => {
  it('prints the path once whether or not the message repeats it', () => {
    const lines: string[] = [];
    printWarnings({ out: () => {}, err: (s) => lines.push(s) }, [
      { path: 'orbit.meanElements.epochUtc', rule: 'r', message: 'orbit.meanElements.epochUtc: after the table' },
      { path: 'vehicle.controlRateHz', rule: 'r', message: 'slow for this plant' },
      { path: '', rule: 'r', message: 'no field' },
    ]);
    expect(lines).toEqual([
      'warning: orbit.meanElements.epochUtc: after the table',
      'warning: vehicle.controlRateHz: slow for this plant',
      'warning: no field',
    ]);
  });

  it('folds a multi-line message onto one line', () => {
    const lines: string[] = [];
    printWarnings({ out: () => {}, err: (s) => lines.push(s) }, [{ path: 'a', rule: 'r', message: 'one\n  two' }]);
    expect(lines).toEqual(['warning: a: one two']);
  });
});
