/**
 * The renderer as built for production (in memory, with vite.config.ts): no source maps are
 * emitted or referenced (SLEWSMITH_SOURCEMAP=1 turns them on for debugging; no test needs them),
 * and every Web Worker bundle runs with zod's no-eval setting, as the page
 * does (app/no-eval.ts; the CSP in electron.config.ts forbids eval).
 *
 * The worker check is behavioural: the built pipeline worker runs a scenario in a Node `vm`
 * context whose code generation from strings is off (`codeGeneration.strings: false`, Node's
 * equivalent of a CSP without 'unsafe-eval': eval and new Function throw EvalError) and whose
 * `Function` constructor records every call. A worker without the setting still works (zod catches
 * its failed probe) but calls `new Function("")` once — in a browser, a CSP violation report.
 */
import fs from 'node:fs';
import path from 'node:path';
import vm from 'node:vm';
import { build, type Rolldown } from 'vite';
import { beforeAll, describe, expect, it } from 'vitest';

type Output = Rolldown.OutputChunk | Rolldown.OutputAsset;
let outputs: Output[] = [];

beforeAll(async () => {
  const saved = process.env.SLEWSMITH_SOURCEMAP;
  delete process.env.SLEWSMITH_SOURCEMAP;
  try {
    const out = await build({ configFile: path.resolve('vite.config.ts'), logLevel: 'error', build: { write: false } });
    outputs = (Array.isArray(out) ? out : [out]).flatMap((o) => ('output' in o ? o.output : []));
  } finally {
    if (saved !== undefined) process.env.SLEWSMITH_SOURCEMAP = saved;
  }
}, 120_000);

const code = (o: Output) =>
  o.type === 'chunk' ? o.code : typeof o.source === 'string' ? o.source : Buffer.from(o.source).toString('utf8');
const workers = () => outputs.filter((o) => /\.worker-[\w-]+\.js$/.test(o.fileName));

describe('production renderer build', () => {
  it('the Electron main and preload builds do not ask for source maps either', async () => {
    const { default: config } = await import('../../main/vite.electron.config');
    for (const mode of ['main', 'preload'])
      expect(
        (config as (e: { mode: string; command: string }) => { build: { sourcemap: unknown } })({ mode, command: 'build' }).build.sourcemap,
      ).toBe(false);
  });

  it('emits no source map and references none', () => {
    expect(outputs.length).toBeGreaterThan(3);
    expect(outputs.filter((o) => o.fileName.endsWith('.map')).map((o) => o.fileName)).toEqual([]);
    for (const o of outputs.filter((x) => /\.(js|css|html)$/.test(x.fileName))) expect(code(o), o.fileName).not.toMatch(/sourceMappingURL/);
  });

  it('builds both workers with the jitless setting the page has', () => {
    expect(workers().map((w) => w.fileName.replace(/-[\w-]+\.js$/, ''))).toEqual(
      expect.arrayContaining(['assets/pipeline.worker', 'assets/study.worker']),
    );
    // The page's entry (app/boot.ts) starts the workers and loads the app chunk (app/main.tsx),
    // which sets zod's option before anything else; the entry itself holds no zod at all.
    const entry = outputs.find((o): o is Rolldown.OutputChunk => o.type === 'chunk' && o.isEntry)!;
    expect(entry.moduleIds.filter((id) => id.includes('node_modules/zod'))).toEqual([]);
    const main = outputs.find((o): o is Rolldown.OutputChunk => o.type === 'chunk' && !!o.facadeModuleId?.endsWith('app/main.tsx'))!;
    expect(main.isDynamicEntry).toBe(true);
    expect(entry.dynamicImports).toContain(main.fileName);
    // The page announces the app chunk so that it is fetched alongside the entry (vite.config.ts).
    const html = code(outputs.find((o) => o.fileName === 'index.html')!);
    expect(html).toContain(`<link rel="modulepreload" crossorigin href="./${main.fileName}">`);
    // zod's config({ jitless: true }) as minified: `({jitless:!0})`.
    const jitless = /\(\{\s*jitless\s*:\s*(?:!0|true)\s*\}\)/;
    // Booleans, not toMatch: a failure would otherwise print a whole bundle.
    expect(jitless.test(code(main))).toBe(true);
    for (const w of workers()) expect(jitless.test(code(w)), w.fileName).toBe(true);
  });

  /** The built pipeline worker in a context without code generation from strings, after flying the demo. */
  function runBuiltWorker() {
    const worker = workers().find((w) => w.fileName.includes('pipeline.worker'))!;
    const replies: { type: string; result?: { ok: boolean } }[] = [];
    const functionCalls: string[] = [];
    const sandbox: Record<string, unknown> = {
      console,
      performance,
      TextEncoder,
      TextDecoder,
      postMessage: (m: (typeof replies)[number]) => replies.push(m),
    };
    sandbox.self = sandbox;
    const context = vm.createContext(sandbox, { codeGeneration: { strings: false, wasm: false } });
    // Replace the context's own Function constructor by a recording one.
    vm.runInContext(
      `(() => { const F = Function; globalThis.Function = new Proxy(F, {
          construct(t, a) { record('new Function(' + a.length + ' args)'); return Reflect.construct(t, a); },
          apply(t, self, a) { record('Function(' + a.length + ' args)'); return Reflect.apply(t, self, a); },
        }); })()`,
      Object.assign(context, { record: (s: string) => functionCalls.push(s) }),
    );
    vm.runInContext(code(worker), context, { filename: worker.fileName });
    const scenarioText = fs.readFileSync(path.resolve('assets/lumen6-imaging.scenario.json'), 'utf8');
    vm.runInContext(
      `self.onmessage({ data: { type: 'run', id: 1, scenario: JSON.parse(text), options: { controllers: ['pd'], modes: ['profiled'] } } })`,
      Object.assign(context, { text: scenarioText }),
    );
    expect(replies.map((r) => r.type)).toEqual(['result']);
    expect(replies[0]!.result!.ok).toBe(true);
    expect(functionCalls).toEqual([]);
    return { context, replies, functionCalls, scenarioText };
  }

  it('the built pipeline worker runs a scenario without ever constructing code from a string', () => {
    runBuiltWorker();
  });

  it('the built pipeline worker loads its validator for an edited scenario, still without code from a string', async () => {
    const { context, replies, functionCalls, scenarioText } = runBuiltWorker();
    // Not the bundled demo (a mass edit the schema refuses): the worker loads the validator
    // (workerValidator.ts) and answers once it has; zod's jitless setting comes with it.
    vm.runInContext(
      `(() => { const s = JSON.parse(text); s.vehicle.inertiaKgm2[0][0] = -1;
         self.onmessage({ data: { type: 'run', id: 2, scenario: s, options: { controllers: ['pd'], modes: ['profiled'] } } }); })()`,
      Object.assign(context, { text: scenarioText }),
    );
    for (let k = 0; k < 20 && replies.length < 2; k++) await new Promise((r) => setTimeout(r, 0));
    expect(replies.map((r) => r.type)).toEqual(['result', 'result']);
    expect(replies[1]!.result!.ok).toBe(false);
    expect(JSON.stringify(replies[1]!.result)).toContain('vehicle.inertiaKgm2');
    expect(functionCalls).toEqual([]);
  });
});
