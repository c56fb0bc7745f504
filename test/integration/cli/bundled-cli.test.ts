import { isAscii } from 'node:buffer';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { csvOf, inventedPrices } from '../../../bench/solve-universes.js';
import { BUNDLE_FILE } from '../../../src-main/cli/compiled-bundle.js';
import { runCliInProcess } from '../../support/run-cli-in-process.js';

/**
 * `npm run build` bundles the command line (scripts/build.mjs) into one file beside
 * dist/src-main/cli/main.js, with V8's code cache for it (compiled-bundle.ts). The bundle must
 * answer as the sources do, its code cache must be one V8 accepts, and every path it finds from
 * a module's own URL (package.json, the memo fonts, the renderer) must point at a file that
 * exists in dist/. Runs after a build, as `npm test` does.
 */
const cliDir = fileURLToPath(new URL('../../../dist/src-main/cli/', import.meta.url));
const bin = join(cliDir, 'main.js');
const bundle = join(cliDir, BUNDLE_FILE);
const built = existsSync(bin) && existsSync(bundle);
const dir = mkdtempSync(join(tmpdir(), 'holdfast-bundled-cli-'));

function spawned(argv: string[]) {
  const r = spawnSync(process.execPath, [bin, ...argv], { cwd: dir, encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const inProcess = (argv: string[]) => runCliInProcess(argv, dir);

/** Solver times differ from run to run; everything else must not. */
const withoutTimes = (json: string) => JSON.stringify(JSON.parse(json), (k, v: unknown) => (k === 'ms' ? 0 : v));

describe.runIf(built)('the bundled command line (dist/src-main/cli/main.js)', () => {
  beforeAll(() => {
    expect(spawned(['demo', '--out', '.']).code).toBe(0);
  });

  it('prints the same overview, version, command help and usage errors as the sources', async () => {
    for (const argv of [['--help'], ['--version'], ['solve', '--help'], ['estimate', '--method', 'nope'], ['nope']]) {
      const a = spawned(argv);
      const b = await inProcess(argv);
      expect({ code: a.code, stdout: a.stdout, stderr: a.stderr }, argv.join(' ')).toEqual(b);
    }
    const pkg = JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8')) as {
      version: string;
    };
    expect(spawned(['--version']).stdout).toBe(`${pkg.version}\n`);
  });

  it('solves the demonstration scenario to the same JSON as the sources', async () => {
    const argv = [
      'solve',
      '--prices',
      'demo-prices.csv',
      '--scenario',
      'demo-scenario.json',
      '--fx',
      'demo-fx.csv',
      '--json',
    ];
    const a = spawned(argv);
    const b = await inProcess(argv);
    expect(a.stderr).toBe(b.stderr);
    expect(a.code).toBe(b.code);
    expect(withoutTimes(a.stdout)).toBe(withoutTimes(b.stdout));
  });

  it('solves a universe large enough for the second thread (N = 700) to the same JSON as the sources', async () => {
    // The bundle's kernels split X'X, the eigen reduction and the Cholesky factors with a worker
    // thread above their thresholds (shared-core/linalg/kernel-team.ts); the sources in-process
    // have no team. The answers must agree bit for bit, so the JSON text does.
    const table = inventedPrices(700, 700_003, 'most-held');
    writeFileSync(join(dir, 'wide-prices.csv'), csvOf(table));
    writeFileSync(
      join(dir, 'wide-scenario.json'),
      JSON.stringify({
        format: 'holdfast-scenario@1',
        name: 'Wide universe',
        baseCurrency: 'EUR',
        constraints: { longOnly: true, weightBounds: { default: [0, 0.002] } },
        candidates: [
          { id: 'wide', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } },
        ],
      }),
    );
    const argv = ['solve', '--prices', 'wide-prices.csv', '--scenario', 'wide-scenario.json', '--json'];
    const a = spawned(argv);
    const b = await inProcess(argv);
    expect(a.stderr).toBe(b.stderr);
    expect(a.code).toBe(0);
    expect(withoutTimes(a.stdout)).toBe(withoutTimes(b.stdout));
  });

  it('writes the same memo bytes as the sources (its fonts found from the bundle)', async () => {
    const common = ['--prices', 'demo-prices.csv', '--scenario', 'demo-scenario.json', '--fx', 'demo-fx.csv'];
    const rest = ['--holdings', 'demo-household.json', '--date', '2025-06-30'];
    const a = spawned(['memo', ...common, ...rest, '--out', 'bundled.pdf']);
    expect(a.stderr).toBe('');
    expect(a.code).toBe(0);
    const b = await inProcess(['memo', ...common, ...rest, '--out', 'sources.pdf']);
    expect(b.code).toBe(0);
    expect(readFileSync(join(dir, 'bundled.pdf')).equals(readFileSync(join(dir, 'sources.pdf')))).toBe(true);
  });

  it("points every module's own URL at its emitted file", () => {
    const code = readFileSync(bundle, 'utf8');
    expect(code).not.toContain('import.meta');
    const mapped = [...code.matchAll(/pathToFileURL\(require\("node:path"\)\.join\(__dirname, "([^"]+)"\)\)/g)];
    // app-info (package.json), the memo fonts, the renderer root: its lookup and its message
    expect(mapped.length).toBeGreaterThanOrEqual(4);
    for (const [, path] of mapped) expect(existsSync(join(cliDir, path)), path).toBe(true);
  });

  it('is ASCII, which Node reads into a string without decoding UTF-8', () => {
    expect(isAscii(readFileSync(bundle))).toBe(true);
  });

  it('is compiled with a code cache that V8 accepts', () => {
    // In a process of its own, started as the command line is: V8 refuses a cache made under other flags.
    const loader = pathToFileURL(join(cliDir, 'compiled-bundle.js')).href;
    const r = spawnSync(
      process.execPath,
      [
        '--input-type=module',
        '-e',
        `import { compileBundle } from ${JSON.stringify(loader)};` +
          `process.stdout.write(String(compileBundle(${JSON.stringify(cliDir)}).script.cachedDataRejected));`,
      ],
      { encoding: 'utf8' },
    );
    expect(r.stderr).toBe('');
    expect(r.stdout).toBe('false');
  });
});
