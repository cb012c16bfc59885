/**
 * The layout rules of DEVELOPERS.md, checked over the source text (common practice, no
 * source): feature folders import each other without cycles, only repositories issue
 * database queries in the server, and source files stay under 400 lines.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = resolve(import.meta.dirname, '../..');

function filesUnder(dir: string, keep: (path: string) => boolean): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    if (name === 'node_modules' || name === 'dist' || name.startsWith('.')) continue;
    const path = join(dir, name);
    if (statSync(path).isDirectory()) out.push(...filesUnder(path, keep));
    else if (keep(path)) out.push(path);
  }
  return out;
}

const isSource = (p: string) => /\.(ts|tsx)$/.test(p) && !p.endsWith('.d.ts');
const IMPORT = /(?:^|\n)\s*(?:import|export)\s[^;]*?from\s+['"]([^'"]+)['"]/g;

/** Relative imports of a file, resolved to paths. */
function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  return [...text.matchAll(IMPORT)]
    .map((m) => m[1]!)
    .filter((s) => s.startsWith('.'))
    .map((s) => resolve(dirname(file), s));
}

/** The feature a path belongs to, or null outside `featuresDir`. */
const featureOf = (featuresDir: string, path: string): string | null => {
  const rel = relative(featuresDir, path);
  return rel.startsWith('..') ? null : rel.split(sep)[0]!;
};

/** Every cycle in the graph of features importing features, as "a → b → a". */
function featureCycles(featuresDir: string): string[] {
  const edges = new Map<string, Set<string>>();
  for (const file of filesUnder(featuresDir, (p) => isSource(p) && !/\.test\.tsx?$/.test(p))) {
    const from = featureOf(featuresDir, file)!;
    for (const target of importsOf(file)) {
      const to = featureOf(featuresDir, target);
      if (to && to !== from) {
        if (!edges.has(from)) edges.set(from, new Set());
        edges.get(from)!.add(to);
      }
    }
  }
  const cycles: string[] = [];
  const state = new Map<string, 'open' | 'done'>();
  const path: string[] = [];
  const visit = (f: string) => {
    state.set(f, 'open');
    path.push(f);
    for (const g of edges.get(f) ?? []) {
      if (state.get(g) === 'open') cycles.push([...path.slice(path.indexOf(g)), g].join(' → '));
      else if (!state.has(g)) visit(g);
    }
    path.pop();
    state.set(f, 'done');
  };
  for (const f of [...edges.keys()].sort()) if (!state.has(f)) visit(f);
  return cycles;
}

/** Over 400 lines and still to be split; nothing may be added here. */
const KNOWN_LONG = [
  join('apps', 'web', 'src', 'features', 'points', 'components', 'spectrum-panel.tsx'),
];

describe('layout rules', () => {
  it('server features import each other without cycles', () => {
    expect(featureCycles(join(root, 'apps/server/src/features'))).toEqual([]);
  });

  it('web features import each other without cycles', () => {
    expect(featureCycles(join(root, 'apps/web/src/features'))).toEqual([]);
  });

  it('in the server, only repositories issue database queries', () => {
    const QUERY =
      /\b(?:db|tx|ctx\.db)\s*\.\s*(?:select|insert|update|delete|execute)\s*\(|\.(?:pool|batchPool)\s*\.\s*query\s*\(/;
    const offenders = filesUnder(join(root, 'apps/server/src'), isSource)
      .filter((p) => /[/\\](features|lib)[/\\]/.test(p))
      .filter((p) => !/-repository\.ts$/.test(p) && !/\.test\.ts$/.test(p))
      .filter((p) => QUERY.test(readFileSync(p, 'utf8').replace(/\n\s*\./g, '.')))
      .map((p) => relative(root, p));
    expect(offenders).toEqual([]);
  });

  it('no source file outside tests is over 400 lines (the Drizzle schema excepted)', () => {
    const long = ['apps', 'packages']
      .flatMap((d) => filesUnder(join(root, d), isSource))
      .filter((p) => !/\.test\.tsx?$/.test(p))
      .filter((p) => !p.endsWith(join('packages', 'db', 'src', 'schema.ts')))
      .filter((p) => !p.endsWith('fft-kernel-wasm.ts')) // generated: the kernel as base64
      .filter((p) => !KNOWN_LONG.some((k) => p.endsWith(k)))
      .filter((p) => readFileSync(p, 'utf8').split('\n').length > 400)
      .map((p) => relative(root, p));
    expect(long).toEqual([]);
  });
});
