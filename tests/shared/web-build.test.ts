/**
 * The web build's Metro resolver: zod's table of languages is swapped for its English messages,
 * and the screens' `expo-router` imports go to components/web/expo-router-slim.ts, on the web
 * only; nothing else is touched.
 */
import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';

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

  it('inlines requires in the web build only, keeping Expo’s other transform options', async () => {
    const { transformer } = require('../../metro.config.js') as {
      transformer: {
        getTransformOptions: (entries: string[], options: { platform: string | null }, deps: () => Promise<string[]>) => Promise<{ transform?: Record<string, unknown> }>;
      };
    };
    const noDeps = async () => [];
    const web = await transformer.getTransformOptions(['index.js'], { platform: 'web' }, noDeps);
    const ios = await transformer.getTransformOptions(['index.js'], { platform: 'ios' }, noDeps);
    expect(web.transform).toEqual({ ...ios.transform, inlineRequires: true });
    expect(ios.transform?.inlineRequires).toBe(false);
    expect(ios.transform?.experimentalImportSupport).toBe(true);
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
      [...fs.readFileSync(path.join(root, 'components', 'web', 'expo-router-slim.ts'), 'utf8').matchAll(/export \{([^}]+)\}/g)].flatMap((m) =>
        m[1]!.split(',').map((n) => n.trim()),
      ),
    );
    const used = new Set<string>();
    const walk = (dir: string): string[] =>
      fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? walk(path.join(dir, d.name)) : /\.tsx?$/.test(d.name) ? [path.join(dir, d.name)] : []));
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

  describe('Expo Router stand-ins', () => {
    const { ROUTER_STUBS, ROUTER_BUILD } = require('../../components/web/router-stubs/list.js') as {
      ROUTER_BUILD: string;
      ROUTER_STUBS: { file: string; stub: string; from?: string[] }[];
    };
    const routerFiles = (dir: string): string[] =>
      fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? routerFiles(path.join(dir, d.name)) : d.name.endsWith('.js') ? [path.join(dir, d.name)] : []));
    const all = routerFiles(ROUTER_BUILD);

    /** Every file under expo-router/build that requires `target`, with the names it reads from it. */
    function importersOf(target: string): { file: string; names: string[] }[] {
      const out: { file: string; names: string[] }[] = [];
      for (const file of all) {
        const text = fs.readFileSync(file, 'utf8');
        for (const m of text.matchAll(/(?:const|var|let) (\w+) = (?:__importStar\()?require\("(\.[^"]+)"\)/g)) {
          const spec = path.resolve(path.dirname(file), m[2]!);
          if (spec + '.js' !== target && path.join(spec, 'index.js') !== target) continue;
          const names = [...text.matchAll(new RegExp(`\\b${m[1]}\\.(\\w+)`, 'g'))].map((n) => n[1]!);
          out.push({ file, names: [...new Set(names)] });
        }
      }
      return out;
    }

    it.each(ROUTER_STUBS.map((s) => [path.relative(ROUTER_BUILD, s.file), s] as const))('%s: the web build gets the stand-in', (_name, s) => {
      const origin = s.from?.[0] ?? path.join(ROUTER_BUILD, 'ExpoRoot.js');
      expect(config.resolver.resolveRequest({ ...contextAnswering(s.file), originModulePath: origin }, 'x', 'web').filePath).toBe(s.stub);
      expect(config.resolver.resolveRequest({ ...contextAnswering(s.file), originModulePath: origin }, 'x', 'ios').filePath).toBe(s.file);
      if (s.from) {
        const other = path.join(ROUTER_BUILD, 'layouts', 'TabsClient.js');
        expect(config.resolver.resolveRequest({ ...contextAnswering(s.file), originModulePath: other }, 'x', 'web').filePath).toBe(s.file);
      }
    });

    it.each(ROUTER_STUBS.map((s) => [path.relative(ROUTER_BUILD, s.file), s] as const))('%s: the stand-in provides every name its importers read', (_name, s) => {
      // Read, not required: a stand-in may need react-native, which Node cannot load.
      const stub = new Set([...fs.readFileSync(s.stub, 'utf8').matchAll(/^exports\.(\w+) =/gm)].map((m) => m[1]!));
      const importers = importersOf(s.file).filter((i) => !s.from || s.from.includes(i.file));
      expect(importers.length).toBeGreaterThan(0);
      for (const { file, names } of importers) {
        expect({ file: path.relative(ROUTER_BUILD, file), missing: names.filter((n) => !stub.has(n)) }).toEqual({ file: path.relative(ROUTER_BUILD, file), missing: [] });
      }
    });

    it('the route-listing page is switched off, so its stand-in is never shown', () => {
      const app = JSON.parse(fs.readFileSync(path.join(root, 'app.json'), 'utf8')) as { expo: { plugins: (string | [string, Record<string, unknown>])[] } };
      const router = app.expo.plugins.find((p) => Array.isArray(p) && p[0] === 'expo-router') as [string, Record<string, unknown>];
      expect(router[1].sitemap).toBe(false);
    });
  });

  describe('react-native for the first page', () => {
    const slimFile = path.join(root, 'components', 'web', 'react-native-slim.js');
    const rnwIndex = path.join(root, 'node_modules', 'react-native-web', 'dist', 'index.js');
    const slimText = fs.readFileSync(slimFile, 'utf8');
    const leftOut = [.../const LEFT_OUT = \[([^\]]*)\];/.exec(slimText)![1]!.matchAll(/'(\w+)'/g)].map((m) => m[1]!);
    const named = [...slimText.matchAll(/^exports\.(\w+) = require\('react-native-web\/dist\/exports\/(\w+)'\)\.default;$/gm)].map((m) => [m[1]!, m[2]!] as const);
    const upstream = [...fs.readFileSync(rnwIndex, 'utf8').matchAll(/export \{ default as (\w+) \} from '\.\/exports\/(\w+)';/g)].map((m) => [m[1]!, m[2]!] as const);

    it('names every react-native-web export, each from its own file, except the left-out ones', () => {
      expect(upstream.length).toBeGreaterThan(50);
      expect(named.length + leftOut.length).toBe(upstream.length);
      expect(named).toEqual(upstream.filter(([name]) => !leftOut.includes(name)));
    });

    it('goes to the app and Expo in the browser build; the charts and the server render get the whole library', () => {
      const ask = (origin: string, environment?: string) =>
        config.resolver.resolveRequest(
          { ...contextAnswering(rnwIndex), originModulePath: origin, customResolverOptions: environment ? { environment } : {} },
          'react-native-web/dist/index',
          'web',
        ).filePath;
      expect(ask(path.join(root, 'components', 'ui', 'button.tsx'))).toBe(slimFile);
      expect(ask(path.join(root, 'node_modules', 'expo-router', 'build', 'ExpoRoot.js'))).toBe(slimFile);
      expect(ask(path.join(root, 'node_modules', 'victory-native', 'lib', 'index.js'))).toBe(rnwIndex);
      expect(ask(path.join(root, 'components', 'ui', 'button.tsx'), 'node')).toBe(rnwIndex);
    });

    it('no screen imports a left-out name from react-native', () => {
      const walk = (dir: string): string[] =>
        fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? walk(path.join(dir, d.name)) : /\.tsx?$/.test(d.name) ? [path.join(dir, d.name)] : []));
      const offenders: string[] = [];
      for (const file of [...walk(path.join(root, 'app')), ...walk(path.join(root, 'components'))]) {
        // Native-only files: a .native file, or one with a .web twin that the web build takes instead.
        if (/\.native\.tsx?$/.test(file) || fs.existsSync(file.replace(/\.(tsx?)$/, '.web.$1'))) continue;
        const source = ts.createSourceFile(file, fs.readFileSync(file, 'utf8'), ts.ScriptTarget.Latest);
        for (const node of source.statements) {
          if (!ts.isImportDeclaration(node) || (node.moduleSpecifier as ts.StringLiteral).text !== 'react-native') continue;
          const bindings = node.importClause?.namedBindings;
          if (bindings && ts.isNamedImports(bindings))
            for (const e of bindings.elements)
              if (!e.isTypeOnly && leftOut.includes((e.propertyName ?? e.name).text)) offenders.push(`${path.relative(root, file)}: ${e.name.text}`);
        }
      }
      expect(offenders).toEqual([]);
    });
  });
});
