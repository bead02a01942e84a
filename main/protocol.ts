/**
 * The app:// protocol handler: serves the built renderer (dist/renderer) and nothing else.
 *
 * Each response carries the CSP header, a content type from the extension and `nosniff`. Paths are
 * decoded, normalised and checked to stay inside the renderer folder, so `app://slewsmith/../..`
 * cannot reach the rest of the disk.
 */
import path from 'node:path';
import { electronConfig } from '../electron.config';

const CONTENT_TYPES: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.jpg': 'image/jpeg',
  '.webp': 'image/webp',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.woff': 'font/woff',
  '.glb': 'model/gltf-binary',
  '.gltf': 'model/gltf+json',
  '.wasm': 'application/wasm',
  '.map': 'application/json; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
};

export function contentTypeFor(filePath: string): string {
  return CONTENT_TYPES[path.extname(filePath).toLowerCase()] ?? 'application/octet-stream';
}

/**
 * The file an app:// URL names inside `rootDir`, or null when the URL is not ours or escapes the
 * folder. `rootDir` must be absolute.
 */
export function resolveAppPath(url: string, rootDir: string): string | null {
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    return null;
  }
  if (u.protocol !== `${electronConfig.protocol.scheme}:` || u.host !== electronConfig.protocol.host) return null;
  let pathname: string;
  try {
    pathname = decodeURIComponent(u.pathname);
  } catch {
    return null;
  }
  if (pathname.includes('\0')) return null;
  // Decoded dot segments (%2e%2e, ..%5c) are refused outright rather than resolved.
  if (pathname.split(/[/\\]/).includes('..')) return null;
  if (pathname === '/' || pathname === '') pathname = `/${electronConfig.protocol.index}`;
  const root = path.resolve(rootDir);
  // Backslashes would be separators on Windows: treat them as such everywhere.
  const resolved = path.resolve(root, '.' + path.posix.normalize(pathname.replace(/\\/g, '/')));
  const rel = path.relative(root, resolved);
  if (rel === '' || rel.startsWith('..') || path.isAbsolute(rel)) return null;
  return resolved;
}

export interface ProtocolRequest {
  url: string;
  method: string;
}

export interface ProtocolHandlerDeps {
  rootDir: string;
  csp: string;
  readFile(filePath: string): Promise<Uint8Array>;
}

function textResponse(status: number, body: string, csp: string): Response {
  return new Response(body, {
    status,
    headers: { 'Content-Type': 'text/plain; charset=utf-8', 'Content-Security-Policy': csp, 'X-Content-Type-Options': 'nosniff' },
  });
}

export function createAppProtocolHandler(deps: ProtocolHandlerDeps): (request: ProtocolRequest) => Promise<Response> {
  return async (request) => {
    if (request.method !== 'GET' && request.method !== 'HEAD') return textResponse(405, 'method not allowed', deps.csp);
    const filePath = resolveAppPath(request.url, deps.rootDir);
    if (filePath === null) return textResponse(404, 'not found', deps.csp);
    let body: Uint8Array;
    try {
      body = await deps.readFile(filePath);
    } catch {
      return textResponse(404, 'not found', deps.csp);
    }
    const headers = {
      'Content-Type': contentTypeFor(filePath),
      'Content-Security-Policy': deps.csp,
      'X-Content-Type-Options': 'nosniff',
      'Cache-Control': 'no-cache',
    };
    return new Response(request.method === 'HEAD' ? null : (body as Uint8Array<ArrayBuffer>), { status: 200, headers });
  };
}
