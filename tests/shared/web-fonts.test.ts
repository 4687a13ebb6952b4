/**
 * The web app's Inter files (assets/fonts/*.woff2) are what scripts/web-fonts.mjs makes from
 * @expo-google-fonts/inter, and they hold every character the screens write; a character left
 * out would show in the phone's own font in the middle of a word.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';

const root = path.join(__dirname, '..', '..');

function fromScript<T>(expression: string): T {
  const code = `import(${JSON.stringify(path.join(root, 'scripts', 'web-fonts.mjs'))}).then((m) => process.stdout.write(JSON.stringify(${expression})))`;
  const out = spawnSync(process.execPath, ['--input-type=module', '-e', code], { encoding: 'utf8' });
  if (out.status !== 0) throw new Error(out.stderr);
  return JSON.parse(out.stdout) as T;
}

/** Every character in the string literals and JSX text of the app's own source files. */
function charactersWritten(): Map<string, string> {
  const where = new Map<string, string>();
  const walk = (dir: string): string[] =>
    fs.readdirSync(dir, { withFileTypes: true }).flatMap((d) => (d.isDirectory() ? walk(path.join(dir, d.name)) : /\.tsx?$/.test(d.name) ? [path.join(dir, d.name)] : []));
  for (const file of ['app', 'components', 'shared'].flatMap((d) => walk(path.join(root, d)))) {
    const source = ts.createSourceFile(file, fs.readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, true, file.endsWith('x') ? ts.ScriptKind.TSX : ts.ScriptKind.TS);
    const visit = (node: ts.Node) => {
      if (ts.isStringLiteralLike(node) || ts.isJsxText(node) || ts.isTemplateLiteralToken(node)) {
        for (const ch of node.text) if (!where.has(ch)) where.set(ch, path.relative(root, file));
      }
      ts.forEachChild(node, visit);
    };
    visit(source);
  }
  return where;
}

describe('web fonts', () => {
  it('the committed files are what scripts/web-fonts.mjs writes from the package', () => {
    const check = spawnSync(process.execPath, [path.join(root, 'scripts', 'web-fonts.mjs'), '--check'], { encoding: 'utf8' });
    expect(check.stdout).not.toMatch(/differs/);
    expect(check.status).toBe(0);
  });

  it('are WOFF2, a fraction of the TrueType they come from', () => {
    const weights = fromScript<[number, string][]>('m.WEB_FONT_WEIGHTS');
    expect(weights.map(([w]) => w)).toEqual([400, 500, 600, 700]);
    for (const [weight, file] of weights) {
      const woff2 = fs.readFileSync(path.join(root, 'assets', 'fonts', `inter-${weight}.woff2`));
      expect(woff2.subarray(0, 4).toString('latin1')).toBe('wOF2'); // the WOFF2 signature (W3C WOFF2, section 3)
      const ttf = fs.statSync(path.join(root, 'node_modules', '@expo-google-fonts', 'inter', file)).size;
      expect(woff2.length).toBeLessThan(ttf / 5);
    }
  });

  it('hold every character the screens write', () => {
    const ranges = fromScript<[number, number][]>('m.WEB_FONT_RANGES');
    const covered = (cp: number) => ranges.some(([from, to]) => cp >= from && cp <= to);
    const written = charactersWritten();
    expect(written.size).toBeGreaterThan(80);
    // Layout characters (new lines, tabs) are never drawn.
    const missing = [...written]
      .filter(([ch]) => !/[\n\r\t]/.test(ch) && !covered(ch.codePointAt(0)!))
      .map(([ch, file]) => `U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')} ${ch} (${file})`);
    expect(missing).toEqual([]);
  });

  it('the web build treats .woff2 as an asset', () => {
    const config = require('../../metro.config.js') as { resolver: { assetExts: string[] } };
    expect(config.resolver.assetExts).toContain('woff2');
  });
});
