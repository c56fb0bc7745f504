#!/usr/bin/env node
import { dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { compileBundle } from './compiled-bundle.js';

// The command line's entry: the bundle a build leaves beside this file (compiled-bundle.ts), or,
// before a build, the modules as tsc emitted them.
const edge = compileBundle(dirname(fileURLToPath(import.meta.url)))?.exports ?? (await import('./process-edge.js'));
await edge.runFromProcess();
