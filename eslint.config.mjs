import nextVitals from 'eslint-config-next/core-web-vitals';
import nextTs from 'eslint-config-next/typescript';

/**
 * The engine boundary (shared/STYLE.md): simulator/ is a pure library. It may not
 * import React, Next.js, the app's lib/ or db/, or any database driver.
 */
const engineBoundary = {
  files: ['simulator/**/*.ts'],
  rules: {
    'no-restricted-imports': [
      'error',
      {
        paths: [
          { name: 'react', message: 'simulator/ is pure TypeScript: no React.' },
          { name: 'react-dom', message: 'simulator/ is pure TypeScript: no React.' },
          { name: 'knex', message: 'simulator/ never touches the database.' },
          { name: 'pg', message: 'simulator/ never touches the database.' },
          { name: 'server-only', message: 'simulator/ runs in the browser too.' },
        ],
        patterns: [
          { group: ['react/*', 'react-dom/*'], message: 'simulator/ is pure TypeScript: no React.' },
          { group: ['next', 'next/*', 'next-auth', 'next-auth/*'], message: 'simulator/ is pure TypeScript: no Next.js.' },
          { group: ['@/lib', '@/lib/*', '@/db', '@/db/*', '@/app/*', '@/components/*'], message: 'simulator/ may not import the app.' },
          { group: ['**/lib/*', '**/db/*', '**/app/*', '**/components/*'], message: 'simulator/ may not import the app.' },
        ],
      },
    ],
  },
};

/**
 * The engine's one entry (shared/STYLE.md): outside simulator/, the engine is imported from
 * `@/simulator` (simulator/index.ts) and nothing past it, so its insides can change freely.
 */
const engineEntry = {
  files: ['**/*.{ts,tsx,js,mjs,cjs}'],
  ignores: ['simulator/**'],
  rules: {
    'no-restricted-imports': [
      'error',
      {
        patterns: [
          { group: ['@/simulator/*', '**/simulator/*'], message: "Import the engine from '@/simulator' (simulator/index.ts) only; export what you need there." },
        ],
      },
    ],
  },
};

/** The engine-entry patterns, repeated where a later block sets no-restricted-imports again (a block's options replace earlier ones). */
const engineEntryPatterns = [
  { group: ['@/simulator/*', '**/simulator/*'], message: "Import the engine from '@/simulator' (simulator/index.ts) only; export what you need there." },
];

/**
 * The data layer sits below lib/ (DEVELOPERS.md, "Layout and boundaries"): db/ imports no
 * types or rules from lib/ — stored shapes live in db/types/. Its only reads upward are the
 * configuration (lib/env.ts) and the object store (lib/storage/), which import nothing else
 * from the app (tests/unit/db-boundary.test.ts checks both). The seed and script entry
 * points (db/seeds, db/scripts) sit above both and may use lib/.
 */
const dataLayer = {
  files: ['db/**/*.ts'],
  ignores: ['db/seeds/**', 'db/scripts/**', 'db/types/**'],
  rules: {
    'no-restricted-imports': [
      'error',
      {
        patterns: [
          ...engineEntryPatterns,
          {
            regex: '^@/lib(/(?!env$|storage/)|$)',
            message: 'db/ sits below lib/: put a stored type in db/types/, pass a rule\'s result in as an argument.',
          },
          { group: ['@/app/*', '@/components/*'], message: 'db/ may not import the app.' },
          { regex: '^(\\.\\./)+(lib(/(?!env$|storage/)|$)|app(/|$)|components(/|$))', message: 'db/ sits below lib/ and the app.' },
        ],
      },
    ],
  },
};

/** Stored shapes (db/types/): below both db/ and lib/, shared with the browser. */
const storedTypes = {
  files: ['db/types/**/*.ts'],
  rules: {
    'no-restricted-imports': [
      'error',
      {
        paths: [{ name: 'server-only', message: 'db/types/ is read by the browser too.' }],
        patterns: [
          ...engineEntryPatterns,
          { group: ['@/lib', '@/lib/*', '@/db', '@/db/*', '@/app/*', '@/components/*', 'knex', 'pg'], message: "db/types/ imports nothing from the app but the engine's types." },
        ],
      },
    ],
  },
};

const config = [
  ...nextVitals,
  ...nextTs,
  engineBoundary,
  engineEntry,
  dataLayer,
  storedTypes,
  {
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    ignores: ['node_modules/**', '.next/**', '.next-*/**', '.local/**', 'next-env.d.ts', 'test-results/**', 'playwright-report/**'],
  },
];

export default config;
