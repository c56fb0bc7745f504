import { readFileSync, readdirSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

// The folder a file lives in says what it may import (the layering rule of DEVELOPERS.md).
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(join(root, dir))) {
    const path = join(dir, name);
    if (statSync(join(root, path)).isDirectory()) out.push(...sourceFiles(path));
    else if (/\.(ts|tsx)$/.test(name) && !name.endsWith('.d.ts')) out.push(path);
  }
  return out;
}

function importsOf(file: string): string[] {
  const text = readFileSync(join(root, file), 'utf8');
  const specs: string[] = [];
  const re =
    /(?:^|\n)\s*(?:import|export)[^'"`;]*?from\s*['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)|(?:^|\n)\s*import\s*['"]([^'"]+)['"]/g;
  for (const m of text.matchAll(re)) specs.push(m[1] ?? m[2] ?? m[3]);
  return specs;
}

/** Blanks out comments and string literals (keeping line breaks) so only code is scanned. */
function stripCommentsAndStrings(text: string): string {
  return text.replace(/\/\*[\s\S]*?\*\/|\/\/[^\n]*|'(?:\\.|[^'\\\n])*'|"(?:\\.|[^"\\\n])*"|`(?:\\.|[^`\\])*`/g, (m) =>
    m.replace(/[^\n]/g, ' '),
  );
}

function resolvesInside(file: string, spec: string, folder: string): boolean {
  return relative(join(root, folder), resolve(join(root, dirname(file)), spec)).split(/[\\/]/)[0] !== '..';
}

describe('architecture', () => {
  it('shared-core imports only itself, zod and ml-matrix: no Node, DOM, Electron or React', () => {
    const offences: string[] = [];
    for (const file of sourceFiles('shared-core'))
      for (const spec of importsOf(file)) {
        const ok = spec.startsWith('.')
          ? resolvesInside(file, spec, 'shared-core')
          : ['zod', 'ml-matrix'].includes(spec);
        if (!ok) offences.push(`${file} imports '${spec}'`);
      }
    expect(offences).toEqual([]);
  });

  it('shared-core touches no runtime globals of Node or the browser', () => {
    const offences: string[] = [];
    // A free identifier (not a property such as `scenario.window`) used as an object or called.
    const globals =
      /(?<![.\w$])(process|window|document|navigator|localStorage|Buffer|require|globalThis)\s*(\?\.|\.|\[|\()/;
    for (const file of sourceFiles('shared-core')) {
      const lines = stripCommentsAndStrings(readFileSync(join(root, file), 'utf8')).split('\n');
      lines.forEach((line, i) => {
        if (globals.test(line)) offences.push(`${file}:${i + 1}: ${line.trim()}`);
      });
    }
    expect(offences).toEqual([]);
  });

  it('the globals check itself finds a free global and ignores properties, comments and strings', () => {
    const globals =
      /(?<![.\w$])(process|window|document|navigator|localStorage|Buffer|require|globalThis)\s*(\?\.|\.|\[|\()/;
    expect(globals.test(stripCommentsAndStrings('const t = process.hrtime();'))).toBe(true);
    expect(globals.test(stripCommentsAndStrings('if (window.innerWidth) {}'))).toBe(true);
    expect(globals.test(stripCommentsAndStrings('const y = s.window?.years; // window.x'))).toBe(false);
    expect(globals.test(stripCommentsAndStrings("const m = 'see window.from';"))).toBe(false);
  });

  it('the renderer reaches the main process only through the service API, never by importing it', () => {
    const offences: string[] = [];
    for (const file of sourceFiles('src-renderer'))
      for (const spec of importsOf(file)) {
        if (spec.startsWith('node:') || ['electron', 'better-sqlite3', 'fs', 'path'].includes(spec))
          offences.push(`${file} imports '${spec}'`);
        if (
          spec.startsWith('.') &&
          !resolvesInside(file, spec, 'src-renderer') &&
          !resolvesInside(file, spec, 'shared-core')
        )
          offences.push(`${file} imports '${spec}'`);
      }
    expect(offences).toEqual([]);
  });

  it('no SQL outside the store module: only src-main/store opens better-sqlite3', () => {
    const offences: string[] = [];
    for (const folder of ['src-main', 'src-renderer', 'shared-core'])
      for (const file of sourceFiles(folder)) {
        if (file.startsWith(join('src-main', 'store'))) continue;
        if (importsOf(file).includes('better-sqlite3')) offences.push(`${file} imports better-sqlite3`);
      }
    expect(offences).toEqual([]);
  });
});
