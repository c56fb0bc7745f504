import { crossProductPanels, packColumns, rowPanels } from '../../shared-core/linalg/cross-product.js';
import type { Matrix } from '../../shared-core/linalg/matrix.js';
import { recordRotations } from '../../shared-core/linalg/symmetric-eigen.js';
import { tridiagonalForm } from '../../shared-core/linalg/tridiagonal-form.js';

/**
 * Runs the helper thread's kernels once on a small made-up problem while the thread is idle
 * anyway (the main thread is still reading its input), so that V8 has compiled them before the
 * first real job (the thread reports ready after it): each isolate compiles its own code. In one profiled N = 500 solve the helper's
 * X'X panels took 46 instead of 62 ms and the reduction 72 instead of 96 ms; the warm-up itself
 * took 28 ms of a core that was idle. The data are seeded non-integer values like real returns,
 * so the type feedback is the real one (integer-valued data would teach V8 the wrong types).
 * Nothing is kept.
 */
export function warmUpKernels(): void {
  const t = 64;
  const n = 96;
  let s = 3;
  const x: Matrix = { rows: t, cols: n, data: new Float64Array(t * n) };
  for (let k = 0; k < x.data.length; k++) {
    s = (s * 16807) % 2147483647;
    x.data[k] = (s / 2147483647 - 0.5) * 0.02;
  }
  const out = new Float64Array(n * n);
  let next = rowPanels(n);
  crossProductPanels(t, n, packColumns(x), out, () => --next);
  for (let i = 0; i < n; i++) for (let j = 0; j < i; j++) out[j * n + i] = out[i * n + j];
  const form = tridiagonalForm({ rows: n, cols: n, data: out });
  recordRotations(form, new Float64Array(n), new Int32Array(8 * n), new Float64Array(3 * n * n));
}
