/**
 * Dense row-major matrices over Float64Array: the one matrix type of the core. Return matrices
 * are T x N (rows are periods, columns are assets); covariances are N x N. Kernels that need
 * speed work on `data` directly; ml-matrix is used behind these types where it is fast enough.
 */
export interface Matrix {
  readonly rows: number;
  readonly cols: number;
  /** Row-major: element (i, j) is data[i * cols + j]. */
  readonly data: Float64Array;
}

export function zeros(rows: number, cols: number): Matrix {
  return { rows, cols, data: new Float64Array(rows * cols) };
}

export function identity(n: number): Matrix {
  const m = zeros(n, n);
  for (let i = 0; i < n; i++) m.data[i * n + i] = 1;
  return m;
}

export function fromRows(rows: readonly (readonly number[])[]): Matrix {
  const r = rows.length;
  const c = r === 0 ? 0 : rows[0].length;
  const m = zeros(r, c);
  for (let i = 0; i < r; i++) {
    if (rows[i].length !== c) throw new RangeError(`row ${i} has ${rows[i].length} entries, expected ${c}`);
    m.data.set(rows[i], i * c);
  }
  return m;
}

export function toRows(m: Matrix): number[][] {
  const out: number[][] = [];
  for (let i = 0; i < m.rows; i++) out.push(Array.from(m.data.subarray(i * m.cols, (i + 1) * m.cols)));
  return out;
}

export function get(m: Matrix, i: number, j: number): number {
  return m.data[i * m.cols + j];
}

export function diagonal(m: Matrix): Float64Array {
  const n = Math.min(m.rows, m.cols);
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) d[i] = m.data[i * m.cols + i];
  return d;
}

export function scale(m: Matrix, factor: number): Matrix {
  const out = zeros(m.rows, m.cols);
  for (let k = 0; k < m.data.length; k++) out.data[k] = m.data[k] * factor;
  return out;
}

/**
 * y = M x. Where most of x is zero (a portfolio holds few of a large universe's assets), only its
 * non-zero entries are visited: the same sums in the same order, O(rows x held) instead of
 * O(rows x cols). The columns of zero entries are then not read, so a non-finite entry there
 * does not reach y: callers check M's entries first (solveCandidate does).
 */
export function multiplyVector(m: Matrix, x: ArrayLike<number>): Float64Array {
  const y = new Float64Array(m.rows);
  const cols = m.cols;
  let held = 0;
  for (let j = 0; j < cols; j++) if (x[j] !== 0) held++;
  if (held * 2 < cols) {
    const at = new Int32Array(held);
    const value = new Float64Array(held);
    for (let j = 0, k = 0; j < cols; j++)
      if (x[j] !== 0) {
        at[k] = j;
        value[k++] = x[j];
      }
    for (let i = 0; i < m.rows; i++) {
      let s = 0;
      const off = i * cols;
      for (let k = 0; k < held; k++) s += m.data[off + at[k]] * value[k];
      y[i] = s;
    }
    return y;
  }
  for (let i = 0; i < m.rows; i++) {
    let s = 0;
    const off = i * cols;
    for (let j = 0; j < cols; j++) s += m.data[off + j] * x[j];
    y[i] = s;
  }
  return y;
}

/** x' M x for a square M. */
export function quadraticForm(m: Matrix, x: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < m.rows; i++) {
    let row = 0;
    const off = i * m.cols;
    for (let j = 0; j < m.cols; j++) row += m.data[off + j] * x[j];
    s += x[i] * row;
  }
  return s;
}

/** The sub-matrix on the given row and column indices (for a covariance: the chosen assets). */
export function select(m: Matrix, rowIdx: readonly number[], colIdx: readonly number[] = rowIdx): Matrix {
  const out = zeros(rowIdx.length, colIdx.length);
  for (let a = 0; a < rowIdx.length; a++) {
    const off = rowIdx[a] * m.cols;
    for (let b = 0; b < colIdx.length; b++) out.data[a * colIdx.length + b] = m.data[off + colIdx[b]];
  }
  return out;
}

/** True when every entry is finite; a plain loop (a callback per entry costs 20x on an N x N matrix). */
export function allFinite(values: ArrayLike<number>): boolean {
  for (let i = 0; i < values.length; i++) if (!Number.isFinite(values[i])) return false;
  return true;
}
