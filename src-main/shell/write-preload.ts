import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { serviceApi } from '../../shared-core/contract/service-api.js';
import { ipcRoutes } from './ipc-table.js';
import { preloadSource } from './preload-source.js';

/** Writes the generated preload (CommonJS, as a sandboxed preload must be) next to electron-main.js. */
export function writePreload(path: string): void {
  mkdirSync(dirname(path), { recursive: true });
  writeFileSync(path, preloadSource(ipcRoutes(serviceApi)));
}
