import { spawn, spawnSync } from 'node:child_process';
import {
  chmodSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { docSteps, type DocStep } from './doc-blocks.js';

/**
 * Every command the README and docs/ show runs here, in page order, in a fresh folder per page:
 * the fenced `sh` blocks verbatim through /bin/sh (`npx holdfast` is the built command line,
 * dist/src-main/cli/main.js), the files the pages spell out (```csv my-prices.csv) written first,
 * each exit status checked (0, or the page's `# exit N`) and each line of a `text` block that
 * follows an `sh` block found in what the command printed. Not run here: `npm ci`, `npm start`,
 * `npm test` and `npm run ...` (CI runs `npm ci && npm test` itself, .ci/run), and `holdfast
 * serve`, which is started, must print its address, and is then stopped.
 */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const CLI = join(root, 'dist', 'src-main', 'cli', 'main.js');
const PAGES = [
  'README.md',
  ...readdirSync(join(root, 'docs'))
    .filter((f) => f.endsWith('.md'))
    .map((f) => `docs/${f}`),
];
const NOT_RUN = [/^npm ci\b/, /^npm start\b/, /^npm test\b/, /^npm run \S+/];
const SERVE = /^npx holdfast serve\b/;

const steps = new Map(PAGES.map((page) => [page, docSteps(readFileSync(join(root, page), 'utf8'))]));
const squeeze = (s: string) => s.replace(/\s+/g, ' ').trim();

describe('the pages name only what exists', () => {
  for (const page of PAGES) {
    const text = readFileSync(join(root, page), 'utf8');
    it(`${page}: every image and local link exists`, () => {
      const targets = [...text.matchAll(/!?\[[^\]]*\]\(([^)\s#]+)(?:#[^)]*)?\)/g)]
        .map((m) => m[1])
        .filter((t) => !/^[a-z]+:/.test(t));
      for (const target of targets)
        expect(existsSync(join(root, dirname(page), target)), `${page} names ${target}`).toBe(true);
    });
    it(`${page}: no path of one machine`, () => {
      expect(text).not.toMatch(/(^|[\s"'`(])\/(work|root|tmp|home)\//m);
    });
  }
});

describe('every command of the README and docs/ runs as shown', () => {
  let bin: string;
  beforeAll(() => {
    expect(existsSync(CLI), 'the command line is not built: npm run build').toBe(true);
    bin = mkdtempSync(join(tmpdir(), 'holdfast-doc-bin-'));
    // `npx holdfast ARGS` as a user types it, run against this checkout's built command line.
    writeFileSync(
      join(bin, 'npx'),
      `#!/bin/sh\n[ "$1" = holdfast ] || { echo "the docs may run only npx holdfast" >&2; exit 127; }\nshift\nexec "${process.execPath}" "${CLI}" "$@"\n`,
    );
    chmodSync(join(bin, 'npx'), 0o755);
  });
  afterAll(() => rmSync(bin, { recursive: true, force: true }));

  for (const [page, pageSteps] of steps) {
    const commands = pageSteps.filter((s) => s.kind === 'command');
    if (commands.length === 0) continue;
    it(`${page}: ${commands.length} commands`, async () => {
      const dir = mkdtempSync(join(tmpdir(), 'holdfast-doc-'));
      const env = { ...process.env, PATH: `${bin}:${process.env.PATH ?? ''}`, HOLDFAST_BROWSER: 'none' };
      let last: { step: DocStep; output: string } | undefined;
      try {
        for (const step of pageSteps) {
          const where = `${page}:${step.line}`;
          if (step.kind === 'file') {
            mkdirSync(dirname(join(dir, step.name)), { recursive: true });
            writeFileSync(join(dir, step.name), step.text);
          } else if (step.kind === 'output') {
            expect(last, `${where}: output shown with no command before it`).toBeDefined();
            for (const line of step.expected)
              expect(
                squeeze(last!.output),
                `${where}: the output of \`${(last!.step as { command: string }).command}\``,
              ).toContain(squeeze(line));
          } else if (NOT_RUN.some((r) => r.test(step.command))) {
            last = undefined;
          } else if (SERVE.test(step.command)) {
            last = { step, output: await serveBriefly(step.command, dir, env) };
          } else {
            const run = spawnSync('/bin/sh', ['-c', step.command], {
              cwd: dir,
              env,
              encoding: 'utf8',
              timeout: 180_000,
            });
            const output = `${run.stdout}${run.stderr}`;
            expect(
              run.status,
              `${where}: \`${step.command}\` exited ${run.status}: ${output.trim().split('\n').join(' | ')}`,
            ).toBe(step.exit);
            last = { step, output };
          }
        }
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    }, 600_000);
  }
});

/** Starts `holdfast serve`, waits for the address it prints, stops it with Ctrl-C; what it printed. */
function serveBriefly(command: string, cwd: string, env: NodeJS.ProcessEnv): Promise<string> {
  return new Promise((done, fail) => {
    const child = spawn('/bin/sh', ['-c', `exec ${command}`], { cwd, env });
    let output = '';
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      fail(new Error(`\`${command}\` printed no address in 60 s:\n${output}`));
    }, 60_000);
    const collect = (chunk: Buffer) => {
      output += chunk.toString();
      if (/http:\/\/127\.0\.0\.1:\d+\//.test(output)) child.kill('SIGINT');
    };
    child.stdout.on('data', collect);
    child.stderr.on('data', collect);
    child.on('exit', () => {
      clearTimeout(timer);
      done(output);
    });
  });
}
