import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import { tidewingPlugin } from './eslint-rules/plugin.js';

export default tseslint.config(
  { ignores: ['build/**', 'dist/**', 'node_modules/**', 'test-artifacts/**', 'docs/**'] },
  js.configs.recommended,
  ...tseslint.configs.strict,
  {
    // Node's globals everywhere but app/core, which sees the language's own globals only.
    ignores: ['app/core/**'],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    plugins: { tidewing: tidewingPlugin },
    rules: {
      'tidewing/import-boundaries': 'error',
      '@typescript-eslint/consistent-type-definitions': ['error', 'type'],
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_' }],
      // The sandboxed preload must be CommonJS; `import x = require()` keeps it typed.
      '@typescript-eslint/no-require-imports': ['error', { allowAsImport: true }],
      'no-restricted-syntax': [
        'error',
        { selector: 'ExportDefaultDeclaration', message: 'Use named exports.' },
      ],
    },
  },
  {
    // app/core: plain ECMAScript globals only (ESLint adds those of the language level itself),
    // no clock and no Math.random; the rule reports any other global by its own name.
    files: ['app/core/**'],
    languageOptions: { globals: { ...globals.es2023 } },
    rules: { 'tidewing/pure-core': 'error' },
  },
  {
    files: ['app/ui/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    rules: { ...reactHooks.configs.recommended.rules },
  },
  {
    // Tool configuration files must default-export for their tools.
    files: ['eslint.config.js', 'vite.config.ts', 'vitest.config.ts'],
    rules: { 'no-restricted-syntax': 'off' },
  },
);
