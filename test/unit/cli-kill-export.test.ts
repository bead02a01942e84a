/**
 * Issue 17 check: SIGKILL during a large export never leaves a truncated target file. The real
 * `slewsmith fly` process (simulation thread, exports streamed through main/atomic-stream.ts) is
 * killed while it is part-way through writing a run's CSV of about 50 MB: the target keeps its old
 * contents byte for byte, the partial text exists only as our hidden temporary file, and no other
 * target appears. (main-atomic-stream.test.ts kills a bare writer; this kills the CLI itself.)
 */
import { spawn } from 'node:child_process';
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OWN_TEMP_NAME } from '../../main/atomic-write';
import { asset, bin, root } from './cli-harness';
import { tempDir } from './main-fakes';

let dir: string;
beforeAll(async () => {
  dir = await tempDir();
});
afterAll(() => fsp.rm(dir, { recursive: true, force: true }));

const OLD = 'the previous export, which must survive\n';

describe('SIGKILL mid-export (real CLI process)', () => {
  it('the target keeps its old contents; only a hidden temporary file holds the partial text', async () => {
    const j = JSON.parse(await fsp.readFile(asset('lumen6-imaging.scenario.json'), 'utf8'));
    j.simulation.durationS = 12000; // 120,001 samples at 10 Hz: a CSV of about 50 MB
    const scenario = path.join(dir, 'long.scenario.json');
    await fsp.writeFile(scenario, JSON.stringify(j));
    const out = path.join(dir, 'out');
    await fsp.mkdir(out);
    const target = 'long.pd.step-target.csv';
    await fsp.writeFile(path.join(out, target), OLD);

    const args = [bin, 'fly', scenario, '--controller', 'pd', '--mode', 'step-target', '--format', 'csv,json', '--out', out];
    const child = spawn(process.execPath, args, { cwd: root, stdio: 'ignore' });
    const exited = new Promise<void>((r) => child.on('exit', () => r()));
    let done = false;
    void exited.then(() => (done = true));
    // Watch the folder; kill once the CSV's temporary file holds a few megabytes (the write is under way).
    let partial: string | null = null;
    while (!done && partial === null) {
      await new Promise((r) => setTimeout(r, 5));
      for (const name of await fsp.readdir(out)) {
        if (!OWN_TEMP_NAME.test(name) || !name.startsWith(`.${target}.`)) continue;
        const st = await fsp.stat(path.join(out, name)).catch(() => null);
        if (st && st.size > 4 << 20) partial = name;
      }
    }
    expect(partial, 'the CLI finished before it could be killed mid-write').not.toBeNull();
    child.kill('SIGKILL');
    await exited;

    expect(await fsp.readFile(path.join(out, target), 'utf8')).toBe(OLD);
    const names = await fsp.readdir(out);
    // No other target appeared (the JSON comes after the CSV); what is left is the old file and the temp file.
    expect(names.filter((n) => !OWN_TEMP_NAME.test(n))).toEqual([target]);
    const size = (await fsp.stat(path.join(out, partial!))).size;
    expect(size).toBeGreaterThan(4 << 20);
  }, 600_000);
});
