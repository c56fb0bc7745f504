import type { Command } from '../command.js';
import { demoCommand } from './demo.js';
import { estimateCommand } from './estimate.js';
import { backupCommand } from './backup.js';
import { importCommand } from './import.js';
import { exportHouseholdCommand, importHouseholdCommand } from './household-transfer.js';
import { memoCommand } from './memo.js';
import { restoreCommand } from './restore.js';
import { serveCommand } from './serve.js';
import { backtestCommand } from './backtest.js';
import { solveCommand } from './solve.js';

/**
 * Every `holdfast` command, in the order `--help` lists them. A new command is one module in
 * this folder plus one line here.
 */
export const commands: readonly Command[] = [
  demoCommand,
  importCommand,
  backupCommand,
  restoreCommand,
  exportHouseholdCommand,
  importHouseholdCommand,
  serveCommand,
  estimateCommand,
  memoCommand,
  backtestCommand,
  solveCommand,
];
