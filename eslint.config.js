// Lint rules for the whole repository. Besides the usual TypeScript checks, the boundaries plugin
// enforces the layering DEVELOPERS.md describes: on the server, routes -> areas -> infrastructure ->
// db/shared, never back up; on the client, features never import each other; shared/ imports
// nothing of ours but shared/.
import js from '@eslint/js';
import boundaries from 'eslint-plugin-boundaries';
import prettier from 'eslint-config-prettier';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const AREAS = [
  'purchasing',
  'receiving',
  'stock',
  'inspection',
  'documents',
  'exports',
  'users',
  'instruments',
  'settings',
  'nonconformance',
  'supplierquality',
  'supplierperformance',
  'notifications',
  'dashboard',
];
const INFRASTRUCTURE = ['http', 'auth', 'audit', 'storage', 'mail', 'jobs'];

const type = (name) => ({ element: { type: name } });
const types = (...names) => ({ element: { types: { anyOf: names } } });
const from = (name, ...to) => ({ from: type(name), allow: { to: types(...to) } });

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { ecmaVersion: 2023, sourceType: 'module' },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', destructuredArrayIgnorePattern: '^_' }],
      '@typescript-eslint/no-non-null-assertion': 'off',
      // vite.config.ts names vitest's config types this way.
      '@typescript-eslint/triple-slash-reference': ['error', { types: 'always' }],
    },
  },
  { files: ['server/**', 'db/**', 'scripts/**', 'tests/**', '*.config.*'], languageOptions: { globals: globals.node } },
  { files: ['src/**'], languageOptions: { globals: globals.browser } },
  {
    files: ['src/**', 'server/**', 'shared/**', 'db/**'],
    // Tests may reach any layer to set up their case.
    ignores: ['**/*.test.ts', '**/*.test.tsx'],
    plugins: { boundaries },
    settings: {
      // The descriptors use the folder/full modes; their v7 replacement reads file patterns differently.
      'boundaries/legacy-warnings': false,
      'import/resolver': { typescript: { project: './tsconfig.json' }, node: true },
      'boundaries/include': ['src/**', 'server/**', 'shared/**', 'db/**'],
      'boundaries/elements': [
        // Server
        { type: 'server-entry', pattern: ['server/app.ts', 'server/main.ts'], mode: 'full' },
        { type: 'routes', pattern: 'server/routes', mode: 'folder' },
        { type: 'area', pattern: `server/(${AREAS.join('|')})`, mode: 'folder', capture: ['area'] },
        { type: 'infrastructure', pattern: `server/(${INFRASTRUCTURE.join('|')})`, mode: 'folder' },
        { type: 'server-base', pattern: ['server/config.ts', 'server/logger.ts'], mode: 'full' },
        { type: 'seed', pattern: 'db/seeders', mode: 'folder' },
        // A data migration may move stored files, so it may use the file store.
        { type: 'migration', pattern: 'db/migrations', mode: 'folder' },
        { type: 'db', pattern: 'db', mode: 'folder' },
        { type: 'shared', pattern: 'shared', mode: 'folder' },
        // Client
        { type: 'client-app', pattern: ['src/app', 'src/main.tsx'], mode: 'full' },
        { type: 'feature', pattern: 'src/features/*', mode: 'folder', capture: ['feature'] },
        { type: 'client-components', pattern: 'src/components', mode: 'folder' },
        { type: 'client-lib', pattern: 'src/lib', mode: 'folder' },
      ],
    },
    rules: {
      'boundaries/dependencies': [
        'error',
        {
          default: 'disallow',
          policies: [
            from('server-entry', 'server-entry', 'routes', 'area', 'infrastructure', 'server-base', 'db', 'shared'),
            from('routes', 'routes', 'area', 'infrastructure', 'server-base', 'shared'),
            from('area', 'area', 'infrastructure', 'server-base', 'db', 'shared'),
            from('infrastructure', 'infrastructure', 'server-base', 'db', 'shared'),
            from('server-base', 'server-base', 'shared'),
            from('seed', 'seed', 'area', 'infrastructure', 'server-base', 'db', 'shared'),
            from('db', 'db', 'server-base', 'shared'),
            from('migration', 'migration', 'db', 'infrastructure', 'server-base', 'shared'),
            from('shared', 'shared'),
            from('client-app', 'client-app', 'feature', 'client-components', 'client-lib', 'shared'),
            from('client-components', 'client-components', 'client-lib', 'shared'),
            from('client-lib', 'client-lib', 'shared'),
            // A feature reaches only its own folder, the shared UI, the session code and shared/.
            {
              from: type('feature'),
              allow: { to: { element: { type: 'feature', captured: { feature: '{{ from.captured.feature }}' } } } },
            },
            from('feature', 'client-components', 'client-lib', 'shared'),
          ],
        },
      ],
    },
  },
  // shared/ runs in browsers too: no Node built-ins.
  {
    files: ['shared/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [{ group: ['node:*', 'fs', 'path', 'crypto', 'events', 'buffer', 'stream'], message: 'shared/ must run in a browser as well as in Node' }],
        },
      ],
      'no-restricted-globals': [
        'error',
        { name: 'Buffer', message: 'shared/ must run in a browser: use Uint8Array / TextEncoder' },
        { name: 'process', message: 'shared/ must run in a browser' },
      ],
    },
  },
  prettier,
);
