import { mkdirSync, mkdtempSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');

/**
 * Transpiles `entry` (a .ts file of the repository) and every relative module it imports into a
 * fresh directory, so a real child Node process can run it (Node 20 cannot run TypeScript).
 * Returns the path of the compiled entry. Independent of dist/, which other builds rewrite.
 */
export function compileForChild(entry: string): { script: string; dir: string } {
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-child-'));
  writeFileSync(join(dir, 'package.json'), '{"type": "module"}\n');
  symlinkSync(join(root, 'node_modules'), join(dir, 'node_modules'), 'dir');
  const todo = [resolve(root, entry)];
  const done = new Set<string>();
  while (todo.length) {
    const file = todo.pop()!;
    if (done.has(file)) continue;
    done.add(file);
    const source = readFileSync(file, 'utf8');
    for (const m of source.matchAll(/(?:from\s*|import\(\s*)['"](\.[^'"]+)['"]/g))
      todo.push(resolve(dirname(file), m[1].replace(/\.js$/, '.ts')));
    const out = ts.transpileModule(source, {
      compilerOptions: { module: ts.ModuleKind.ESNext, target: ts.ScriptTarget.ES2022 },
    }).outputText;
    const target = join(dir, relative(root, file).replace(/\.ts$/, '.js'));
    mkdirSync(dirname(target), { recursive: true });
    writeFileSync(target, out);
  }
  return { script: join(dir, relative(root, resolve(root, entry)).replace(/\.ts$/, '.js')), dir };
}
