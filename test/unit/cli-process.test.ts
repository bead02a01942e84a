/**
 * The real `slewsmith` process (bin/slewsmith.mjs): what only a process shows — a closed output
 * pipe (EPIPE), Ctrl-C (SIGINT) while fly simulates in its worker thread, and the exit status
 * a shell sees for the problems cli-edges.test.ts checks in-process.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asset, spawnCli, STACK_TRACE } from './cli-harness';
import { tempDir } from './main-fakes';

let dir: string;
beforeAll(async () => {
  dir = await tempDir();
});
afterAll(() => fsp.rm(dir, { recursive: true, force: true }));

describe('slewsmith as a process', () => {
  it('a JSON null file: exit 2 with a message (it used to exit 2 in silence)', async () => {
    const f = path.join(dir, 'null.json');
    await fsp.writeFile(f, 'null');
    const r = await spawnCli(['check', f]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('the file holds JSON null; a scenario is a JSON object');
  });

  it('a reader that goes away (EPIPE on stdout, then on stderr too) ends quietly with the command status', async () => {
    // The pipe is closed before the CLI has started, so its first write fails with EPIPE.
    const closeOut = await spawnCli(['schema'], { onStart: (c) => c.stdout!.destroy() });
    expect(closeOut.code).toBe(0);
    expect(closeOut.stderr).toBe('');
    const both = await spawnCli(['check', path.join(dir, 'missing.json')], {
      onStart: (c) => {
        c.stdout!.destroy();
        c.stderr!.destroy();
      },
    });
    expect(both.code).toBe(2);
    const plan = await spawnCli(['plan', asset('lumen6-imaging.scenario.json'), '--json'], { onStart: (c) => c.stdout!.destroy() });
    expect(plan.code).toBe(0);
    expect(plan.stderr).not.toMatch(STACK_TRACE);
    expect(plan.stderr).not.toMatch(/EPIPE/);
  });

  it('Ctrl-C while fly simulates: status 130, a message, no stack trace and no file written', async () => {
    const out = path.join(dir, 'sigint');
    const r = await spawnCli(['fly', asset('tern12-reversal.scenario.json'), '--out', out], {
      onStart: (child, stderr) => {
        // Interrupt once the first of ten runs is reported: the simulation is under way.
        const poll = setInterval(() => {
          if (/\[1\/\d+\]/.test(stderr())) {
            clearInterval(poll);
            child.kill('SIGINT');
          }
        }, 20);
        child.on('exit', () => clearInterval(poll));
      },
    });
    expect(r.code).toBe(130);
    expect(r.stderr).toContain('slewsmith fly: interrupted; 0 files written, none left half-written');
    expect(r.stderr).not.toMatch(STACK_TRACE);
    expect(await fsp.readdir(out)).toEqual([]);
  });

  it('--out under /proc fails at once with one line instead of spinning', async () => {
    const t0 = Date.now();
    const r = await spawnCli(['fly', asset('lumen6-imaging.scenario.json'), '--out', '/proc/slewsmith/out']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim()).toBe(
      'error: --out /proc/slewsmith/out: cannot create the folder /proc/slewsmith: the folder above it does not accept new folders',
    );
    // Node start-up plus the check; the old code never returned.
    expect(Date.now() - t0).toBeLessThan(30_000);
  });
});
