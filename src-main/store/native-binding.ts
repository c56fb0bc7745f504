/**
 * Which compiled better-sqlite3 addon this process loads. Plain Node (tests, command line, web
 * host) uses the one in node_modules; the Electron shell sets the second binary, built for
 * Electron's ABI, before it opens the store (better-sqlite3's `nativeBinding` option). One ABI
 * per process, so this is process-wide and set once at start.
 */
let nativeBinding: string | undefined;

export function setNativeBinding(path: string | undefined): void {
  nativeBinding = path;
}

/** The options of a `new Database(...)` call with the process's addon added where one is set. */
export function withNativeBinding<T extends object>(options: T): T & { nativeBinding?: string } {
  return nativeBinding === undefined ? options : { ...options, nativeBinding };
}
