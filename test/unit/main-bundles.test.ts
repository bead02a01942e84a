/**
 * The Electron bundles as built (in memory, same config as `npm run build:main`): the sandboxed
 * preload is one CommonJS file that requires only `electron`; main requires only `electron` and
 * Node built-ins (everything else is bundled, so a packaged app needs no node_modules).
 */
import { builtinModules } from 'node:module';
import path from 'node:path';
import { build, type Rolldown } from 'vite';
import { describe, expect, it } from 'vitest';

async function bundle(mode: 'main' | 'preload'): Promise<Rolldown.OutputChunk[]> {
  const out = await build({
    configFile: path.resolve('main/vite.electron.config.ts'),
    mode,
    logLevel: 'error',
    build: { write: false, sourcemap: false },
  });
  const outputs = Array.isArray(out) ? out : [out];
  const chunks: Rolldown.OutputChunk[] = [];
  for (const o of outputs) if ('output' in o) for (const c of o.output) if (c.type === 'chunk') chunks.push(c);
  return chunks;
}

function requires(code: string): string[] {
  return [...new Set([...code.matchAll(/\brequire\(\s*["']([^"']+)["']\s*\)/g)].map((m) => m[1]!))].sort();
}

describe('electron bundles', () => {
  it('preload: a single CommonJS file requiring only electron', async () => {
    const chunks = await bundle('preload');
    expect(chunks.map((c) => c.fileName)).toEqual(['preload.cjs']);
    expect(requires(chunks[0]!.code)).toEqual(['electron']);
    expect(chunks[0]!.code).not.toMatch(/^\s*import[\s{*]|\bimport\(/m);
    expect(chunks[0]!.code).toContain('exposeInMainWorld("slewsmith"');
  });

  it('main: one CommonJS file requiring only electron and Node built-ins', async () => {
    const chunks = await bundle('main');
    expect(chunks.map((c) => c.fileName)).toEqual(['main.cjs']);
    const builtins = new Set([...builtinModules, ...builtinModules.map((m) => `node:${m}`)]);
    const external = requires(chunks[0]!.code).filter((r) => r !== 'electron' && !builtins.has(r));
    expect(external).toEqual([]);
    expect(requires(chunks[0]!.code)).toContain('electron');
  });
});
