/**
 * What the screens import before they draw. Metro puts every module that two routes share into
 * one chunk that every page loads first, so a single static `import { z } from 'zod'` anywhere
 * under app/ or components/ puts zod (about 58 KiB gzip) back on the sign-in page. Forms load their
 * schemas through components/forms/lazy-resolver.ts instead; this walks the static import graph
 * from every route file, the way the bundler does, and fails if it reaches zod.
 */
import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';

const root = path.join(__dirname, '..', '..');
const EXTENSIONS = ['.web.tsx', '.web.ts', '.tsx', '.ts', '/index.tsx', '/index.ts'];

function resolveLocal(spec: string, from: string): string | null {
  const base = spec.startsWith('@/') ? path.join(root, spec.slice(2)) : path.resolve(path.dirname(from), spec);
  if (fs.existsSync(base) && fs.statSync(base).isFile()) return base;
  for (const ext of EXTENSIONS) if (fs.existsSync(base + ext)) return base + ext;
  return null;
}

/** The module names a file imports at load time: value imports and re-exports, not `import type` and not `import()`. */
export function staticImports(file: string): string[] {
  const source = ts.createSourceFile(file, fs.readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, true);
  const out: string[] = [];
  for (const node of source.statements) {
    if (ts.isImportDeclaration(node)) {
      const clause = node.importClause;
      if (clause?.isTypeOnly) continue;
      const named = clause?.namedBindings;
      const onlyTypes = clause && !clause.name && named && ts.isNamedImports(named) && named.elements.length > 0 && named.elements.every((e) => e.isTypeOnly);
      if (!onlyTypes) out.push((node.moduleSpecifier as ts.StringLiteral).text);
    } else if (ts.isExportDeclaration(node) && node.moduleSpecifier && !node.isTypeOnly) {
      out.push((node.moduleSpecifier as ts.StringLiteral).text);
    }
  }
  return out;
}

function routeFiles(dir: string): string[] {
  return fs
    .readdirSync(dir, { withFileTypes: true })
    .flatMap((d) => (d.isDirectory() ? routeFiles(path.join(dir, d.name)) : /\.tsx?$/.test(d.name) ? [path.join(dir, d.name)] : []));
}

/** Every package and app file reached from the routes without an `import()`, with one chain that reaches it. */
function reachedFromRoutes(): { packages: Map<string, string[]>; files: Map<string, string[]> } {
  const packages = new Map<string, string[]>();
  const files = new Map<string, string[]>();
  const seen = new Set<string>();
  const queue: { file: string; chain: string[] }[] = routeFiles(path.join(root, 'app')).map((file) => ({ file, chain: [path.relative(root, file)] }));
  while (queue.length) {
    const { file, chain } = queue.shift()!;
    if (seen.has(file)) continue;
    seen.add(file);
    files.set(path.relative(root, file), chain);
    for (const spec of staticImports(file)) {
      if (spec.startsWith('.') || spec.startsWith('@/')) {
        const next = resolveLocal(spec, file);
        if (next) queue.push({ file: next, chain: [...chain, path.relative(root, next)] });
      } else {
        const name = spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]!;
        const full = spec;
        if (!packages.has(full)) packages.set(full, chain);
        if (!packages.has(name)) packages.set(name, chain);
      }
    }
  }
  return { packages, files };
}

describe('the screens’ static imports', () => {
  const { packages: reached, files } = reachedFromRoutes();

  it('walks the real graph (react-hook-form and react-query are reached)', () => {
    expect(reached.has('react-hook-form')).toBe(true);
    expect(reached.has('@tanstack/react-query')).toBe(true);
  });

  it('never reach zod or its form resolver: forms load their checks lazily', () => {
    for (const banned of ['zod', '@hookform/resolvers/zod']) {
      const chain = reached.get(banned);
      expect(chain ? `${banned} via ${chain.join(' → ')}` : null).toBeNull();
    }
  });

  it('never reach date-fns: times are built by components/ui/format-time.ts, zones by @date-fns/tz', () => {
    expect(reached.has('@date-fns/tz')).toBe(true);
    const chain = reached.get('date-fns');
    expect(chain ? `date-fns via ${chain.join(' → ')}` : null).toBeNull();
  });

  it('never reach the rules engine: it runs on the server, and the screens import the thermal modules they use', () => {
    expect(files.has(path.join('shared', 'thermal', 'units.ts'))).toBe(true);
    for (const banned of ['evaluate.ts', 'manual-mode.ts', 'index.ts'].map((f) => path.join('shared', 'thermal', f))) {
      const chain = files.get(banned);
      expect(chain ? `${banned} via ${chain.join(' → ')}` : null).toBeNull();
    }
  });

  it('sees through a type-only import but not a value import', () => {
    const tmp = path.join(root, 'tests', 'shared', '.static-imports-fixture.ts');
    fs.writeFileSync(
      tmp,
      "import type { A } from 'zod';\nimport { type B, c } from 'left';\nimport { type D } from 'right';\nexport { e } from 'both';\nconst f = () => import('lazy');\n",
    );
    try {
      expect(staticImports(tmp)).toEqual(['left', 'both']);
    } finally {
      fs.unlinkSync(tmp);
    }
  });
});
