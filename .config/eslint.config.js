// Lint: typescript-eslint's recommended type-aware rules (recommendedTypeChecked,
// with the tsconfig each file belongs to), plus the house rule that nothing at
// a boundary is typed `any`.
import tseslint from 'typescript-eslint';

export default tseslint.config(
  { ignores: ['out/**', 'dist/**', 'node_modules/**', 'test-artifacts/**', 'coverage/**', '**/*.js', '**/*.mjs'] },
  ...tseslint.configs.recommendedTypeChecked,
  {
    languageOptions: {
      // Every file belongs to one of these (tests included: app/tsconfig.test.json).
      parserOptions: {
        project: ['main/tsconfig.json', 'app/tsconfig.json', 'app/tsconfig.test.json', 'web/tsconfig.json'],
        tsconfigRootDir: new URL('..', import.meta.url).pathname,
      },
    },
  },
  {
    files: ['**/*.ts', '**/*.tsx'],
    rules: {
      '@typescript-eslint/no-explicit-any': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      'no-console': 'off',
      // An async function without await is how this code turns a throw into a rejected promise
      // for a Promise-returning interface (the service, fakes, the in-process transport): every
      // finding of this rule was of that kind.
      '@typescript-eslint/require-await': 'off',
    },
  },
  {
    // vitest's asymmetric matchers (expect.closeTo, expect.stringMatching…) are typed `any`, and
    // `expect(fake.method)` hands a mock to vitest, never calls it unbound.
    files: ['**/*.test.ts', '**/*.test.tsx'],
    rules: { '@typescript-eslint/no-unsafe-assignment': 'off', '@typescript-eslint/unbound-method': 'off' },
  },
);
