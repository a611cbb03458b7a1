import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import { importX, createNodeResolver } from 'eslint-plugin-import-x';
import fs from 'node:fs';
import path from 'node:path';

// Read from the tree, so a new feature or module is held to the same boundaries the day it appears.
const foldersIn = (dir) =>
  fs
    .readdirSync(dir, { withFileTypes: true })
    .filter((entry) => entry.isDirectory())
    .map((entry) => entry.name)
    .sort();
const FEATURES = foldersIn('src/features');
const SERVER_MODULES = foldersIn('server/modules');

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'uploads/**', 'test-results/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: { 'react-hooks/rules-of-hooks': 'error', 'react-hooks/exhaustive-deps': 'warn' },
  },
  {
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      // Test helpers parse arbitrary JSON bodies.
      '@typescript-eslint/no-explicit-any': 'off',
    },
  },

  // Import cycles anywhere in the client, the server and shared code.
  {
    files: ['src/**/*.{ts,tsx}', 'server/**/*.ts', 'shared/**/*.ts'],
    plugins: { 'import-x': importX },
    settings: {
      // Without these, import-x skips .ts/.tsx files when it follows imports (and finds no cycle).
      'import-x/extensions': ['.ts', '.tsx', '.js'],
      'import-x/parsers': { '@typescript-eslint/parser': ['.ts', '.tsx'] },
      'import-x/resolver-next': [
        createNodeResolver({
          extensions: ['.ts', '.tsx', '.js'],
          tsconfig: { configFile: path.resolve('tsconfig.json') },
        }),
      ],
    },
    rules: { 'import-x/no-cycle': ['error', { ignoreExternal: true }] },
  },

  // Boundaries. Each block lists what its files may not import; the messages say where to go instead.
  // A feature never imports another feature: pages in src/app/routes compose them.
  ...FEATURES.map((feature) => ({
    files: [`src/features/${feature}/**/*.{ts,tsx}`],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              regex: `^@/features/(?!${feature}/)`,
              message: 'Features never import each other; compose them in a page under src/app/routes.',
            },
            { regex: '^@/app/', message: 'src/app composes the features; a feature never imports it.' },
            { regex: '^(\\.\\./){2,}(?!components/|lib/)', message: 'Import other features and shared code by their @/ path.' },
          ],
        },
      ],
    },
  })),
  // src/lib is below the features (the event → cache table is src/app/realtime.ts).
  {
    files: ['src/lib/**/*.{ts,tsx}'],
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: [{ regex: '^@/(features|app)/', message: 'src/lib is shared by every feature and imports none of them.' }] },
      ],
    },
  },
  // A server module reaches another module only through that module's services, never its models.
  ...SERVER_MODULES.map((mod) => ({
    files: [`server/modules/${mod}/**/*.ts`],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              regex: `^\\.\\./(?!${mod}/)[a-z-]+/[a-z-]+\\.model$`,
              message: "Call the other module's service; its models are its own.",
            },
          ],
        },
      ],
    },
  })),
  // server/lib is below the modules.
  {
    files: ['server/lib/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: [{ regex: '/modules/', message: 'server/lib is shared by every module and imports none of them.' }] },
      ],
    },
  },
);
