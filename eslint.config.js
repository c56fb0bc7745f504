import { readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import js from '@eslint/js';
import tseslint from 'typescript-eslint';

/**
 * shared-core's layers, lowest first. A file may import its own folder and the folders of the
 * layers below its own: never a folder of its own layer (siblings stay independent, so no cycle
 * can form) nor one above. The scenario document is the lowest layer that knows a scenario; under
 * it sit only the errors, the arithmetic and the methods' definitions (names, options schemas,
 * words) that the document's schema is built from. Every folder and file of shared-core must be
 * named here: a new one fails the lint until it is given its place.
 */
const SHARED_CORE_LAYERS = [
  { name: 'errors', members: ['errors.ts'] },
  { name: 'arithmetic and method definitions', members: ['linalg', 'methods'] },
  { name: 'the scenario document and the data beside it', members: ['scenario', 'prices', 'stability', 'analytics'] },
  { name: 'returns, estimators, optimiser, stress', members: ['returns', 'estimators', 'optimise', 'stress'] },
  { name: 'walk-forward', members: ['walkforward'] },
  { name: 'run', members: ['run'] },
  { name: 'how figures are written', members: ['present'] },
  { name: 'the trade list', members: ['trades'] },
  { name: 'the book review', members: ['review'] },
  { name: 'the core seen from outside', members: ['contract', 'demo'] },
];

/** Deepest folder level under a layer's folder that the rules are written out for. */
const MAX_DEPTH = 5;

const sources = '*.{ts,tsx}';
const up = (n) => '\\.\\./'.repeat(n);
/** A member as the regular expression of an import path's rest: `linalg/...` or `errors.js`. */
const target = (member) => (member.endsWith('.ts') ? `${member.slice(0, -3).replace('.', '\\.')}\\.js$` : `${member}/`);

/** Bare module names shared-core may import: everything else (node:, react, electron, ...) is refused. */
const runtimePattern = {
  regex: '^(?!\\.|zod(/|$)|ml-matrix(/|$))',
  caseSensitive: true,
  message:
    'shared-core runs anywhere (main process, Web Worker, command line): it imports only itself, zod and ml-matrix',
};

function checkEveryMemberListed() {
  const listed = new Set(SHARED_CORE_LAYERS.flatMap((l) => l.members));
  const entries = readdirSync(fileURLToPath(import.meta.resolve('./shared-core/')), { withFileTypes: true });
  const unlisted = entries
    .filter((e) => e.isDirectory() || /\.tsx?$/.test(e.name))
    .map((e) => e.name)
    .filter((name) => !listed.has(name));
  if (unlisted.length > 0)
    throw new Error(
      `eslint.config.js: shared-core/${unlisted.join(', shared-core/')} belongs to no layer: add it to SHARED_CORE_LAYERS`,
    );
}

/** One block per member and folder depth: an import path's `../` count says where it lands. */
function sharedCoreLayerBlocks() {
  checkEveryMemberListed();
  const blocks = [];
  SHARED_CORE_LAYERS.forEach((layer, rank) => {
    const below = SHARED_CORE_LAYERS.slice(0, rank).flatMap((l) => l.members);
    const message = (member) =>
      `shared-core/${member} (layer "${layer.name}") imports only ${below.length ? below.join(', ') : 'nothing outside itself'}: layers import downwards (DEVELOPERS.md)`;
    for (const member of layer.members) {
      const allowed = [...below, member].map(target).join('|');
      if (member.endsWith('.ts')) {
        blocks.push({
          files: [`shared-core/${member}`],
          rules: {
            'no-restricted-imports': [
              'error',
              {
                patterns: [
                  runtimePattern,
                  { regex: `^\\.\\./|^\\./(?!(${allowed}))`, caseSensitive: true, message: message(member) },
                ],
              },
            ],
          },
        });
        continue;
      }
      for (let depth = 1; depth <= MAX_DEPTH; depth++)
        blocks.push({
          files: [`shared-core/${member}/${'*/'.repeat(depth - 1)}${sources}`],
          rules: {
            'no-restricted-imports': [
              'error',
              {
                patterns: [
                  runtimePattern,
                  { regex: `^${up(depth)}(?!(${allowed}))`, caseSensitive: true, message: message(member) },
                ],
              },
            ],
          },
        });
    }
  });
  return blocks;
}

/** The renderer reaches the main process only through the service API bridge, never by importing it. */
function rendererBlocks() {
  const message =
    'the renderer imports only itself and shared-core: it reaches the main process through the service API';
  const node = {
    regex: '^(node:|electron(/|$)|better-sqlite3$|fs$|path$|os$|child_process$)',
    caseSensitive: true,
    message,
  };
  const blocks = [];
  for (let depth = 0; depth <= MAX_DEPTH; depth++)
    blocks.push({
      files: [`src-renderer/${'*/'.repeat(depth)}${sources}`],
      rules: {
        'no-restricted-imports': [
          'error',
          { patterns: [node, { regex: `^${up(depth + 1)}(?!shared-core/)`, caseSensitive: true, message }] },
        ],
      },
    });
  return blocks;
}

export default tseslint.config(
  { ignores: ['dist/**', 'release/**', 'node_modules/**', 'test/artifacts/**', 'test/reference/fixtures/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { ecmaVersion: 2022, sourceType: 'module' },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['scripts/**/*.mjs', '*.js', 'test/reference/**/*.mjs'],
    languageOptions: { globals: { process: 'readonly', console: 'readonly' } },
  },
  {
    files: ['shared-core/**'],
    rules: {
      'no-restricted-globals': [
        'error',
        ...[
          'process',
          'window',
          'document',
          'navigator',
          'localStorage',
          'Buffer',
          'require',
          'globalThis',
          'self',
        ].map((name) => ({ name, message: 'shared-core runs anywhere: no global of Node or the browser' })),
      ],
      'no-restricted-syntax': [
        'error',
        {
          selector: 'ImportExpression',
          message: 'shared-core imports statically, so that its layer rules see every import',
        },
      ],
    },
  },
  ...sharedCoreLayerBlocks(),
  ...rendererBlocks(),
  {
    files: ['src-main/**/*.ts'],
    ignores: ['src-main/store/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        { paths: [{ name: 'better-sqlite3', message: 'only src-main/store opens SQLite: go through the store' }] },
      ],
    },
  },
);
