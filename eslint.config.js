import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import importX from 'eslint-plugin-import-x';
import globals from 'globals';

// The import direction of architecture.md: src and server never import each other; shared imports neither.
const zones = [
  { target: './src', from: './server', message: 'The client never imports server code; share it through shared/.' },
  { target: './server', from: './src', message: 'The server never imports client code; share it through shared/.' },
  { target: './shared', from: './src', message: 'shared/ is pure and imports neither side.' },
  { target: './shared', from: './server', message: 'shared/ is pure and imports neither side.' },
];

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'data/**', 'coverage/**', 'tmp/**', 'tests/e2e/screenshots/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { 'import-x': importX },
    rules: {
      'import-x/no-restricted-paths': ['error', { zones }],
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/no-explicit-any': 'error',
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: { ...reactHooks.configs.recommended.rules },
  },
);
