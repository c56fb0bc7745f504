/**
 * `npm run bench`: speed and memory figures, each printed beside its target and, where one
 * exists, a peer measured in the same run (alternating, so machine noise hits both alike).
 * Medians and ratios only; nothing here is a pass/fail test.
 */
export interface BenchFigure {
  /** What was measured, e.g. "ledoit-wolf N=1500 T=1260". */
  label: string;
  /** Median wall time in milliseconds. */
  medianMs: number;
  /** The target the issue sets, in milliseconds, if any. */
  targetMs?: number;
  /** The peer's median on the same work, measured in this run. */
  peerMs?: number;
  peerLabel?: string;
  /** Extra figures (GFLOP/s, peak MB, ...). */
  notes?: string;
}

export interface BenchSuite {
  name: string;
  run(): Promise<BenchFigure[]>;
}

export function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Runs `fn` `repeats` times (after one warm-up) and returns the median in ms. */
export async function timeMedian(fn: () => unknown | Promise<unknown>, repeats = 5): Promise<number> {
  await fn();
  const times: number[] = [];
  for (let i = 0; i < repeats; i++) {
    const t0 = performance.now();
    await fn();
    times.push(performance.now() - t0);
  }
  return median(times);
}

export function formatFigure(f: BenchFigure): string {
  const parts = [`${f.label}: median ${f.medianMs.toFixed(1)} ms`];
  if (f.targetMs !== undefined)
    parts.push(`target <= ${f.targetMs} ms (${f.medianMs <= f.targetMs ? 'met' : 'MISSED'})`);
  if (f.peerMs !== undefined)
    parts.push(`${f.peerLabel ?? 'peer'} ${f.peerMs.toFixed(1)} ms, ratio ${(f.medianMs / f.peerMs).toFixed(2)}`);
  if (f.notes) parts.push(f.notes);
  return parts.join('; ');
}
