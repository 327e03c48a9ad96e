// ESLint with import boundaries: the architecture is checked, not only described.
import fs from 'node:fs';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import importX from 'eslint-plugin-import-x';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';

const features = fs.existsSync('src/features') ? fs.readdirSync('src/features').filter((f) => fs.statSync(`src/features/${f}`).isDirectory()) : [];

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**', 'tests/bench/.scratch/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { 'import-x': importX, 'react-hooks': reactHooks },
    rules: {
      '@typescript-eslint/no-explicit-any': 'off',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
      '@typescript-eslint/no-unsafe-function-type': 'off',
      'react-hooks/rules-of-hooks': 'error',
      'no-console': 'off',
      'import-x/no-restricted-paths': ['error', {
        zones: [
          { target: './analysis', from: ['./src', './server', './tests'], message: 'analysis/ is pure: it imports only libraries and shared types' },
          { target: './shared', from: ['./src', './server', './tests'], message: 'shared/ is the contract: it imports no client or server code' },
          { target: './src', from: ['./server'], message: 'the client talks to the server over HTTP only' },
          { target: './server', from: ['./src'], message: 'the server does not import client code' },
          ...features.map((f) => ({ target: `./src/features/${f}`, from: './src/features', except: [`./${f}`], message: 'features do not import each other: move shared pieces to src/components or src/lib' })),
        ],
      }],
    },
  },
  {
    files: ['tests/**'],
    rules: { 'no-restricted-syntax': ['error', { selector: "CallExpression[callee.object.name=/^(it|describe|test)$/][callee.property.name='only']", message: 'no focused tests' }] },
  },
);
