import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DEFAULT_DEMO_SEED as demoSeed } from '../../../shared-core/demo/index.js';
import { DEFAULT_DRAWS as draws } from '../../../shared-core/stability/weight-bands.js';
import { HOUSEHOLD_FILE_FORMAT as householdFormat } from '../../../src-main/io/household-file.js';
import {
  DEFAULT_DEMO_SEED,
  DEFAULT_DRAWS,
  HOUSEHOLD_FILE_FORMAT,
  commands,
} from '../../../src-main/cli/commands/index.js';
import { commandHelp } from '../../../src-main/cli/args.js';

// The command table answers --help and bad options without loading any command's module; the
// values it writes out must stay those of the modules they come from.
describe('command table', () => {
  it('writes out the same values as their sources', () => {
    expect(DEFAULT_DEMO_SEED).toBe(demoSeed);
    expect(DEFAULT_DRAWS).toBe(draws);
    expect(HOUSEHOLD_FILE_FORMAT).toBe(householdFormat);
  });

  it('--help keeps every option apart from its description, a long list of choices on its own line', () => {
    for (const command of commands) {
      const help = commandHelp(command);
      for (const o of command.options) {
        const at = help.indexOf(o.description, help.indexOf(`  --${o.name}`));
        expect(help.slice(at - 2, at), `${command.name} --${o.name}`).toBe('  ');
      }
    }
  });

  it('imports nothing at run time but the method definitions, and loads each implementation on demand', () => {
    const source = readFileSync(new URL('../../../src-main/cli/commands/index.ts', import.meta.url), 'utf8');
    const staticImports = source.match(/^import [^;]*;$/gm) ?? [];
    expect(staticImports.length).toBeGreaterThan(0);
    for (const line of staticImports)
      expect(line).toMatch(/^import type |^import [^;]* from '\.\.\/\.\.\/\.\.\/shared-core\/methods\//);
  });

  it('lists the methods from definitions that themselves import nothing but each other at run time (no zod)', () => {
    const root = new URL('../../../shared-core/methods/', import.meta.url);
    const files = readdirSync(root, { recursive: true, encoding: 'utf8' }).filter((f) => f.endsWith('.ts'));
    expect(files.length).toBeGreaterThan(10);
    for (const file of files) {
      const source = readFileSync(new URL(file, root), 'utf8');
      for (const line of source.match(/^(import|export) [^;]* from '[^']*';$/gm) ?? [])
        if (!/^(import|export) type /.test(line)) expect(line, file).toMatch(/ from '\.\.?\//);
    }
  });

  it('has unique names and a loadable implementation for every command', async () => {
    expect(new Set(commands.map((c) => c.name)).size).toBe(commands.length);
    for (const command of commands) {
      const run = await command.load();
      expect(typeof run, command.name).toBe('function');
    }
  });
});
