import type { ImplementationOf } from '../../shared-core/contract/define.js';
import type { ServiceApiTable } from '../../shared-core/contract/service-api.js';
import type { Store } from '../store/store.js';
import { packageVersion } from './app-info.js';
import { translateStoreError } from './failures.js';
import { bookMethods } from './book.js';
import { householdMethods } from './households.js';
import { importMethods } from './imports.js';
import { libraryMethods } from './library.js';
import { memoMethods } from './memos.js';
import type { ServiceOptions } from './options.js';
import { priceMethods } from './prices.js';
import { scenarioMethods } from './scenarios.js';
import { settingsKeeper } from './settings.js';

export type ServiceImplementation = ImplementationOf<ServiceApiTable>;

export interface Service extends ServiceImplementation {
  /** Waits for an import job's running check or write (tests, and an orderly shutdown). */
  importSettled(jobId: string): ReturnType<ReturnType<typeof importMethods>['settled']>;
  /** Stops running imports and removes their temporary files; the store stays open (its owner closes it). */
  dispose(): void;
}

/**
 * The implementation of the one service API over an open store. Both transports (the Electron
 * IPC of src-main/shell and the HTTP of src-main/web-host) call it through `dispatch`, which has
 * validated each request against its schema already.
 */
export function createService(store: Store, options: ServiceOptions = {}): Service {
  const settings = settingsKeeper(options.settingsPath);
  const version = options.version ?? packageVersion();
  const imports = importMethods(store);

  function startAt(): { householdId: string; scenarioId: string } | null {
    if (options.startAt) return options.startAt;
    if (!options.demo) return null;
    for (const household of store.listHouseholds()) {
      const first = store.listScenarios(household.id)[0];
      if (first) return { householdId: String(household.id), scenarioId: String(first.id) };
    }
    return null;
  }

  const methods: ServiceImplementation = {
    async 'app.info'() {
      return {
        version,
        storePath: store.path,
        demo: options.demo ?? false,
        dataVersion: store.dataVersion(),
        startAt: startAt(),
        readOnly: store.readOnly?.why ?? null,
      };
    },
    async 'settings.get'() {
      return settings.get();
    },
    async 'settings.set'({ preparedBy }) {
      return settings.set({ preparedBy });
    },
    ...householdMethods(store),
    ...bookMethods(store),
    ...libraryMethods(store),
    ...priceMethods(store),
    'imports.start': imports['imports.start'],
    'imports.status': imports['imports.status'],
    'imports.confirm': imports['imports.confirm'],
    'imports.cancel': imports['imports.cancel'],
    'imports.history': imports['imports.history'],
    ...scenarioMethods(store),
    ...memoMethods(store, settings),
  };

  // The store's own "not found" and "cancelled" become the service's error codes.
  const translated = Object.fromEntries(
    Object.entries(methods).map(([name, handler]) => [
      name,
      async (request: unknown) => {
        try {
          return await (handler as (r: unknown) => Promise<unknown>)(request);
        } catch (error) {
          throw translateStoreError(error);
        }
      },
    ]),
  ) as unknown as ServiceImplementation;

  return {
    ...translated,
    importSettled: (jobId) => imports.settled(jobId),
    dispose: () => imports.dispose(),
  };
}
