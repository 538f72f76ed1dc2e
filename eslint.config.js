import reactHooks from 'eslint-plugin-react-hooks';
import tseslint from 'typescript-eslint';

// Import boundaries (DEVELOPERS.md, "Boundaries"). Relative paths are matched as written, so each rule is a regular
// expression over the number of ../ a file needs to leave its own folder.
const boundary = (regex, message) => ({ regex, message });

// A web feature imports only its own files, web/components, web/lib, web/config and the allowed server modules.
// A file k folders below web/features/<name>/ leaves its feature with k + 1 ../ (into a sibling feature) or reaches
// web/features again from web/ (../…/features/).
const featureBoundary = (depth) => ({
  files: [`web/features/*/${'*/'.repeat(depth)}*.{ts,tsx}`],
  rules: {
    'no-restricted-imports': [
      'error',
      {
        patterns: [
          boundary(
            `^(\\.\\./){${depth + 1}}(?!\\.\\./)|^(\\.\\./)+features/`,
            'A web feature imports no other feature: move what both need to web/components/ or web/lib/, or compose the features in web/app/routes/.',
          ),
        ],
      },
    ],
  },
});

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
    // quantities module (units, typed-number grammar, selectivity display), the fit's flag limits, the table reader and the chart colours
    // (and types).
    // Two or more ../ reach the root api/; a single ../api/ is a feature's own api folder.
    files: ['web/**/*.{ts,tsx}'],
    rules: {
      // Type-only imports are erased at build time, so the browser may name the server's JSON shapes.
      '@typescript-eslint/no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              regex:
                '^(\\.\\./){2,}api/(?!features/[a-z-]+/([a-z]+-)?schemas$|science/(units|quantities|flag-rules)$|features/imports/table-text$|lib/chart-colors$)',
              message:
                'web/ may import only api/features/*/schemas and *-schemas (shared zod), api/science/quantities, api/science/flag-rules, api/features/imports/table-text and api/lib/chart-colors from the server, or types with `import type`.',
              allowTypeImports: true,
            },
          ],
        },
      ],
    },
  },
  {
    // Models, the migrations and the seed sit below the features: shared enums live in api/models/ or api/lib/.
    files: ['api/models/**/*.ts', 'api/db/**/*.ts', 'api/lib/**/*.ts', 'migrations/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            boundary(
              '^(\\.\\./)+features/',
              'api/models, api/db, api/lib and migrations import no feature: move the shared piece to api/models/ or api/lib/.',
            ),
          ],
        },
      ],
    },
  },
  ...[0, 1, 2, 3].map(featureBoundary),
  {
    // Shared web pieces know no feature.
    files: ['web/components/**/*.{ts,tsx}', 'web/lib/**/*.{ts,tsx}', 'web/config/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [boundary('^(\\.\\./)+features/', 'web/components, web/lib and web/config import no feature; pass data in as props.')],
        },
      ],
    },
  },
  {
    files: ['web/**/*.{ts,tsx}'],
    ...reactHooks.configs.flat.recommended,
    rules: {
      ...reactHooks.configs.flat.recommended.rules,
      // Only says the React Compiler would skip a component that uses TanStack Virtual; the app does not run that compiler.
      'react-hooks/incompatible-library': 'off',
    },
  },
  {
    files: ['scripts/**/*.mjs', '*.js'],
    languageOptions: { globals: { process: 'readonly', console: 'readonly', URL: 'readonly', setTimeout: 'readonly' } },
  },
);
