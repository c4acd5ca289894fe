// Lint rules, including the layering of the code by runtime:
//   core/      pure TypeScript, imported by everyone; imports nothing from Node, Electron, the DOM,
//              renderer/ or electron/ (its tsconfig also omits the DOM and Node type libraries).
//   renderer/  browser code; may import core/, never Node or Electron.
//   electron/  the desktop shell and the host (Node); may import core/, never renderer/.
import tseslint from 'typescript-eslint';

const nodeBuiltins = [
  'assert', 'buffer', 'child_process', 'cluster', 'crypto', 'dgram', 'dns', 'events', 'fs', 'fs/promises',
  'http', 'https', 'module', 'net', 'os', 'path', 'perf_hooks', 'process', 'readline', 'stream', 'timers',
  'tls', 'url', 'util', 'v8', 'vm', 'worker_threads', 'zlib',
];

export default tseslint.config(
  { ignores: ['node_modules/**', 'dist/**', 'samples/generated/**', 'test/output/**', 'test/.build/**', '**/*.c'] },
  ...tseslint.configs.recommended,
  {
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['core/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        paths: [...nodeBuiltins, 'electron'],
        patterns: [
          { group: ['node:*'], message: 'core/ is pure TypeScript: no Node modules.' },
          { group: ['electron', 'electron/*'], message: 'core/ must not import Electron.' },
          { group: ['**/renderer/**', '**/renderer', '**/electron/**', '**/electron'], message: 'core/ must not import renderer/ or electron/.' },
        ],
      }],
      'no-restricted-globals': ['error',
        'window', 'document', 'navigator', 'localStorage', 'sessionStorage', 'fetch', 'XMLHttpRequest',
        'process', 'Buffer', 'require', '__dirname', '__filename', 'global', 'setImmediate'],
    },
  },
  {
    files: ['renderer/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        paths: [...nodeBuiltins, 'electron'],
        patterns: [
          { group: ['node:*'], message: 'renderer/ is browser code: reach files through the host interface.' },
          { group: ['**/electron/**', '!**/electron/contract', '!**/electron/contract.ts'], message: 'renderer/ talks to the host only through electron/contract.' },
        ],
      }],
    },
  },
  {
    files: ['electron/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [{ group: ['**/renderer/**'], message: 'electron/ must not import renderer/.' }],
      }],
    },
  },
);
