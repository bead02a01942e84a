/**
 * The CLI at its edges, each a regression test for a problem found by fuzzing from the outside:
 * input files (BOM, invalid UTF-8, non-object documents, size), exit codes and capped problem
 * lists, certify's classification, option values, output folders (an existing file, /proc),
 * unexpected exceptions without stack traces, and reproducible AEM headers. Most run in-process
 * through runCli (fast); cli-process.test.ts covers what needs a real process.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../../main/cli/index';
import { MAX_LISTED_ISSUES } from '../../main/cli/io';
import type { Computer } from '../../main/cli/compute';
import { asset, runInProcess as cli, STACK_TRACE } from './cli-harness';
import { tempDir } from './main-fakes';

let dir: string;
beforeAll(async () => {
  dir = await tempDir();
});
afterAll(() => fsp.rm(dir, { recursive: true, force: true }));

const demoText = () => fsp.readFile(asset('lumen6-imaging.scenario.json'), 'utf8');
async function put(name: string, body: string | Uint8Array): Promise<string> {
  const p = path.join(dir, name);
  await fsp.writeFile(p, body);
  return p;
}
async function mutated(name: string, edit: (j: Record<string, any>) => void): Promise<string> {
  const j = JSON.parse(await demoText());
  edit(j);
  return put(name, JSON.stringify(j));
}

describe('input files', () => {
  it('names a null, array, number or string document for every command that reads one (exit 2)', async () => {
    const docs: [string, string][] = [
      ['null', 'JSON null'],
      ['[1,2,3]', 'a JSON array of 3 items'],
      ['7', 'a JSON number (7)'],
      ['"scenario"', 'a JSON string of 8 characters'],
    ];
    for (const [body, what] of docs) {
      const f = await put('odd.json', body);
      for (const cmd of ['check', 'plan', 'fly', 'compare', 'certify', 'study']) {
        const r = await cli([cmd, f]);
        expect(r.code, `${cmd} ${body}`).toBe(2);
        expect(r.stderr).toContain(`the file holds ${what}; a scenario is a JSON object`);
      }
    }
  });

  it('accepts a UTF-8 byte-order mark and refuses invalid UTF-8 with the byte offset', async () => {
    const text = await demoText();
    const bom = await put('bom.json', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text)]));
    expect((await cli(['check', bom])).code).toBe(0);
    const bytes = Buffer.from(text);
    const at = bytes.indexOf('Lumen');
    bytes[at] = 0xe9; // Latin-1 é where UTF-8 was expected
    const bad = await cli(['check', await put('latin1.json', bytes)]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain(`the first bad byte sequence starts at byte offset ${at} (0xE9`);
    expect(bad.stderr).not.toContain('\ufffd');
  });

  it('states the size limit when a file exceeds it', async () => {
    const big = await put('big.json', '{"pad": "' + 'x'.repeat(20 * 1024 * 1024) + '"}');
    const r = await cli(['check', big]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/a scenario file is at most 20971520 bytes \(20 MiB\)/);
    await fsp.rm(big);
  });

  it('lists at most MAX_LISTED_ISSUES problems and counts the rest', async () => {
    // 1000 targets (the schema's most) each missing its attitude and carrying an unknown field.
    const f = await mutated('many.json', (j) => {
      j.targets = Array.from({ length: 1000 }, (_, i) => ({ bogus: i }));
    });
    const r = await cli(['check', f]);
    expect(r.code).toBe(2);
    const total = Number(/\((\d+) problems\)/.exec(r.stderr)?.[1]);
    expect(total).toBeGreaterThanOrEqual(1000);
    const lines = r.stderr.trimEnd().split('\n');
    expect(lines).toHaveLength(1 + MAX_LISTED_ISSUES + 1);
    expect(lines.at(-1)).toBe(`  … and ${total - MAX_LISTED_ISSUES} more problems`);
  });
});

describe('certify exit status: by what the certificate reports, not by message text', () => {
  it('an invalid hysteresis is invalid input (2); a hysteresis above the certified gap is a refusal (1)', async () => {
    const cases: [string, (j: Record<string, any>) => void, number, RegExp][] = [
      ['syn-neg', (j) => (j.controllers[2].gapThreshold = -0.1), 2, /invalid input/],
      ['syn-zero', (j) => (j.controllers[2].gapThreshold = 0), 2, /invalid input/],
      ['hyst-big', (j) => (j.controllers[1].hysteresis = 3), 2, /invalid input/],
      ['syn-above-gap', (j) => (j.controllers[2].gapThreshold = 0.5), 1, /certificate refused/],
    ];
    for (const [name, edit, code, message] of cases) {
      const r = await cli(['certify', await mutated(`${name}.json`, edit)]);
      expect(r.code, name).toBe(code);
      expect(r.stderr, name).toMatch(message);
    }
    const unknown = await cli(['certify', asset('lumen6-imaging.scenario.json'), '--controller', 'nope']);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toContain('no controller with id "nope"');
  });
});

describe('option values', () => {
  const fly = (...extra: string[]) =>
    cli([
      'fly',
      asset('lumen6-imaging.scenario.json'),
      '--controller',
      'pd',
      '--mode',
      'follow-plan',
      '--out',
      path.join(dir, 'fly'),
      ...extra,
    ]);

  it('--rate must be finite, at least 0.001 Hz and at most the control rate', async () => {
    for (const v of ['Infinity', '1e-320', 'abc', '0', '-1', '', 'NaN', '0x10', '5 Hz']) {
      const r = await fly('--rate', v);
      expect(r.code, v).toBe(2);
      expect(r.stderr, v).toContain("--rate must be a number of samples per second from 0.001 Hz up to the scenario's control rate");
    }
    const fast = await fly('--rate', '100');
    expect(fast.code).toBe(2);
    expect(fast.stderr).toContain("--rate must be at most the scenario's control rate, 10 Hz (got 100)");
    expect((await fly('--rate', '2', '--format', 'csv')).code).toBe(0);
  });

  it('every numeric study option goes through the same rule check', async () => {
    const study = (...extra: string[]) => cli(['study', asset('tern12-reversal.scenario.json'), ...extra]);
    const bad: [string, string, RegExp][] = [
      ['--runs', '0', /--runs must be a whole number from 1 to 10000000 \(got "0"\)/],
      ['--runs', '1.5', /--runs must be a whole number/],
      ['--runs', '1e3', /--runs must be a whole number/],
      ['--workers', '65', /--workers must be a whole number from 1 to 64/],
      ['--seed', '-1', /--seed must be a whole number from 0 to 4294967295/],
      ['--seed', '4294967296', /--seed must be a whole number/],
      ['--case', 'first', /--case must be a whole number from 0 to 268435455/],
    ];
    for (const [opt, v, msg] of bad) {
      const r = await study(opt, v);
      expect(r.code, `${opt} ${v}`).toBe(2);
      expect(r.stderr).toMatch(msg);
    }
  });

  it('--out naming an existing file, a place under /proc, or /proc itself: exit 2 at once with one line', async () => {
    const file = await put('not-a-folder', 'x');
    const t0 = Date.now();
    const cases: [string, RegExp][] = [
      [file, /--out .*not-a-folder names an existing file; give a folder/],
      ['/proc/slewsmith-test/out', /cannot create the folder \/proc\/slewsmith-test: the folder above it does not accept new folders/],
      ['/proc', /--out \/proc: cannot write there/],
      [path.join(file, 'sub'), /is a file, not a folder/],
    ];
    for (const [out, msg] of cases) {
      const r = await cli(['fly', asset('lumen6-imaging.scenario.json'), '--out', out]);
      expect(r.code, out).toBe(2);
      expect(r.stderr.trim().split('\n'), out).toHaveLength(1);
      expect(r.stderr).toMatch(msg);
    }
    // Each refusal comes before any simulation: all four together take well under the time of one run.
    expect(Date.now() - t0).toBeLessThan(5000);
    const csv = await cli(['compare', asset('lumen6-imaging.scenario.json'), '--csv', dir]);
    expect(csv.code).toBe(2);
    expect(csv.stderr).toContain('names a folder; give a file name');
  });
});

describe('unexpected failures', () => {
  const boom: Computer = async () => {
    throw new TypeError('cannot read properties of undefined');
  };

  it('print one line naming the command, no stack trace; the stack only with SLEWSMITH_DEBUG=1', async () => {
    const args = ['compare', asset('lumen6-imaging.scenario.json')];
    const r = await cli(args, { compute: boom });
    expect(r.code).toBe(1);
    expect(r.stderr).toBe(
      'slewsmith compare: unexpected failure: TypeError: cannot read properties of undefined (SLEWSMITH_DEBUG=1 shows where)\n',
    );
    expect(r.stderr).not.toMatch(STACK_TRACE);
    const d = await cli(args, { compute: boom, env: { SLEWSMITH_DEBUG: '1' } });
    expect(d.stderr).toMatch(/\n\s+at /);
  });
});

describe('interrupts (in-process)', () => {
  it('Ctrl-C during the simulation stops with 130 and writes nothing', async () => {
    let fire: (() => void) | null = null;
    let started!: () => void;
    const simulating = new Promise<void>((r) => (started = r));
    // A simulation that runs until it is aborted, and says when it has begun.
    const waitsForAbort: Computer = (_job, _progress, signal) =>
      new Promise((resolve) => {
        signal?.addEventListener('abort', () => resolve(null), { once: true });
        started();
      });
    const out = path.join(dir, 'interrupted');
    const run = cli(['fly', asset('lumen6-imaging.scenario.json'), '--out', out], {
      compute: waitsForAbort,
      onInterrupt: (h) => ((fire = h), () => (fire = null)),
    });
    await simulating;
    expect(fire).not.toBeNull();
    fire!();
    const r = await run;
    expect(r.code).toBe(130);
    expect(r.stderr).toContain('slewsmith fly: interrupted; 0 files written, none left half-written');
    expect(await fsp.readdir(out)).toEqual([]);
    expect(fire).toBeNull();
  });
});

describe('interrupts while writing (in-process)', () => {
  const big = 'x'.repeat(6 << 20) + '\n';
  const twoFiles: Computer = async () => ({
    kind: 'ran',
    feasible: true,
    headline: '',
    table: '',
    csv: '',
    json: '',
    failedRuns: [],
    runs: [],
    files: [
      { name: 'first.csv', text: big },
      { name: 'second.csv', text: big },
    ],
  });

  it('Ctrl-C after the first file: that one complete, the second not written, no temp file, status 130', async () => {
    const out = path.join(dir, 'interrupted-writing');
    let fire: (() => void) | null = null;
    const errLines: string[] = [];
    const code = await runCli(
      ['fly', asset('lumen6-imaging.scenario.json'), '--out', out],
      {
        // The "wrote …" line of the first file is the moment the user presses Ctrl-C.
        out: (line) => line.startsWith('wrote ') && fire?.(),
        err: (line) => errLines.push(line),
      },
      { env: {}, compute: twoFiles, onInterrupt: (h) => ((fire = h), () => (fire = null)) },
    );
    expect(code).toBe(130);
    expect(errLines).toContain('slewsmith fly: interrupted; 1 file written, none left half-written');
    expect(await fsp.readdir(out)).toEqual(['first.csv']);
    expect((await fsp.stat(path.join(out, 'first.csv'))).size).toBe(big.length);
    expect(fire).toBeNull();
  });
});

describe('reproducible exports', () => {
  const flyAem = async (out: string, extra: string[], env: Record<string, string> = {}) => {
    const args = [
      'fly',
      asset('lumen6-imaging.scenario.json'),
      '--controller',
      'hysteretic',
      '--mode',
      'step-target',
      '--format',
      'aem,csv',
    ];
    const r = await cli([...args, '--out', path.join(dir, out), ...extra], { env });
    expect(r.code, r.stderr).toBe(0);
    const read = (ext: string) => fsp.readFile(path.join(dir, out, `lumen6-imaging.hysteretic.step-target.${ext}`));
    return { aem: await read('aem'), csv: await read('csv') };
  };

  it('--creation-date and --message-id fix the AEM header: two runs give identical bytes', async () => {
    const opts = ['--creation-date', '2030-03-13T08:00:00Z', '--message-id', 'LUMEN6-PASS-0042'];
    const a = await flyAem('rep-a', opts);
    const b = await flyAem('rep-b', opts);
    expect(a.aem.equals(b.aem)).toBe(true);
    expect(a.csv.equals(b.csv)).toBe(true);
    const text = a.aem.toString();
    expect(text).toMatch(/^CREATION_DATE\s*=\s*2030-03-13T08:00:00(\.0+)?Z?$/m);
    expect(text).toMatch(/^MESSAGE_ID\s*=\s*LUMEN6-PASS-0042$/m);
  });

  it('SOURCE_DATE_EPOCH sets the creation date when no option does (reproducible-builds.org)', async () => {
    // 1900000000 s after the epoch is 2030-03-17T17:46:40Z (date -u -d @1900000000).
    const a = await flyAem('sde-a', [], { SOURCE_DATE_EPOCH: '1900000000' });
    const b = await flyAem('sde-b', [], { SOURCE_DATE_EPOCH: '1900000000' });
    expect(a.aem.equals(b.aem)).toBe(true);
    expect(a.aem.toString()).toMatch(/^CREATION_DATE\s*=\s*2030-03-17T17:46:40(\.0+)?Z?$/m);
    const opt = await flyAem('sde-c', ['--creation-date', '2031-01-01T00:00:00Z'], { SOURCE_DATE_EPOCH: '1900000000' });
    expect(opt.aem.toString()).toMatch(/^CREATION_DATE\s*=\s*2031-01-01T00:00:00/m);
  });

  it('refuses a malformed date, message id or SOURCE_DATE_EPOCH before simulating (exit 2)', async () => {
    const base = ['fly', asset('lumen6-imaging.scenario.json'), '--out', path.join(dir, 'never')];
    const bad: [string[], Record<string, string>, RegExp][] = [
      [['--creation-date', '2030-02-30T00:00:00Z'], {}, /--creation-date must be an ISO 8601 UTC time/],
      [['--creation-date', '2030-03-13 08:00'], {}, /--creation-date must be/],
      [['--message-id', 'Mixed-Case'], {}, /--message-id must be/],
      [['--message-id', 'a\nb'], {}, /--message-id must be/],
      [[], { SOURCE_DATE_EPOCH: '1.5e9' }, /SOURCE_DATE_EPOCH must be whole seconds/],
      [[], { SOURCE_DATE_EPOCH: '99999999999999' }, /SOURCE_DATE_EPOCH must be whole seconds/],
    ];
    for (const [extra, env, msg] of bad) {
      const r = await cli([...base, ...extra], { env });
      expect(r.code, extra.join(' ')).toBe(2);
      expect(r.stderr).toMatch(msg);
    }
    await expect(fsp.stat(path.join(dir, 'never'))).rejects.toThrow();
  });
});
