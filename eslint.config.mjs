// ESLint for the whole repository: `npm run lint` (zero warnings), part of `npm test`.
// Formatting is Prettier's job (`npm run format:check`); eslint-config-prettier switches off the
// rules that would argue with it.
import js from '@eslint/js';
import { defineConfig, globalIgnores } from 'eslint/config';
import expo from 'eslint-config-expo/flat.js';
import prettier from 'eslint-config-prettier/flat';
import globals from 'globals';
import tseslint from 'typescript-eslint';

export default defineConfig([
  globalIgnores(['dist/**', 'build/**', 'data/**', 'drizzle/meta/**', 'bench/results/**', 'tests/e2e/artifacts/**', '.expo/**', 'expo-env.d.ts']),
  js.configs.recommended,
  // Expo's own set: import checks, React, the React Hooks rules (with the React Compiler's), Expo's rules.
  ...expo,
  ...tseslint.configs.recommended,
  {
    settings: {
      // `@/` is the one import alias (tsconfig.json `paths`).
      'import/resolver': { typescript: { project: './tsconfig.json' }, node: true },
    },
    rules: {
      // TypeScript already checks what these check, and they are the slowest rules here: the
      // advice of typescript-eslint's performance guide.
      'import/no-unresolved': 'off',
      'import/named': 'off',
      'import/namespace': 'off',
      'import/default': 'off',
      'import/no-named-as-default-member': 'off',
      // This rule says where the React Compiler would skip a component (react-hook-form's watch());
      // the app does not use the compiler (app.json has no reactCompiler), so nothing is skipped.
      'react-hooks/incompatible-library': 'off',
    },
  },
  {
    files: ['**/*.ts', '**/*.tsx'],
    rules: {
      // Expo's asset list plus the web fonts (.woff2, an asset in metro.config.js), and the
      // project's own CommonJS files (metro.config.js, the web build's stand-ins), which tests
      // read with require() and a stated shape.
      '@typescript-eslint/no-require-imports': [
        'warn',
        {
          allow: [
            '\\.(aac|aiff|avif|bmp|caf|db|gif|heic|html|jpeg|jpg|json|m4a|m4v|mov|mp3|mp4|mpeg|mpg|otf|pdf|png|psd|svg|ttf|wav|webm|webp|woff2|xml|yaml|yml|zip)$',
            '^\\.\\.?/.*\\.js$',
          ],
        },
      ],
    },
  },
  // One import alias on the client: `@/` (the server keeps relative imports: plain tsc builds it).
  {
    files: ['app/**/*.{ts,tsx}', 'components/**/*.{ts,tsx}'],
    rules: { 'no-restricted-imports': ['error', { patterns: [{ group: ['../*'], message: 'Import through the @/ alias.' }] }] },
  },
  // Node: the server, the database, the scripts, the bench, the tests and the config files.
  {
    files: ['server/**', 'db/**', 'scripts/**', 'bench/**', 'tests/**', '*.config.*', '*.js', '*.mjs', 'drizzle.config.ts'],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    files: ['**/*.cjs', 'babel.config.js', 'jest.config.js', 'metro.config.js', 'components/web/**/*.js'],
    languageOptions: { sourceType: 'commonjs', globals: { ...globals.node } },
    // A CommonJS module's top level is its own scope, so its names may match a browser global.
    rules: { '@typescript-eslint/no-require-imports': 'off', 'no-redeclare': ['error', { builtinGlobals: false }] },
  },
  {
    files: ['tests/**'],
    languageOptions: { globals: { ...globals.jest } },
    // Tests read the API's JSON answers loosely (supertest types them as any); the server's own
    // types are checked where it builds them.
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  // The service worker's template runs in the worker's scope, not a page's.
  {
    files: ['scripts/sw-template.js'],
    languageOptions: { sourceType: 'script', globals: { ...globals.serviceworker, workbox: 'readonly', __PAGE_ROUTES__: 'readonly', __WORKBOX_DIR__: 'readonly' } },
  },
  prettier,
]);
