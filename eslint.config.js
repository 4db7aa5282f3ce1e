import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';

// Dependencies run one way: src/ and server/ may import shared/ and (server only)
// engine/; shared/ and engine/ import neither; the client never imports the server.
const noImport = (patterns, message) => ({
  'no-restricted-imports': ['error', { patterns: [{ group: patterns, message }] }],
});

export default tseslint.config(
  {
    ignores: ['node_modules/', 'dist/', 'data/', 'coverage/', 'bench/out/', 'corpus-demo/out/'],
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
  {
    files: ['src/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
      ...noImport(
        ['**/server/**', '**/engine/**', '**/migrations/**'],
        'The client talks to the server over HTTP only.',
      ),
    },
  },
  {
    files: ['shared/**/*.ts'],
    rules: noImport(
      ['**/server/**', '**/src/**', '**/engine/**'],
      'shared/ is imported by both sides and imports neither.',
    ),
  },
  {
    files: ['engine/**/*.ts'],
    rules: noImport(
      ['**/server/**', '**/src/**', 'express'],
      'The concept engine is independent of the web server.',
    ),
  },
  {
    files: ['migrations/**/*.ts'],
    rules: noImport(
      ['**/server/**', '**/shared/**'],
      'Migrations are frozen in time: they import nothing of the app.',
    ),
  },
);
