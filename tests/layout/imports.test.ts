import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

/**
 * The package plan (DEVELOPERS.md) as a rule over the import graph: which workspace packages each one
 * may import, and that a package reaches another only through its declared exports, never by a
 * relative path into its files. Foreign modules: core and shared none but zod, web none of Node's.
 */
const PLAN: Record<string, { dir: string; may: string[] }> = {
  shared: { dir: 'shared', may: [] },
  core: { dir: 'core', may: ['shared'] },
  store: { dir: 'services/store', may: ['shared'] },
  'logger-data': { dir: 'services/logger-data', may: ['shared'] },
  usecases: { dir: 'services/usecases', may: ['shared', 'core', 'store'] },
  analyzer: { dir: 'services/analyzer', may: ['shared', 'core', 'store', 'usecases'] },
  api: { dir: 'services/api', may: ['shared', 'core', 'store', 'usecases', 'analyzer'] },
  cli: { dir: 'services/cli', may: ['shared', 'core', 'store', 'usecases', 'analyzer', 'logger-data'] },
  ingester: { dir: 'services/ingester', may: ['shared', 'store', 'logger-data'] },
  broker: { dir: 'services/broker', may: ['shared'] },
  simulator: { dir: 'services/simulator', may: ['shared', 'core', 'logger-data'] },
  stack: { dir: 'services/stack', may: ['shared', 'ingester', 'broker', 'api', 'simulator'] },
  web: { dir: 'web', may: ['shared', 'core'] },
};

const ROOT = resolve(import.meta.dirname, '../..');
const SPECIFIER =
  /(?:^|[\s;])(?:import|export)\s[^'"]*?from\s*'([^']+)'|import\(\s*'([^']+)'\s*\)|^import\s+'([^']+)'/gm;

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return name === 'node_modules' || name === 'dist' ? [] : sources(path);
    return /\.(ts|tsx|mjs)$/.test(name) ? [path] : [];
  });
}

function specifiers(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  return [...text.matchAll(SPECIFIER)].map((m) => (m[1] ?? m[2] ?? m[3])!);
}

/** Every import of every package's sources that breaks the plan, as `file: specifier (why)`. */
function violations(): string[] {
  const out: string[] = [];
  for (const [name, pkg] of Object.entries(PLAN)) {
    const root = join(ROOT, pkg.dir);
    const manifest = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as {
      dependencies?: Record<string, string>;
    };
    const declared = Object.keys(manifest.dependencies ?? {})
      .filter((d) => d.startsWith('@thermargin/'))
      .map((d) => d.slice('@thermargin/'.length));
    for (const d of declared) if (!pkg.may.includes(d)) out.push(`${pkg.dir}/package.json: declares ${d}`);
    for (const file of sources(root)) {
      const where = relative(ROOT, file);
      for (const s of specifiers(file)) {
        if (s.startsWith('.')) {
          const target = relative(root, resolve(dirname(file), s));
          if (target.startsWith('..')) out.push(`${where}: ${s} (reaches outside ${pkg.dir})`);
          continue;
        }
        const ours = /^@thermargin\/([^/]+)/.exec(s);
        if (ours) {
          const other = ours[1]!;
          if (other === name) out.push(`${where}: ${s} (its own package by name)`);
          else if (!pkg.may.includes(other)) out.push(`${where}: ${s} (${name} may not import ${other})`);
          else if (!declared.includes(other)) out.push(`${where}: ${s} (not in ${pkg.dir}/package.json)`);
          continue;
        }
        const node = s.startsWith('node:');
        if ((name === 'core' || name === 'shared') && s !== 'zod') out.push(`${where}: ${s} (pure package)`);
        else if (name === 'web' && node) out.push(`${where}: ${s} (the dashboard runs in a browser)`);
      }
    }
  }
  return out;
}

describe('import rules', () => {
  it('every package imports only what the package plan allows, through declared exports', () => {
    expect(violations()).toEqual([]);
  });

  it('every workspace package is in the plan', () => {
    const dirs = [
      'shared',
      'core',
      'web',
      ...readdirSync(join(ROOT, 'services')).map((d) => `services/${d}`),
    ];
    expect(dirs.sort()).toEqual(
      Object.values(PLAN)
        .map((p) => p.dir)
        .sort(),
    );
  });
});
