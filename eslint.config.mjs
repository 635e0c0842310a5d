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

const config = [
  ...nextVitals,
  ...nextTs,
  engineBoundary,
  engineEntry,
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
