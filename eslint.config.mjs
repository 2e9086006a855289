// ESLint: Next.js's recommended rules (Core Web Vitals) with its TypeScript rules.
// `npm run lint` allows no warnings; .ci/run runs it and the type check before the tests.
import nextVitals from 'eslint-config-next/core-web-vitals';
import nextTs from 'eslint-config-next/typescript';
import prettier from 'eslint-config-prettier/flat';

const config = [
  ...nextVitals,
  ...nextTs,
  {
    rules: {
      // A leading underscore marks a value left out on purpose (`const { a: _a, ...rest } = x`).
      '@typescript-eslint/no-unused-vars': [
        'warn',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', destructuredArrayIgnorePattern: '^_' },
      ],
      // After signing in, joining or creating a co-op we load the next page in full on purpose, so
      // every server component and the navigation read the new session from the first paint.
      '@next/next/no-location-assign-relative-destination': 'off',
    },
  },
  // Tests read JSON response bodies loosely.
  { files: ['tests/**'], rules: { '@typescript-eslint/no-explicit-any': 'off' } },
  // CommonJS files (sequelize-cli migrations and seeders, a few scripts) use require().
  { files: ['**/*.cjs'], rules: { '@typescript-eslint/no-require-imports': 'off' } },
  // Layout is Prettier's (print width 120); `npm run lint` checks it after ESLint.
  prettier,
  {
    ignores: [
      '.next/**',
      '.data/**',
      'node_modules/**',
      'coverage/**',
      'tests/output/**',
      'bench/output/**',
      'next-env.d.ts',
      'lib/api/client/types.ts',
    ],
  },
];

export default config;
