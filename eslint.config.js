// ESLint (flat config): typescript-eslint's recommended rules, formatting left to Prettier, and the size limits
// that keep files and functions readable (max-lines 400, max-lines-per-function 80). See DEVELOPERS.md, "Lint".
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import prettier from 'eslint-config-prettier';

const node = Object.fromEntries(
  [
    'process',
    'console',
    'module',
    'Buffer',
    'URL',
    'performance',
    'setTimeout',
    'clearTimeout',
    'TextDecoder',
    'TextEncoder',
    'structuredClone',
  ].map((g) => [g, 'readonly']),
);

export default tseslint.config(
  { ignores: ['dist/', 'node_modules/', 'out/', 'coverage/', 'test-artifacts/', 'bench-results/', '.tmp/'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  prettier,
  {
    languageOptions: { globals: node },
    rules: {
      'max-lines': ['error', { max: 400, skipBlankLines: true, skipComments: true }],
      'max-lines-per-function': ['error', { max: 80, skipBlankLines: true, skipComments: true }],
      // positional parameters a caller's interface requires stay named even when unused
      '@typescript-eslint/no-unused-vars': ['error', { args: 'none', caughtErrors: 'none' }],
      // terminal escapes (ANSI colours, control characters) are matched on purpose
      'no-control-regex': 'off',
      // `let x = null` before branches that all assign it is this code base's style for readable flow
      'no-useless-assignment': 'off',
    },
  },
  // jsts ships no types
  { files: ['src/zones/clip.ts'], rules: { '@typescript-eslint/no-explicit-any': 'off' } },
  // tests: describe blocks are long by nature; parsed JSON is read loosely
  {
    files: ['tests/**', 'scripts/**'],
    rules: {
      'max-lines-per-function': 'off',
      '@typescript-eslint/no-explicit-any': 'off',
      'no-regex-spaces': 'off',
      'no-loss-of-precision': 'off',
    },
  },
);
