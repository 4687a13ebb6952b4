/**
 * The web build's Metro resolver: zod's table of languages is swapped for its English messages,
 * and the screens' `expo-router` imports go to components/web/expo-router-slim.ts, on the web
 * only; nothing else is touched.
 */
import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const config = require('../../metro.config.js') as {
  resolver: { resolveRequest: (context: unknown, moduleName: string, platform: string | null) => { type: string; filePath?: string } };
};

const root = path.join(__dirname, '..', '..');
const zodLocales = path.join(root, 'node_modules', 'zod', 'v4', 'locales', 'index.js');
const zodCore = path.join(root, 'node_modules', 'zod', 'v4', 'core', 'index.js');

/** A Metro context whose own resolver answers `filePath` for every request. */
const contextAnswering = (filePath: string) => ({ resolveRequest: () => ({ type: 'sourceFile', filePath }) });

describe('metro.config.js', () => {
  it('gives the web build only the English zod messages', () => {
    const resolved = config.resolver.resolveRequest(contextAnswering(zodLocales), '../locales/index.js', 'web');
    expect(resolved).toEqual({ type: 'sourceFile', filePath: path.join(root, 'components', 'web', 'zod-locales-en.ts') });
  });

  it('leaves zod whole on other platforms and every other module alone', () => {
    expect(config.resolver.resolveRequest(contextAnswering(zodLocales), '../locales/index.js', 'ios').filePath).toBe(zodLocales);
    expect(config.resolver.resolveRequest(contextAnswering(zodCore), '../core/index.js', 'web').filePath).toBe(zodCore);
  });

  it('sends the screens’ expo-router imports to the slim module on the web only', () => {
    const slim = path.join(root, 'components', 'web', 'expo-router-slim.ts');
    const routerIndex = path.join(root, 'node_modules', 'expo-router', 'build', 'index.js');
    const fromApp = { ...contextAnswering(routerIndex), originModulePath: path.join(root, 'components', 'ui', 'button.tsx') };
    const fromPackage = { ...contextAnswering(routerIndex), originModulePath: path.join(root, 'node_modules', 'expo-router', 'build', 'ExpoRoot.js') };
    expect(config.resolver.resolveRequest(fromApp, 'expo-router', 'web').filePath).toBe(slim);
    expect(config.resolver.resolveRequest(fromApp, 'expo-router', 'ios').filePath).toBe(routerIndex);
    expect(config.resolver.resolveRequest(fromPackage, 'expo-router', 'web').filePath).toBe(routerIndex);
  });

  it('the slim module exports every name the screens import from expo-router', () => {
    const slimExports = new Set(
      [...fs.readFileSync(path.join(root, 'components', 'web', 'expo-router-slim.ts'), 'utf8').matchAll(/export \{([^}]+)\}/g)].flatMap((m) => m[1]!.split(',').map((n) => n.trim())),
    );
    const used = new Set<string>();
    const walk = (dir: string): string[] => fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? walk(path.join(dir, d.name)) : /\.tsx?$/.test(d.name) ? [path.join(dir, d.name)] : []));
    for (const file of [...walk(path.join(root, 'app')), ...walk(path.join(root, 'components'))]) {
      const source = ts.createSourceFile(file, fs.readFileSync(file, 'utf8'), ts.ScriptTarget.Latest);
      for (const node of source.statements) {
        if (!ts.isImportDeclaration(node) || (node.moduleSpecifier as ts.StringLiteral).text !== 'expo-router') continue;
        const clause = node.importClause;
        if (!clause || clause.isTypeOnly) continue;
        expect(clause.name).toBeUndefined(); // no default import from expo-router
        const named = clause.namedBindings;
        expect(named && ts.isNamedImports(named)).toBe(true); // no `import * as` either
        if (named && ts.isNamedImports(named)) for (const e of named.elements) if (!e.isTypeOnly) used.add((e.propertyName ?? e.name).text);
      }
    }
    expect(used.size).toBeGreaterThan(3);
    expect([...used].filter((n) => !slimExports.has(n))).toEqual([]);
  });
});
