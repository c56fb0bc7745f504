import { resolve } from 'node:path';
import { EXIT, UsageError, type CliIO, type OptionValues } from '../command.js';

/** `holdfast serve`: the application in a browser, on this machine's loopback address only. */
export async function runServe(options: OptionValues, io: CliIO): Promise<number> {
  const port = options.port as number | undefined;
  if (port !== undefined && (!Number.isInteger(port) || port < 0 || port > 65535))
    throw new UsageError(`option '--port' needs a whole number from 0 to 65535, got '${port}'`);
  const storeName = options.store as string;
  // Loaded here so that every other command starts without the service and the memo writer.
  const { serveStore } = await import('../../web-host/serve-store.js');
  const served = await serveStore({
    storePath: resolve(io.cwd, storeName),
    storeName,
    port,
    demo: options.demo === true,
  });
  const kind = options.demo ? ' (invented demonstration data)' : '';
  io.stdout(
    `${served.createdDemo ? `Created the demonstration store ${storeName}.\n` : ''}` +
      `Holdfast is serving ${storeName}${kind} on this machine only.\n` +
      (served.store.readOnly
        ? `The store is read-only (${served.store.readOnly.why}): the app shows it but cannot save changes. ` +
          'To save, make the file and its folder writable and start holdfast serve again.\n'
        : '') +
      `Open ${served.host.url}\n` +
      'Press Ctrl-C to stop.\n',
  );
  await new Promise<void>((done) => {
    if (io.signal.aborted) done();
    else io.signal.addEventListener('abort', () => done(), { once: true });
  });
  await served.close();
  io.stdout('Stopped; the store is closed.\n');
  return EXIT.ok;
}
