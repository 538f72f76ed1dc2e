import tseslint from 'typescript-eslint';

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', '.tmp/**', 'coverage/**'] },
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,tsx}'],
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
    },
  },
  {
    // One-way imports: the engine knows nothing of HTTP, the database or the browser.
    files: ['api/science/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        { patterns: ['express', 'knex', 'objection', 'pg', 'node:*', '../features/*', '../db/*', '../models/*'] },
      ],
    },
  },
  {
    // The browser never imports server code, except zod schema modules shared on purpose, the pure
    // quantities module (units, typed-number grammar, selectivity display) and the table reader (and types).
    // Two or more ../ reach the root api/; a single ../api/ is a feature's own api folder.
    files: ['web/**/*.{ts,tsx}'],
    rules: {
      // Type-only imports are erased at build time, so the browser may name the server's JSON shapes.
      '@typescript-eslint/no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              regex: '^(\\.\\./){2,}api/(?!features/[a-z-]+/([a-z]+-)?schemas$|science/(units|quantities)$|features/imports/table-text$)',
              message:
                'web/ may import only api/features/*/schemas and *-schemas (shared zod), api/science/quantities and api/features/imports/table-text from the server, or types with `import type`.',
              allowTypeImports: true,
            },
          ],
        },
      ],
    },
  },
  {
    files: ['scripts/**/*.mjs', '*.js'],
    languageOptions: { globals: { process: 'readonly', console: 'readonly', URL: 'readonly', setTimeout: 'readonly' } },
  },
);
