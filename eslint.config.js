// ESLint 9 flat config: typescript-eslint (type-aware for the rules that need it) and import-x for
// the dependency directions of house-style.md (shared ← everything; features never import each other;
// the worker never imports HTTP or ingest code; the simulator talks to the server only over MQTT).
import tseslint from 'typescript-eslint';
import importX from 'eslint-plugin-import-x';

const features = ['auth', 'map', 'units', 'pondside', 'night-round', 'tasks', 'treatments', 'observations', 'alerts', 'reports', 'rations', 'stock', 'imports', 'records', 'audit', 'setup', 'outbox'];

export default tseslint.config(
  { ignores: ['eslint.config.js', 'dist/**', 'node_modules/**', 'coverage/**', '.data/**', 'docs/**', 'scripts/**/*.mjs', '**/*.d.mts'] },
  ...tseslint.configs.recommended,
  {
    files: ['**/*.ts', '**/*.tsx'],
    languageOptions: {
      parserOptions: { project: ['./tsconfig.json', './tsconfig.app.json', './tsconfig.e2e.json'], tsconfigRootDir: import.meta.dirname },
    },
    plugins: { 'import-x': importX },
    rules: {
      '@typescript-eslint/no-explicit-any': 'error',
      '@typescript-eslint/no-floating-promises': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      'import-x/no-cycle': ['error', { maxDepth: 3, ignoreExternal: true }],
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            { target: './shared', from: ['./server', './worker', './src', './simulator', './tests', './scripts'], message: 'shared/ is isomorphic and imports nothing else in the repo.' },
            { target: './simulator', from: ['./server', './worker', './src'], message: 'The simulator talks to the server only over MQTT.' },
            { target: './worker', from: ['./server/http', './server/app.ts', './server/ingest'], message: 'The worker may use services, repositories, db and queues only.' },
            { target: './src', from: ['./server', './worker', './simulator'], message: 'The client reaches the server over HTTP only.' },
            ...features.map((f) => ({
              target: `./src/features/${f}`,
              from: './src/features',
              except: [`./${f}`],
              message: 'Features never import each other; compose them in src/app.',
            })),
          ],
        },
      ],
    },
  },
  {
    files: ['server/**/*.ts', 'worker/**/*.ts'],
    rules: { 'no-console': 'error' },
  },
  {
    files: ['**/*.test.ts', '**/*.test.tsx', 'tests/**/*.ts'],
    rules: { '@typescript-eslint/no-non-null-assertion': 'off' },
  },
);
