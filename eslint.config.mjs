import { defineConfig, globalIgnores } from 'eslint/config';
import nextVitals from 'eslint-config-next/core-web-vitals';
import nextTs from 'eslint-config-next/typescript';
import prettier from 'eslint-config-prettier/flat';

export default defineConfig([
  ...nextVitals,
  ...nextTs,
  {
    rules: {
      // `const { secret: _secret, ...safe } = row` is how a column is dropped from a DTO.
      '@typescript-eslint/no-unused-vars': [
        'warn',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_', ignoreRestSiblings: true },
      ],
      // The React Compiler is not enabled (next.config.mjs), so its "compilation skipped" notice for
      // react-hook-form's watch() and TanStack's useReactTable() changes nothing.
      'react-hooks/incompatible-library': 'off',
    },
  },
  {
    // Test files hold no React components: their use* helpers are vitest fixtures (useTestDatabase,
    // useBrowser), not hooks. Component tests render from .tsx files, which keep the hooks rules.
    files: ['tests/**/*.ts'],
    rules: {
      'react-hooks/rules-of-hooks': 'off',
      'react-hooks/immutability': 'off',
    },
  },
  // Formatting is Prettier's job; this turns off the stylistic rules that would fight it.
  prettier,
  globalIgnores([
    '.next/**',
    '.next-bench/**',
    'node_modules/**',
    '.data/**',
    'coverage/**',
    'tests/e2e/output/**',
    'next-env.d.ts',
  ]),
]);
