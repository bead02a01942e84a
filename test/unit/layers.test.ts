/**
 * Layer rules of design.md, enforced as an import check (the engine's own tsconfig — lib ES2022,
 * types [] — is the type-level half: a DOM or Node global there fails `npm test`'s type-check).
 * - app/engine imports only the packages of layers.config.js and itself, and each engine folder
 *   only folders of lower rank (layers.config.js; eslint.config.js enforces the same);
 * - app/ (renderer, views, bridge) never imports main/;
 * - main/ never imports app/ui or app/view3d.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { ENGINE_PACKAGES, ENGINE_RANKS } from '../../layers.config.js';

const root = path.resolve(__dirname, '../..');

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = path.join(dir, f);
    if (statSync(p).isDirectory()) return files(p);
    return /\.(ts|tsx)$/.test(f) ? [p] : [];
  });
}

function imports(file: string): string[] {
  const src = readFileSync(file, 'utf8');
  const out: string[] = [];
  for (const m of src.matchAll(
    /(?:import|export)\s[^'"]*?from\s+['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)|^\s*import\s+['"]([^'"]+)['"]/gm,
  ))
    out.push(m[1] ?? m[2] ?? m[3]!);
  return out;
}

describe('layer rules', () => {
  it('the engine imports nothing but its allowed packages and itself', () => {
    const bad: string[] = [];
    const engine = path.join(root, 'app/engine');
    for (const f of files(engine)) {
      for (const spec of imports(f)) {
        if (ENGINE_PACKAGES.includes(spec)) continue;
        if (spec.startsWith('.')) {
          const target = path.resolve(path.dirname(f), spec);
          if (target.startsWith(engine)) continue;
        }
        bad.push(`${path.relative(root, f)} imports ${spec}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it('each engine folder imports only folders of lower rank', () => {
    const engine = path.join(root, 'app/engine');
    const rank = new Map<string, number>();
    ENGINE_RANKS.forEach((group, r) => group.forEach((f) => rank.set(f, r)));
    const folderOf = (file: string) => path.relative(engine, file).split(path.sep)[0]!;
    const bad: string[] = [];
    for (const f of files(engine)) {
      const from = folderOf(f);
      const rFrom = from.endsWith('.ts') ? 0 : rank.get(from);
      if (rFrom === undefined) {
        bad.push(`app/engine/${from} has no rank in layers.config.js`);
        continue;
      }
      for (const spec of imports(f)) {
        if (!spec.startsWith('.')) continue;
        const target = path.resolve(path.dirname(f), spec);
        if (!target.startsWith(engine)) continue;
        const to = folderOf(target.endsWith('.ts') ? target : `${target}.ts`);
        if (to === from || to.endsWith('.ts')) continue;
        const rTo = rank.get(to);
        if (rTo === undefined || rTo >= rFrom!) bad.push(`${path.relative(root, f)} (rank ${rFrom}) imports ${spec} (${to}, rank ${rTo})`);
      }
    }
    expect([...new Set(bad)]).toEqual([]);
  });

  it('the renderer never imports main/, and main/ never imports the renderer views', () => {
    const bad: string[] = [];
    for (const dir of ['app/ui', 'app/view3d', 'app/bridge']) {
      for (const f of files(path.join(root, dir))) {
        for (const spec of imports(f)) {
          if (!spec.startsWith('.')) continue;
          const target = path.resolve(path.dirname(f), spec);
          if (target.startsWith(path.join(root, 'main'))) bad.push(`${path.relative(root, f)} imports ${spec}`);
        }
      }
    }
    for (const f of files(path.join(root, 'main'))) {
      for (const spec of imports(f)) {
        if (!spec.startsWith('.')) continue;
        const target = path.resolve(path.dirname(f), spec);
        if (target.startsWith(path.join(root, 'app/ui')) || target.startsWith(path.join(root, 'app/view3d')))
          bad.push(`${path.relative(root, f)} imports ${spec}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it('the check itself sees imports (a known engine import is found)', () => {
    expect(imports(path.join(root, 'app/engine/math/quaternion.ts'))).toContain('gl-matrix');
  });
});
