import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import { readdirSync } from 'node:fs';

// Dependencies run one way: src/ and server/ may import shared/ and (server only)
// server/engine/ through its one door, server/engine/index.ts; shared/ and the engine
// import neither; the client never imports the server. The aliases `@/` (src/) and
// `@shared/` (shared/) exist only in the client's build, so nothing else may use them.
const aliases = ['@/*', '@shared/*'];
const aliasMessage = 'The @/ and @shared/ aliases exist only in the client (src/).';
const noImport = (patterns, message, extra = []) => ({
  'no-restricted-imports': [
    'error',
    {
      paths: [{ name: 'react-router', message: 'Import from react-router-dom.' }],
      patterns: [{ group: patterns, message }, ...extra],
    },
  ],
});
const noAlias = [{ group: aliases, message: aliasMessage }];

// The client's own direction: src/ never imports the server, the engine or migrations.
const clientRules = [
  ['**/server/**', '**/engine/**', '**/migrations/**'],
  'The client talks to the server over HTTP only.',
];
// A feature uses another only through its public surface: its api/ hooks and its
// index.ts (`@/features/jobs`), never its components/, hooks/ or other files.
const features = readdirSync(new URL('./src/features/', import.meta.url), { withFileTypes: true })
  .filter((entry) => entry.isDirectory())
  .map((entry) => entry.name);
const featureBoundary = (self) => [
  {
    regex: `^@/features/(?!${self}/)[^/]+/(?!api/).+`,
    message:
      "Import another feature through its api/ files or its index.ts ('@/features/<name>'), not its internals.",
  },
];

export default tseslint.config(
  {
    ignores: [
      'node_modules/',
      'dist/',
      'data/',
      'coverage/',
      'scripts/bench/out/',
      'corpus-demo/out/',
    ],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' },
      ],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
    },
  },
  // Later blocks replace this rule for src/, shared/, migrations/ and the engine itself.
  {
    files: ['**/*.{ts,tsx,mjs}'],
    ignores: ['server/engine/**'],
    rules: noImport(
      ['**/engine/*', '!**/engine/index'],
      'Import the concept engine through its one door, server/engine/index.ts.',
      noAlias,
    ),
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
      ...noImport(...clientRules),
    },
  },
  ...features.map((feature) => ({
    files: [`src/features/${feature}/**/*.{ts,tsx}`],
    rules: noImport(...clientRules, featureBoundary(feature)),
  })),
  {
    files: ['shared/**/*.ts'],
    rules: noImport(
      ['**/server/**', '**/src/**', '**/engine/**'],
      'shared/ is imported by both sides and imports neither.',
      noAlias,
    ),
  },
  // The engine is a library: it reaches nothing outside its own folder.
  ...[
    ['server/engine/*.ts', '../*'],
    ['server/engine/*/*.ts', '../../*'],
    ['server/engine/*/*/*.ts', '../../../*'],
  ].map(([files, outside]) => ({
    files: [files],
    ignores: ['**/*.test.ts'],
    rules: noImport(
      [outside, '**/src/**', '**/shared/**', 'express'],
      'The concept engine is a library independent of the web server.',
      noAlias,
    ),
  })),
  {
    files: ['migrations/**/*.ts'],
    rules: noImport(
      ['**/server/**', '**/shared/**'],
      'Migrations are frozen in time: they import nothing of the app.',
      noAlias,
    ),
  },
);
