/**
 * A second thread for the dense kernels whose work splits into shares that write disjoint entries
 * and make the same sums whichever thread makes them: the cross product's row panels, a
 * tridiagonal reduction's pass over its two column ranges, a Cholesky factor's rows below a block
 * of columns. The process edge installs a team where threads exist (the command line, on a
 * machine with two cores or more); elsewhere there is none and each kernel makes its shares one
 * after the other. The answer is the same bit for bit either way, which the tests check.
 *
 * A kernel asks for the team only when its work is large enough to gain from it (each names its
 * threshold and why): the helper thread starts at the first such request, so a small problem
 * never pays for a thread. The helper runs one job at a time: `fork` hands it the job and returns at once, the caller makes
 * its own share, then `join` waits for the helper's. A job names its kernel (the helper's table
 * of share functions, built where the helper starts) and carries integers only; its arrays are
 * bound by `shared` buffers, sent to the helper when they change, so a kernel forking once per
 * step of a long loop (a reduction's n - 1 passes) sends nothing but a few integers a step.
 */
export interface KernelJob {
  /** The share function's name in the helper's table. */
  kernel: string;
  /** The arrays the share reads and writes: each from `shared` of the same team. */
  buffers: readonly Float64Array[];
  /** The share's integer arguments (sizes, ranges). */
  ints: readonly number[];
}

export interface KernelTeam {
  /** A zero-filled array the helper can see (backed by shared memory). */
  shared(length: number): Float64Array;
  /**
   * The WebAssembly memory the helper's kernels run on too (wasm/wasm-kernels.ts), where this
   * thread's WebAssembly kernels then put their arrays; null where the team has none.
   */
  readonly memory: object | null;
  /**
   * Starts `job` on the helper (starting the helper first if need be). False when the helper
   * cannot take it (it did not start, or stopped): the caller then makes that share itself.
   */
  fork(job: KernelJob): boolean;
  /**
   * Starts the helper now, without waiting for it to load, for a caller that knows a large kernel
   * is coming: it loads while this thread works, where the first fork would wait for it.
   */
  prepare(): void;
  /** Waits for the forked job; throws if the helper's share failed. */
  join(): void;
}

let installed: KernelTeam | null = null;

/** Installed once by the process edge; null uninstalls (tests). */
export function installKernelTeam(team: KernelTeam | null): void {
  installed = team;
}

/** Starts the installed team's helper ahead of its first job (KernelTeam.prepare); nothing without a team. */
export function prepareKernelTeam(): void {
  installed?.prepare();
}

/** The installed team, or null where kernels run on one thread. */
export function kernelTeam(): KernelTeam | null {
  return installed;
}

/**
 * Runs `mine` here and `theirs` on the team's helper when there is a team and it takes the job,
 * else both here, `mine` first. The buffers of `job` must come from `sharedArray(team, ...)`.
 */
export function inTwoShares(team: KernelTeam | null, job: KernelJob, mine: () => void, theirs: () => void): void {
  const forked = team !== null && team.fork(job);
  try {
    mine();
  } finally {
    // Joined even when this share throws: the helper must not write into a buffer reused later.
    if (forked) team.join();
  }
  if (!forked) theirs();
}

/** A zero-filled array on the team's shared memory, or a plain one without a team. */
export function sharedArray(team: KernelTeam | null, length: number): Float64Array {
  return team ? team.shared(length) : new Float64Array(length);
}
