/**
 * Once per vitest run that includes browser tests: build the renderer (dist/renderer) and serve
 * it with `vite preview` on 127.0.0.1, port 0 (the OS picks a free one). The URL is provided to
 * the tests as `slewsmithAppUrl` (see appUrl() in harness.ts); the server stops at the end.
 */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { preview } from 'vite';
import type { TestProject } from 'vitest/node';
import { electronConfig } from '../../electron.config';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  if (process.env.SLEWSMITH_SKIP_BROWSER === '1') {
    project.provide('slewsmithAppUrl', '');
    return async () => {};
  }
  // A child process, as `npm run build:renderer` would: vitest sets NODE_ENV=test, and a build in
  // this process would inherit it and bundle React's development build.
  const built = spawnSync(path.join(root, 'node_modules/.bin/vite'), ['build', '--logLevel', 'error'], {
    cwd: root,
    env: { ...process.env, NODE_ENV: 'production' },
    encoding: 'utf8',
  });
  if (built.status !== 0) throw new Error(`renderer build failed (vite build, status ${built.status}):\n${built.stderr}${built.stdout}`);
  const server = await preview({
    configFile: path.join(root, 'vite.config.ts'),
    root: path.join(root, electronConfig.entries.rendererRoot),
    logLevel: 'error',
    preview: { host: '127.0.0.1', port: 0, strictPort: true, open: false },
  });
  const url = server.resolvedUrls?.local[0];
  if (!url) throw new Error('vite preview started without a local URL');
  project.provide('slewsmithAppUrl', url.endsWith('/') ? url : `${url}/`);
  return async () => {
    await server.close();
  };
}
