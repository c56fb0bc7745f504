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

/**
 * src-main's layers, lowest first, by the same rule: the store and the file readers at the bottom,
 * the memo's pages, the use cases (app/) above them, and the commands, the service, the local web
 * host, the desktop shell and the generated docs on top. A use case never imports a command or the service; every
 * layer may import shared-core.
 */
const SRC_MAIN_LAYERS = [
  { name: 'threads', members: ['threads'] },
  { name: 'the store', members: ['store'] },
  { name: 'files', members: ['io'] },
  { name: "the memo's pages", members: ['memo'] },
  { name: 'use cases', members: ['app'] },
  { name: 'the demonstration store', members: ['demo'] },
  { name: 'the service API', members: ['service'] },
  { name: 'the local web host', members: ['web-host'] },
  { name: 'the command line, the desktop shell and the generated docs', members: ['cli', 'shell', 'docs'] },
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

function checkEveryMemberListed(root, layers) {
  const listed = new Set(layers.flatMap((l) => l.members));
  const entries = readdirSync(fileURLToPath(import.meta.resolve(`./${root}/`)), { withFileTypes: true });
  const unlisted = entries
    .filter((e) => e.isDirectory() || /\.tsx?$/.test(e.name))
    .map((e) => e.name)
    .filter((name) => !listed.has(name));
  if (unlisted.length > 0)
    throw new Error(
      `eslint.config.js: ${root}/${unlisted.join(`, ${root}/`)} belongs to no layer: add it to its layer list`,
    );
}

/**
 * One block per member and folder depth: an import path's `../` count says where it lands.
 * `outside` lists what every member may import outside `root` (as the rest of a path from the
 * repository root), `extra` adds the root's own patterns and paths, and `dynamic` checks
 * `import()` as well (shared-core refuses it outright).
 */
function layerBlocks(root, layers, { outside = [], extra = () => ({}), dynamic = false }) {
  checkEveryMemberListed(root, layers);
  const blocks = [];
  layers.forEach((layer, rank) => {
    const below = layers.slice(0, rank).flatMap((l) => l.members);
    const message = (member) =>
      `${root}/${member} (layer "${layer.name}") imports only ${below.length ? below.join(', ') : 'nothing outside itself'}${outside.length ? ` and ${outside.join(', ')}` : ''}: layers import downwards (DEVELOPERS.md)`;
    for (const member of layer.members) {
      const allowed = [...below, member].map(target);
      const files = member.endsWith('.ts')
        ? [{ glob: `${root}/${member}`, depth: 0 }]
        : Array.from({ length: MAX_DEPTH }, (_, i) => ({
            glob: `${root}/${member}/${'*/'.repeat(i)}${sources}`,
            depth: i + 1,
          }));
      const { patterns = [], paths } = extra(member);
      for (const { glob, depth } of files) {
        const reach = [...allowed, ...outside.map((o) => `${up(1)}${o}/`)].join('|');
        const regex = depth === 0 ? `^\\.\\./|^\\./(?!(${reach}))` : `^${up(depth)}(?!(${reach}))`;
        const rules = {
          'no-restricted-imports': [
            'error',
            {
              patterns: [...patterns, { regex, caseSensitive: true, message: message(member) }],
              ...(paths ? { paths } : {}),
            },
          ],
        };
        if (dynamic)
          rules['no-restricted-syntax'] = [
            'error',
            { selector: `ImportExpression[source.value=/${regex.replaceAll('/', '\\/')}/]`, message: message(member) },
          ];
        blocks.push({ files: [glob], rules });
      }
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
  ...layerBlocks('shared-core', SHARED_CORE_LAYERS, { extra: () => ({ patterns: [runtimePattern] }) }),
  ...rendererBlocks(),
  ...layerBlocks('src-main', SRC_MAIN_LAYERS, {
    outside: ['shared-core'],
    dynamic: true,
    extra: (member) =>
      member === 'store'
        ? {}
        : { paths: [{ name: 'better-sqlite3', message: 'only src-main/store opens SQLite: go through the store' }] },
  }),
);
