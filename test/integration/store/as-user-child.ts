/**
 * Child process of the read-only tests, run as another user (runuser): opens a store, reads
 * it, tries one write, and prints what happened as one JSON line. Not a test by itself.
 *   node as-user-child.js STORE
 */
import { StorageError, openStore } from '../../../src-main/store/store.js';

const [storePath] = process.argv.slice(2);
const report: Record<string, unknown> = {};
try {
  const store = openStore(storePath, { create: false });
  report.readOnly = store.readOnly ?? null;
  report.households = store.listHouseholds().length;
  try {
    store.createHousehold({ name: `Written by ${process.pid}`, baseCurrency: 'EUR' });
    report.write = 'ok';
  } catch (error) {
    report.write = error instanceof StorageError ? { problem: error.problem, message: error.message } : String(error);
  }
  store.close();
} catch (error) {
  report.open = error instanceof StorageError ? { problem: error.problem, message: error.message } : String(error);
}
process.stdout.write(JSON.stringify(report) + '\n');
