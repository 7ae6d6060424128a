/**
 * ESLint: the architecture's import rules and the libraries' own rules, run by `npm test`
 * (tests/lint.ts) and by `npx eslint .`. Syntax only (no type information), so it stays fast.
 *
 * Import boundaries (import-x/no-restricted-paths, on resolved files):
 * - shared/ imports nothing from src/ or server/ (it runs in the browser, the server, workers and the CLI);
 * - src/ and server/ never import each other;
 * - a feature (src/features/<name>) imports no other feature; src/components and src/lib import
 *   no feature and not the app shell (src/app), which composes them;
 * - the engine (shared/engine) imports nothing else of shared/ (a pure engine with a small public API);
 * - Express routes (server/routes) build no queries: no drizzle-orm, no tables (server/db/schema.ts);
 *   they pass the database handle to services.
 */
import { readdirSync } from 'node:fs';
import tsParser from '@typescript-eslint/parser';
import pluginQuery from '@tanstack/eslint-plugin-query';
import importX from 'eslint-plugin-import-x';
import reactHooks from 'eslint-plugin-react-hooks';

const features = readdirSync(new URL('./src/features', import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name);
const sharedParts = readdirSync(new URL('./shared', import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory() && d.name !== 'engine')
  .map((d) => `./shared/${d.name}`);

const zones = [
  { target: './shared', from: ['./src', './server'], message: 'shared/ must not depend on the client or the server.' },
  { target: './src', from: './server', message: 'The client must not import server code; share it through shared/.' },
  { target: './server', from: './src', message: 'The server must not import client code; share it through shared/.' },
  { target: './shared/engine', from: sharedParts, message: 'The engine is pure: it imports nothing else of shared/.' },
  { target: ['./src/components', './src/lib'], from: ['./src/features', './src/app'], message: 'Components and lib are below the features and the app shell.' },
  { target: './src/features', from: './src/app', message: 'A feature must not import the app shell.' },
  ...features.map((f) => ({
    target: `./src/features/${f}`,
    from: './src/features',
    except: [`./${f}`],
    message: 'Features do not import each other: move what both need to src/components, src/lib or shared/.',
  })),
  { target: './server/routes', from: './server/db/schema.ts', message: 'Routes stay thin: query the database through a service.' },
];

export default [
  { ignores: ['dist/**', 'node_modules/**', '**/.cli-cache/**', 'drizzle/**', 'coverage/**', 'public/**'] },
  {
    files: ['**/*.{ts,tsx,mts,cts,js,mjs,cjs}'],
    languageOptions: { parser: tsParser, ecmaVersion: 'latest', sourceType: 'module', parserOptions: { ecmaFeatures: { jsx: true } } },
    plugins: { 'import-x': importX },
    settings: { 'import-x/resolver-next': [importX.createNodeResolver({ extensions: ['.ts', '.tsx', '.js', '.mjs', '.cjs', '.json'] })] },
    linterOptions: { reportUnusedDisableDirectives: 'error' },
    rules: {
      'import-x/no-restricted-paths': ['error', { zones }],
    },
  },
  {
    files: ['server/routes/**/*.ts'],
    rules: { 'no-restricted-imports': ['error', { paths: [{ name: 'drizzle-orm', message: 'Routes stay thin: query the database through a service.' }] }] },
  },
  {
    files: ['src/**/*.{ts,tsx}', 'tests/src/**/*.{ts,tsx}'],
    plugins: { '@tanstack/query': pluginQuery, 'react-hooks': reactHooks },
    rules: {
      ...pluginQuery.configs['flat/recommended'][0].rules,
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
    },
  },
];
