/**
 * Child process of crash-safety.test.ts: imports a price file into a store (with --apply
 * semantics) and, when told to, announces a point of the import on stdout and then blocks there
 * so the parent can SIGKILL it at exactly that point. Not a test by itself.
 *   node kill-child.js STORE CSV POINT   where POINT is reading | write:K | none
 */
import { importPriceFile } from '../../../src-main/io/import-prices.js';
import { openStore, type Store } from '../../../src-main/store/store.js';

const [storePath, csvPath, point] = process.argv.slice(2);
const hold = () => Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 30_000);
let store: Store | undefined;
let announced = false;

const outcome = await importPriceFile(() => (store ??= openStore(storePath)), csvPath, {
  universe: 'Core',
  apply: true,
  onProgress: (p) => {
    if (announced) return;
    const at = p.phase === 'reading' ? 'reading' : `write:${Math.round(((p.percent - 90) / 10) * 1e6)}`;
    if (
      point === 'reading' ? at === 'reading' : point.startsWith('write:') && p.phase === 'writing' && reached(at, point)
    ) {
      announced = true;
      process.stdout.write(`AT ${point}\n`);
      hold();
    }
  },
});
store?.close();
process.stdout.write(`DONE ${outcome.status}\n`);

// `write:K` is reached when at least K millionths of the assets are written.
function reached(at: string, wanted: string): boolean {
  return Number(at.slice(6)) >= Number(wanted.slice(6));
}
