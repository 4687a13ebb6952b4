/**
 * The web build's Metro resolver: zod's table of languages is swapped for its English messages
 * on the web only, and nothing else is touched.
 */
import path from 'node:path';

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
});
