// Lint: the project's import boundaries (see DEVELOPERS.md) and a few correctness rules.
// Formatting is Prettier's job (`npm run format`), not ESLint's.
import tseslint from 'typescript-eslint';
import { importX } from 'eslint-plugin-import-x';
import { createTypeScriptImportResolver } from 'eslint-import-resolver-typescript';
import reactHooks from 'eslint-plugin-react-hooks';

const features = ['admin', 'articles', 'assets', 'auth', 'calculators', 'cases', 'guides', 'home', 'insights', 'search', 'walks'];

export default tseslint.config(
  { linterOptions: { reportUnusedDisableDirectives: 'off' } },
  { ignores: ['bench/.*', 'dist/**', 'node_modules/**', '.data/**', 'shots/**', 'public/**', 'dev-dist/**'] },
  {
    files: ['**/*.{ts,tsx}'],
    languageOptions: { parser: tseslint.parser, parserOptions: { ecmaVersion: 'latest', sourceType: 'module' } },
    plugins: { '@typescript-eslint': tseslint.plugin, 'import-x': importX },
    settings: { 'import-x/resolver-next': [createTypeScriptImportResolver({ project: './tsconfig.json' })] },
    rules: {
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            // src/shared is pure: shared by browser and server, it imports nothing else of ours.
            { target: './src/shared', from: ['./src/app', './src/features', './src/components', './src/lib', './server'], message: 'src/shared imports nothing else of the project.' },
            // The browser never reaches into the server.
            { target: './src', from: './server', message: 'Nothing in src/ imports server/.' },
            // Features meet only in src/app.
            ...features.map((f) => ({
              target: `./src/features/${f}`,
              from: './src/features',
              except: [`./${f}`],
              message: 'A feature never imports another feature; compose them in src/app.',
            })),
            // Shared UI and helpers carry no domain code.
            // (src/components/layouts is the signed-in frame, which composes navigation and the header search.)
            {
              target: ['./src/components/ui', './src/components/calculator', './src/components/errors', './src/components/rich-text', './src/components/tags', './src/lib'],
              from: ['./src/features', './src/app'],
              message: 'Shared UI and src/lib know no feature.',
            },
          ],
        },
      ],
      'import-x/no-self-import': 'error',
      'import-x/no-duplicates': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none', ignoreRestSiblings: true }],
      'no-debugger': 'error',
      eqeqeq: ['error', 'smart'],
    },
  },
  {
    files: ['src/**/*.tsx', 'src/**/*.ts'],
    plugins: { 'react-hooks': reactHooks },
    rules: { 'react-hooks/rules-of-hooks': 'error' },
  },
);
