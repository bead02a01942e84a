/**
 * Serves a renderer build to the browser benches on 127.0.0.1, in one of two ways:
 *
 *  - 'app' (the default): the desktop app's own app:// handler (`main/protocol.ts`
 *    createAppProtocolHandler: `resolveAppPath`, `contentTypeFor`, the CSP, `nosniff` and
 *    `no-cache` headers) behind a small Node http server. Each file is read from disk and sent
 *    uncompressed, as the app loads it.
 *  - 'preview' (`SLEWSMITH_BENCH_SERVER=preview`): `vite preview`, as the benches did before. Its
 *    compression middleware gzips every script again on each request; in a fresh browser context
 *    (empty cache) that is ≈ 1.9 MB of scripts per load, which on a loaded machine delayed the
 *    pipeline worker's script by a few hundred ms. Those milliseconds are the bench server's, not
 *    the app's, so the cold-start figure changed with the default (DEVELOPERS.md, the app paragraph).
 */
import fsp from 'node:fs/promises';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { preview } from 'vite';
import { contentSecurityPolicy, electronConfig } from '../../electron.config';
import { createAppProtocolHandler } from '../../main/protocol';

export type BenchServerKind = 'app' | 'preview';

export interface BenchServer {
  kind: BenchServerKind;
  url: string;
  close(): Promise<void>;
}

/** The server kind asked for by SLEWSMITH_BENCH_SERVER ('app' unless it says 'preview'). */
export function benchServerKind(): BenchServerKind {
  const v = process.env.SLEWSMITH_BENCH_SERVER;
  if (v === undefined || v === '' || v === 'app') return 'app';
  if (v === 'preview') return 'preview';
  throw new Error(`SLEWSMITH_BENCH_SERVER must be 'app' or 'preview', got '${v}'`);
}

/** `outDir`: an absolute folder holding a renderer build (index.html, assets/). */
export async function serveBuild(root: string, outDir: string, kind: BenchServerKind = benchServerKind()): Promise<BenchServer> {
  if (kind === 'preview') {
    const server = await preview({
      configFile: path.join(root, 'vite.config.ts'),
      root: path.join(root, electronConfig.entries.rendererRoot),
      logLevel: 'error',
      build: { outDir },
      preview: { host: '127.0.0.1', port: 0, strictPort: true, open: false },
    });
    const url = server.resolvedUrls?.local[0];
    if (!url) throw new Error('vite preview started without a local URL');
    return { kind, url, close: () => server.close() };
  }
  const handle = createAppProtocolHandler({ rootDir: outDir, csp: contentSecurityPolicy, readFile: (p) => fsp.readFile(p) });
  const { scheme, host } = electronConfig.protocol;
  const server = http.createServer((req, res) => {
    // The same path under the app's scheme, so the app's own checks decide what is served.
    const appUrl = `${scheme}://${host}${req.url ?? '/'}`;
    void handle({ url: appUrl, method: req.method ?? 'GET' })
      .then(async (response) => {
        const headers: Record<string, string> = {};
        response.headers.forEach((value, name) => (headers[name] = value));
        const body = response.body ? Buffer.from(await response.arrayBuffer()) : null;
        if (body) headers['content-length'] = String(body.length);
        res.writeHead(response.status, headers);
        res.end(body);
      })
      .catch((err: unknown) => {
        res.writeHead(500, { 'content-type': 'text/plain; charset=utf-8' });
        res.end(String(err));
      });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  return {
    kind,
    url: `http://127.0.0.1:${port}/`,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
