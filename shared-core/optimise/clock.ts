/**
 * Milliseconds from a monotonic clock where the runtime has one (Node, browsers and workers all
 * do); shared-core has no DOM or Node types, so it is looked up on globalThis, the one global
 * the core reads.
 */
// eslint-disable-next-line no-restricted-globals -- a standard clock, present in every runtime
const perf = (globalThis as { performance?: { now(): number } }).performance;

export function nowMs(): number {
  return perf ? perf.now() : Date.now();
}
