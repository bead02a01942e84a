/** The app:// handler serves dist/renderer and nothing outside it, always with the CSP header. */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { contentSecurityPolicy } from '../../electron.config';
import { contentTypeFor, createAppProtocolHandler, resolveAppPath } from '../../main/protocol';
import { tempDir } from './main-fakes';

const root = path.resolve('/srv/renderer');

describe('resolveAppPath', () => {
  it('maps our URLs into the renderer folder', () => {
    expect(resolveAppPath('app://slewsmith/index.html', root)).toBe(path.join(root, 'index.html'));
    expect(resolveAppPath('app://slewsmith/', root)).toBe(path.join(root, 'index.html'));
    expect(resolveAppPath('app://slewsmith/assets/index-x.js?v=1#h', root)).toBe(path.join(root, 'assets/index-x.js'));
    expect(resolveAppPath('app://slewsmith/a%20b.json', root)).toBe(path.join(root, 'a b.json'));
  });

  it('refuses every way out of the folder and every foreign URL', () => {
    const bad = [
      'app://slewsmith/../../etc/passwd',
      'app://slewsmith/%2e%2e/%2e%2e/etc/passwd',
      'app://slewsmith/assets/%2e%2e%2f%2e%2e%2fsecret',
      'app://slewsmith/..%5c..%5csecret',
      'app://slewsmith/%00index.html',
      'app://slewsmith/%E0%A4%A',
      'app://other/index.html',
      'file:///srv/renderer/index.html',
      'https://slewsmith/index.html',
      'garbage',
    ];
    for (const u of bad) {
      const r = resolveAppPath(u, root);
      // Either refused, or (for URLs whose dots the URL parser already collapsed) still inside root.
      if (r !== null) expect(path.relative(root, r).startsWith('..'), u).toBe(false);
    }
    // The URL parser itself collapses %2e%2e segments (WHATWG URL), so this one stays inside.
    expect(resolveAppPath('app://slewsmith/%2e%2e/%2e%2e/etc/passwd', root)).toBe(path.join(root, 'etc/passwd'));
    // Encoded slashes survive the parser; the decoded dot segments are then refused.
    expect(resolveAppPath('app://slewsmith/assets/%2e%2e%2f%2e%2e%2fsecret', root)).toBeNull();
    expect(resolveAppPath('app://slewsmith/..%5c..%5csecret', root)).toBeNull();
    expect(resolveAppPath('app://slewsmith/%00index.html', root)).toBeNull();
    expect(resolveAppPath('app://other/index.html', root)).toBeNull();
    expect(resolveAppPath('file:///srv/renderer/index.html', root)).toBeNull();
  });

  it('knows the content types the renderer build emits', () => {
    expect(contentTypeFor('a/index.html')).toMatch(/^text\/html/);
    expect(contentTypeFor('x.JS')).toMatch(/^text\/javascript/);
    expect(contentTypeFor('x.css')).toMatch(/^text\/css/);
    expect(contentTypeFor('x.unknown')).toBe('application/octet-stream');
  });
});

describe('createAppProtocolHandler', () => {
  let dir: string;
  beforeAll(async () => {
    dir = await tempDir();
    await fsp.mkdir(path.join(dir, 'renderer'));
    await fsp.writeFile(path.join(dir, 'renderer/index.html'), '<!doctype html><title>t</title>');
    await fsp.writeFile(path.join(dir, 'secret.txt'), 'outside');
  });
  afterAll(() => fsp.rm(dir, { recursive: true, force: true }));

  const handler = () =>
    createAppProtocolHandler({ rootDir: path.join(dir, 'renderer'), csp: contentSecurityPolicy, readFile: (p) => fsp.readFile(p) });

  it('serves the index with CSP, content type and nosniff', async () => {
    const res = await handler()({ url: 'app://slewsmith/index.html', method: 'GET' });
    expect(res.status).toBe(200);
    expect(await res.text()).toContain('<title>t</title>');
    expect(res.headers.get('content-security-policy')).toBe(contentSecurityPolicy);
    expect(res.headers.get('content-type')).toMatch(/^text\/html/);
    expect(res.headers.get('x-content-type-options')).toBe('nosniff');
  });

  it('answers 404 (with CSP) for missing files and files outside the folder, 405 for writes', async () => {
    const h = handler();
    for (const url of ['app://slewsmith/nope.js', 'app://slewsmith/%2e%2e/secret.txt', 'app://other/index.html']) {
      const res = await h({ url, method: 'GET' });
      expect(res.status, url).toBe(404);
      expect(await res.text()).not.toContain('outside');
      expect(res.headers.get('content-security-policy')).toBe(contentSecurityPolicy);
    }
    expect((await h({ url: 'app://slewsmith/index.html', method: 'POST' })).status).toBe(405);
  });
});
