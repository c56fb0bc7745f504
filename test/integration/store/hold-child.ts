/**
 * Child process of the two-writer tests: opens a store, begins a write transaction named
 * ACTIVITY, says HOLDING on stdout and keeps the write lock for MS milliseconds, or, given
 * RELEASE, until that file exists (MS then bounds the wait), then commits. A test that needs the
 * lock held while another writer gives up waits for that writer and then releases: a fixed hold
 * would end early on a loaded machine, where the other writer starts late.
 * Not a test by itself.   node hold-child.js STORE MS ACTIVITY [RELEASE]
 */
import { existsSync } from 'node:fs';
import { openStore } from '../../../src-main/store/store.js';

const [storePath, ms, activity, release] = process.argv.slice(2);
const store = openStore(storePath);
const pause = new Int32Array(new SharedArrayBuffer(4));
store.transaction(() => {
  store.createHousehold({ name: `Held by ${process.pid}`, baseCurrency: 'EUR' });
  process.stdout.write('HOLDING\n');
  const until = Date.now() + Number(ms);
  if (!release) Atomics.wait(pause, 0, 0, Number(ms));
  else while (!existsSync(release) && Date.now() < until) Atomics.wait(pause, 0, 0, 20);
}, activity);
store.close();
process.stdout.write('DONE\n');
