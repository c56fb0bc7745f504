/**
 * Child process of the two-writer tests: opens a store, begins a write transaction named
 * ACTIVITY, says HOLDING on stdout and keeps the write lock for MS milliseconds, then commits.
 * Not a test by itself.   node hold-child.js STORE MS ACTIVITY
 */
import { openStore } from '../../../src-main/store/store.js';

const [storePath, ms, activity] = process.argv.slice(2);
const store = openStore(storePath);
store.transaction(() => {
  store.createHousehold({ name: `Held by ${process.pid}`, baseCurrency: 'EUR' });
  process.stdout.write('HOLDING\n');
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, Number(ms));
}, activity);
store.close();
process.stdout.write('DONE\n');
