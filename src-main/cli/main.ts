#!/usr/bin/env node
import { installKernelTeam } from '../../shared-core/linalg/kernel-team.js';
import { kernelTeamOfTwo } from '../threads/kernel-team.js';
import { runCli } from './run-cli.js';

// The process edge of the command line: wires stdout, stderr and Ctrl-C into runCli, and gives the
// dense kernels a second thread for large problems.
installKernelTeam(kernelTeamOfTwo());
const controller = new AbortController();
process.once('SIGINT', () => controller.abort());
const code = await runCli(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  cwd: process.cwd(),
  env: process.env,
  signal: controller.signal,
});
process.exitCode = code;
