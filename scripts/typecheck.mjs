// Typechecks every TypeScript project in the tree, each with its own runtime's types:
// shared-core with none (pure), src-main with Node's and Electron's, src-renderer with the DOM.
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const projects = ['shared-core', 'src-main', 'src-renderer', 'test', 'bench'];
const tsc = join(root, 'node_modules/typescript/bin/tsc');

const results = await Promise.all(
  projects.map(
    (project) =>
      new Promise((resolve) => {
        const child = spawn(process.execPath, [tsc, '--noEmit', '-p', join(project, 'tsconfig.json')], {
          cwd: root,
          stdio: ['ignore', 'pipe', 'pipe'],
        });
        let output = '';
        child.stdout.on('data', (chunk) => (output += chunk));
        child.stderr.on('data', (chunk) => (output += chunk));
        child.on('close', (code) => resolve({ project, code, output }));
      }),
  ),
);
let failed = false;
for (const { project, code, output } of results) {
  if (code === 0) console.log(`typecheck ${project}: ok`);
  else {
    failed = true;
    console.error(`typecheck ${project}: failed\n${output}`);
  }
}
process.exit(failed ? 1 : 0);
