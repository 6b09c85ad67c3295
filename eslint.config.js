import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import { tidewingPlugin } from './eslint-rules/import-boundaries.js';

export default tseslint.config(
  { ignores: ['build/**', 'dist/**', 'node_modules/**', 'test-artifacts/**', 'docs/**'] },
  js.configs.recommended,
  ...tseslint.configs.strict,
  {
    languageOptions: { globals: { ...globals.node } },
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
