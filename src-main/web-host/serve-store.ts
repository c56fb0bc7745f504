import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { serviceApi } from '../../shared-core/contract/service-api.js';
import { InputError } from '../../shared-core/errors.js';
import { createDemoStore } from '../demo/create-demo-store.js';
import { createService, type Service } from '../service/index.js';
import { StoreOpenError, openStore, type Store } from '../store/store.js';
import { rendererRoot } from './renderer-root.js';
import { startWebHost, type WebHost } from './web-host.js';

export interface ServeStoreOptions {
  storePath: string;
  /** Name of the store as the user gave it (for messages). */
  storeName?: string;
  port?: number;
  /** Create the store from the invented demonstration data when the file does not exist. */
  demo?: boolean;
  staticRoot?: string;
  token?: string;
}

export interface ServedStore {
  host: WebHost;
  store: Store;
  service: Service;
  /** True when this launch created the demo store. */
  createdDemo: boolean;
  /** Stops the host, ends running imports and closes the store cleanly. */
  close(): Promise<void>;
}

/**
 * The application without Electron: the store, the service over it and the local web host
 * serving both the page and the API. Used by `holdfast serve`, `npm start` on a machine without
 * an Electron runtime, and the end-to-end tests.
 */
export async function serveStore(options: ServeStoreOptions): Promise<ServedStore> {
  const path = resolve(options.storePath);
  const name = options.storeName ?? options.storePath;
  let createdDemo = false;
  if (!existsSync(path)) {
    if (!options.demo)
      throw new InputError(
        'no such store (create one with holdfast import, or pass --demo for the demonstration store)',
        {
          file: name,
        },
      );
    await createDemoStore(path);
    createdDemo = true;
  }
  let store: Store;
  try {
    store = openStore(path, { create: false });
  } catch (error) {
    if (error instanceof StoreOpenError) throw new InputError(error.message, { file: name });
    throw error;
  }
  const service = createService(store, { demo: options.demo ?? false, settingsPath: `${path}.settings.json` });
  let host: WebHost;
  try {
    host = await startWebHost({
      table: serviceApi,
      implementation: service,
      staticRoot: options.staticRoot ?? rendererRoot(),
      port: options.port ?? 0,
      token: options.token,
    });
  } catch (error) {
    service.dispose();
    store.close();
    if ((error as NodeJS.ErrnoException).code === 'EADDRINUSE')
      throw new InputError(`port ${options.port} is already in use on 127.0.0.1; choose another or leave --port out`, {
        path: '--port',
      });
    throw error;
  }
  return {
    host,
    store,
    service,
    createdDemo,
    async close() {
      await host.close();
      service.dispose();
      store.close();
    },
  };
}
