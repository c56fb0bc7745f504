import type { Command } from '../command.js';

/**
 * Every `holdfast` command, in the order `--help` lists them. A new command is one module in
 * this folder plus one line here.
 */
export const commands: readonly Command[] = [];
