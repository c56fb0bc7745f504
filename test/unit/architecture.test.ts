import { readdirSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

/**
 * The folder a file lives in says what it may import; eslint.config.js holds the rules and
 * `npm run lint` applies them to the tree. These checks show that each rule fires on a forbidden
 * import and stays quiet on an allowed one, by linting probe text as if it lived at a given path.
 */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({ cwd: root });
});

/** The messages of the import and global rules for `code` placed at `path`. */
async function findings(path: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: join(root, path) });
  return result.messages
    .filter((m) => m.ruleId?.startsWith('no-restricted') || m.fatal)
    .map((m) => `${m.ruleId}: ${m.message}`);
}

const importing = (spec: string) => `import * as probe from '${spec}';\nexport const used = probe;\n`;

/** The one finding of a layer rule on a forbidden import. */
async function expectRefusedAsUpward(path: string, spec: string): Promise<void> {
  const found = await findings(path, importing(spec));
  expect(found).toHaveLength(1);
  expect(found[0]).toMatch(/^no-restricted-imports: .*layers import downwards/);
}

/** Every folder under `top` has a layer rule (a folder left out fails the lint configuration itself). */
async function expectEveryFolderLayered(top: string): Promise<void> {
  const folders = readdirSync(join(root, top), { withFileTypes: true }).filter((e) => e.isDirectory());
  expect(folders.length).toBeGreaterThan(5);
  for (const folder of folders) {
    const config = (await eslint.calculateConfigForFile(join(root, top, folder.name, 'probe.ts'))) as {
      rules: Record<string, [number, { patterns: { message: string }[] }]>;
    };
    const messages = config.rules['no-restricted-imports'][1].patterns.map((p) => p.message);
    expect(
      messages.some((m) => m.includes('layers import downwards')),
      folder.name,
    ).toBe(true);
  }
}

describe('shared-core imports downwards only (document, then estimators / optimiser / walk-forward, then the run)', () => {
  it.each([
    ['shared-core/scenario/probe.ts', '../estimators/registry.js', 'the document does not import the estimators'],
    ['shared-core/scenario/probe.ts', '../run/run-scenario.js', 'the document does not import the run'],
    ['shared-core/estimators/probe.ts', '../run/run-scenario.js', 'the estimators do not import the run'],
    ['shared-core/estimators/probe.ts', '../walkforward/engine.js', 'the estimators do not import the walk-forward'],
    ['shared-core/optimise/probe.ts', '../estimators/registry.js', 'siblings of one layer stay independent'],
    ['shared-core/stress/probe.ts', '../walkforward/metrics.js', 'stress does not import the walk-forward above it'],
    ['shared-core/walkforward/probe.ts', '../run/run-scenario.js', 'the walk-forward does not import the run'],
    ['shared-core/optimise/qp/probe.ts', '../../walkforward/engine.js', 'a sub-folder counts its own depth'],
    [
      'shared-core/methods/estimators/probe.ts',
      '../../scenario/schema.js',
      'method definitions sit below the document',
    ],
    ['shared-core/linalg/probe.ts', '../methods/define.js', 'arithmetic and method definitions are independent'],
    ['shared-core/errors.ts', './linalg/matrix.js', 'the errors import nothing of the core'],
  ])('%s importing %s is refused: %s', (path, spec) => expectRefusedAsUpward(path, spec));

  it('allows the imports the layers permit, at any depth and within a folder', async () => {
    for (const [path, spec] of [
      ['shared-core/scenario/probe.ts', '../errors.js'],
      ['shared-core/scenario/probe.ts', '../methods/define.js'],
      ['shared-core/estimators/probe.ts', '../scenario/estimator-spec.js'],
      ['shared-core/estimators/probe.ts', '../linalg/matrix.js'],
      ['shared-core/optimise/probe.ts', '../analytics/risk.js'],
      ['shared-core/optimise/qp/probe.ts', '../clock.js'],
      ['shared-core/optimise/qp/probe.ts', '../../linalg/matrix.js'],
      ['shared-core/walkforward/probe.ts', '../estimators/registry.js'],
      ['shared-core/walkforward/probe.ts', '../optimise/solve-candidate.js'],
      ['shared-core/run/probe.ts', '../walkforward/engine.js'],
      ['shared-core/run/probe.ts', './run-cache.js'],
      ['shared-core/run/probe.ts', 'zod'],
    ])
      expect(await findings(path, importing(spec)), `${path} importing ${spec}`).toEqual([]);
  });

  it('places every folder of shared-core in a layer (a folder left out fails the lint configuration itself)', () =>
    expectEveryFolderLayered('shared-core'));
});

describe('shared-core runs anywhere: no Node, DOM, Electron or React', () => {
  it.each(['node:fs', 'fs', 'react', 'electron', 'better-sqlite3', '../../src-main/io/read-input-file.js'])(
    'a core module importing %s is refused',
    async (spec) => {
      const found = await findings('shared-core/linalg/probe.ts', importing(spec));
      expect(found.length).toBeGreaterThan(0);
      expect(found.join('\n')).toMatch(/no-restricted-imports/);
    },
  );

  it('refuses the globals of Node and the browser, and a dynamic import, but not a property of the same name', async () => {
    for (const code of [
      'export const t = process.hrtime();',
      'export const w = window.innerWidth;',
      'export const d = document.title;',
      'export const b = Buffer.from([1]);',
      'export const m = import("./matrix.js");',
    ])
      expect(await findings('shared-core/linalg/probe.ts', code), code).toHaveLength(1);
    expect(
      await findings(
        'shared-core/linalg/probe.ts',
        "export const y = (s: { window?: { years?: number } }) => s.window?.years; // window.x\nexport const m = 'see window.from';\n",
      ),
    ).toEqual([]);
  });
});

describe('src-main imports downwards only (store and files, then the use cases, then the commands, service and hosts)', () => {
  it.each([
    ['src-main/app/probe.ts', '../cli/args.js', 'a use case does not import the command line'],
    ['src-main/app/probe.ts', '../service/index.js', 'a use case does not import the service'],
    ['src-main/io/probe.ts', '../app/scenario-inputs.js', 'the file readers do not import the use cases'],
    ['src-main/store/probe.ts', '../io/read-input-file.js', 'the store does not import the file readers'],
    ['src-main/memo/probe.ts', '../app/memo.js', "the memo's pages do not import the use cases"],
    ['src-main/service/probe.ts', '../cli/run-cli.js', 'the service does not import the command line'],
    ['src-main/cli/probe.ts', '../shell/menu.js', 'siblings of one layer stay independent'],
    ['src-main/cli/commands/probe.ts', '../../shell/menu.js', 'a sub-folder counts its own depth'],
    ['src-main/app/probe.ts', '../../src-renderer/main.js', 'nothing outside src-main but shared-core'],
  ])('%s importing %s is refused: %s', (path, spec) => expectRefusedAsUpward(path, spec));

  it('sees a dynamic import() too: a command loads what it may, a use case cannot load the service', async () => {
    const loading = (spec: string) => `export const load = () => import('${spec}');\n`;
    expect(await findings('src-main/app/probe.ts', loading('../service/index.js'))).toEqual([
      expect.stringMatching(/^no-restricted-syntax: .*layers import downwards/),
    ]);
    expect(await findings('src-main/cli/commands/probe.ts', loading('../../web-host/serve-store.js'))).toEqual([]);
  });

  it('allows the imports the layers permit, at any depth and within a folder', async () => {
    for (const [path, spec] of [
      ['src-main/app/probe.ts', '../io/read-input-file.js'],
      ['src-main/app/probe.ts', '../store/store.js'],
      ['src-main/app/probe.ts', '../memo/build-memo-input.js'],
      ['src-main/app/probe.ts', './memo.js'],
      ['src-main/app/probe.ts', '../../shared-core/errors.js'],
      ['src-main/cli/commands/probe.ts', '../../app/memo.js'],
      ['src-main/cli/commands/probe.ts', '../command.js'],
      ['src-main/cli/commands/probe.ts', '../../../shared-core/errors.js'],
      ['src-main/service/probe.ts', '../app/memo.js'],
      ['src-main/shell/probe.ts', '../web-host/security-headers.js'],
      ['src-main/io/probe.ts', 'node:fs'],
    ])
      expect(await findings(path, importing(spec)), `${path} importing ${spec}`).toEqual([]);
  });

  it('places every folder of src-main in a layer', () => expectEveryFolderLayered('src-main'));
});

describe('the renderer and the store', () => {
  it('the renderer reaches the main process only through the service API, never by importing it', async () => {
    for (const [path, spec] of [
      ['src-renderer/scenario/probe.tsx', '../../src-main/service/households.js'],
      ['src-renderer/scenario/probe.tsx', 'node:fs'],
      ['src-renderer/probe.ts', '../src-main/io/read-input-file.js'],
      ['src-renderer/worker/probe.ts', 'better-sqlite3'],
    ])
      expect(await findings(path, importing(spec)), `${path} importing ${spec}`).toHaveLength(1);
    expect(
      await findings('src-renderer/scenario/probe.tsx', importing('../../shared-core/scenario/schema.js')),
    ).toEqual([]);
  });

  it('no SQL outside the store: only src-main/store opens better-sqlite3', async () => {
    expect(await findings('src-main/service/probe.ts', importing('better-sqlite3'))).toHaveLength(1);
    expect(await findings('src-main/store/probe.ts', importing('better-sqlite3'))).toEqual([]);
  });
});
