import next from 'eslint-config-next';
import nextTypescript from 'eslint-config-next/typescript';

const config = [
  ...next,
  ...nextTypescript,
  {
    ignores: ['node_modules/**', '.next/**', '.next-*/**', '.data/**', 'tests/artifacts/**', 'next-env.d.ts', 'coverage/**'],
  },
  {
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
];

export default config;
