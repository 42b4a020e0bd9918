import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
      // Imports run one way: the client never reaches into the server or the simulator.
      'no-restricted-imports': ['error', { patterns: ['**/server/**', '**/simulator/**'] }],
    },
  },
  {
    files: ['shared/**/*.ts'],
    rules: {
      // shared/ is pure and imported by every side; it imports none of them.
      'no-restricted-imports': ['error', { patterns: ['**/server/**', '**/src/**', '**/simulator/**'] }],
    },
  },
  {
    files: ['server/**/*.ts'],
    rules: { 'no-restricted-imports': ['error', { patterns: ['**/src/**'] }] },
  },
);
