// The interior point's Cholesky factor (optimise/qp/dense-factor.ts, choleskyInPlace) in
// WebAssembly SIMD: left-looking, two columns j, j + 1 of L at a time, in blocks of columns. The
// two lanes of an f64x2 are the two columns' sums of one row (or the even and odd partial sums of
// a pivot), never two parts of one sum, and each term is a multiply then a subtract as in the
// TypeScript (no fused multiply-add), so the factor is the TypeScript's bit for bit.
//
// A block's pivot rows j and j + 1 are copied side by side into `pairs` (pair p of the block at
// pairs + p * 2n: L_jm, L_(j+1)m for m < j), so that one load gives both columns' terms.
#include <wasm_simd128.h>

// a[j] - sum_k a[k]^2 over k < j, the even k in lane 0 and the odd k in lane 1 (pivotSquare).
static double pivot_square(const double *row, int j) {
  v128_t d = wasm_f64x2_make(row[j], 0.0);
  int k = 0;
  for (; k + 1 < j; k += 2) {
    const v128_t v = wasm_v128_load(row + k);
    d = wasm_f64x2_sub(d, wasm_f64x2_mul(v, v));
  }
  double d0 = wasm_f64x2_extract_lane(d, 0);
  const double d1 = wasm_f64x2_extract_lane(d, 1);
  if (k < j) d0 -= row[k] * row[k];
  return d0 + d1;
}

// A pivot L_jj^2 that the factor accepts: positive and finite (NaN fails both tests).
static int acceptable(double d) { return d > 0.0 && d < __builtin_inf(); }

// L's entries in columns j and j + 1 of one row (at o[0] and o[1]) from its two finished sums.
static void finish_two_columns(double *o, v128_t s, double ljj, double l1j, double l11) {
  const double li = wasm_f64x2_extract_lane(s, 0) / ljj;
  o[0] = li;
  o[1] = (wasm_f64x2_extract_lane(s, 1) - li * l1j) / l11;
}

// Columns j and j + 1 of L on four rows from r (fourRowsOfTwoColumns).
static void four_rows(double *r, int n, const double *pair, int j, double ljj, double l1j,
                      double l11) {
  double *r1 = r + n, *r2 = r1 + n, *r3 = r2 + n;
  v128_t s = wasm_v128_load(r + j), t = wasm_v128_load(r1 + j);
  v128_t u = wasm_v128_load(r2 + j), v = wasm_v128_load(r3 + j);
  for (int m = 0; m < j; m++) {
    const v128_t x = wasm_v128_load(pair + 2 * m);
    s = wasm_f64x2_sub(s, wasm_f64x2_mul(wasm_v128_load64_splat(r + m), x));
    t = wasm_f64x2_sub(t, wasm_f64x2_mul(wasm_v128_load64_splat(r1 + m), x));
    u = wasm_f64x2_sub(u, wasm_f64x2_mul(wasm_v128_load64_splat(r2 + m), x));
    v = wasm_f64x2_sub(v, wasm_f64x2_mul(wasm_v128_load64_splat(r3 + m), x));
  }
  finish_two_columns(r + j, s, ljj, l1j, l11);
  finish_two_columns(r1 + j, t, ljj, l1j, l11);
  finish_two_columns(r2 + j, u, ljj, l1j, l11);
  finish_two_columns(r3 + j, v, ljj, l1j, l11);
}

// Columns j to j + 3 of L (two pairs: pivot rows side by side in `pair` and `next`, pivots in
// rows rj to rj + 3n) on four rows from r. The loop carries eight independent sums where
// four_rows carries four, whose subtracts wait on one another's latency. Each sum is still the
// one four_rows makes: the second pair's over m < j here, then its terms m = j, j + 1 from the
// first pair's finished entries.
static void four_rows_two_pairs(double *r, int n, const double *pair, const double *next, int j,
                                const double *rj) {
  const double ljj = rj[j], l1j = rj[n + j], l11 = rj[n + j + 1];
  const double *rk = rj + 2 * n;
  const double lkk = rk[j + 2], l3k = rk[n + j + 2], l33 = rk[n + j + 3];
  double *r1 = r + n, *r2 = r1 + n, *r3 = r2 + n;
  v128_t s = wasm_v128_load(r + j), t = wasm_v128_load(r1 + j);
  v128_t u = wasm_v128_load(r2 + j), v = wasm_v128_load(r3 + j);
  v128_t s2 = wasm_v128_load(r + j + 2), t2 = wasm_v128_load(r1 + j + 2);
  v128_t u2 = wasm_v128_load(r2 + j + 2), v2 = wasm_v128_load(r3 + j + 2);
  for (int m = 0; m < j; m++) {
    const v128_t x = wasm_v128_load(pair + 2 * m), y = wasm_v128_load(next + 2 * m);
    const v128_t p = wasm_v128_load64_splat(r + m), q = wasm_v128_load64_splat(r1 + m);
    const v128_t w = wasm_v128_load64_splat(r2 + m), z = wasm_v128_load64_splat(r3 + m);
    s = wasm_f64x2_sub(s, wasm_f64x2_mul(p, x));
    s2 = wasm_f64x2_sub(s2, wasm_f64x2_mul(p, y));
    t = wasm_f64x2_sub(t, wasm_f64x2_mul(q, x));
    t2 = wasm_f64x2_sub(t2, wasm_f64x2_mul(q, y));
    u = wasm_f64x2_sub(u, wasm_f64x2_mul(w, x));
    u2 = wasm_f64x2_sub(u2, wasm_f64x2_mul(w, y));
    v = wasm_f64x2_sub(v, wasm_f64x2_mul(z, x));
    v2 = wasm_f64x2_sub(v2, wasm_f64x2_mul(z, y));
  }
  finish_two_columns(r + j, s, ljj, l1j, l11);
  finish_two_columns(r1 + j, t, ljj, l1j, l11);
  finish_two_columns(r2 + j, u, ljj, l1j, l11);
  finish_two_columns(r3 + j, v, ljj, l1j, l11);
  for (int m = j; m < j + 2; m++) {
    const v128_t y = wasm_v128_load(next + 2 * m);
    s2 = wasm_f64x2_sub(s2, wasm_f64x2_mul(wasm_v128_load64_splat(r + m), y));
    t2 = wasm_f64x2_sub(t2, wasm_f64x2_mul(wasm_v128_load64_splat(r1 + m), y));
    u2 = wasm_f64x2_sub(u2, wasm_f64x2_mul(wasm_v128_load64_splat(r2 + m), y));
    v2 = wasm_f64x2_sub(v2, wasm_f64x2_mul(wasm_v128_load64_splat(r3 + m), y));
  }
  finish_two_columns(r + j + 2, s2, lkk, l3k, l33);
  finish_two_columns(r1 + j + 2, t2, lkk, l3k, l33);
  finish_two_columns(r2 + j + 2, u2, lkk, l3k, l33);
  finish_two_columns(r3 + j + 2, v2, lkk, l3k, l33);
}

// The same on one row (oneRowOfTwoColumns).
static void one_row(double *r, const double *pair, int j, double ljj, double l1j, double l11) {
  v128_t s = wasm_v128_load(r + j);
  for (int m = 0; m < j; m++)
    s = wasm_f64x2_sub(s, wasm_f64x2_mul(wasm_v128_load64_splat(r + m), wasm_v128_load(pair + 2 * m)));
  finish_two_columns(r + j, s, ljj, l1j, l11);
}

// Rows j and j + 1 of `a` side by side over m < j.
static void pack_pair(const double *a, int n, int j, double *pair) {
  const double *rj = a + j * n, *r1 = rj + n;
  for (int m = 0; m < j; m++) {
    pair[2 * m] = rj[m];
    pair[2 * m + 1] = r1[m];
  }
}

// Columns [j0, j1) of L on rows [j0, j1), two columns at a time (diagonalBlock), each pair's
// pivot rows left in `pairs` for the rows below. 1 when every pivot is acceptable, else 0.
__attribute__((export_name("cholesky_diagonal_block"))) int
cholesky_diagonal_block(double *a, int n, int j0, int j1, double *pairs) {
  int j = j0;
  for (; j + 1 < j1; j += 2) {
    double *rj = a + j * n, *r1 = rj + n;
    double *pair = pairs + (j - j0) * n;
    pack_pair(a, n, j, pair);
    const double d = pivot_square(rj, j);
    if (!acceptable(d)) return 0;
    const double ljj = __builtin_sqrt(d);
    rj[j] = ljj;
    double s = r1[j];
    for (int k = 0; k < j; k++) s -= r1[k] * rj[k];
    const double l1j = s / ljj;
    r1[j] = l1j;
    const double d1 = pivot_square(r1, j + 1);
    if (!acceptable(d1)) return 0;
    const double l11 = __builtin_sqrt(d1);
    r1[j + 1] = l11;
    int i = j + 2;
    for (; i + 3 < j1; i += 4) four_rows(a + i * n, n, pair, j, ljj, l1j, l11);
    for (; i < j1; i++) one_row(a + i * n, pair, j, ljj, l1j, l11);
  }
  if (j < j1) {
    // The last column of an odd order: its pivot alone (no row below it).
    double *rj = a + j * n;
    const double d = pivot_square(rj, j);
    if (!acceptable(d)) return 0;
    rj[j] = __builtin_sqrt(d);
  }
  return 1;
}

// Columns [j0, j1) of L (j1 - j0 even) on rows [r0, r1) below the block (rowsBelowBlock), with
// the pivot rows that cholesky_diagonal_block left in `pairs`.
__attribute__((export_name("cholesky_rows_below"))) void
cholesky_rows_below(double *a, int n, int j0, int j1, int r0, int r1, const double *pairs) {
  int i = r0;
  for (; i + 3 < r1; i += 4) {
    int j = j0;
    for (; j + 3 < j1; j += 4)
      four_rows_two_pairs(a + i * n, n, pairs + (j - j0) * n, pairs + (j + 2 - j0) * n, j, a + j * n);
    for (; j + 1 < j1; j += 2) {
      const double *rj = a + j * n;
      four_rows(a + i * n, n, pairs + (j - j0) * n, j, rj[j], rj[n + j], rj[n + j + 1]);
    }
  }
  for (; i < r1; i++)
    for (int j = j0; j + 1 < j1; j += 2) {
      const double *rj = a + j * n;
      one_row(a + i * n, pairs + (j - j0) * n, j, rj[j], rj[n + j], rj[n + j + 1]);
    }
}

// b_i = (b_i - sum_k L_ik b_k) / L_ii, k from `first` to i - 1 (forwardSubstitute), for rows
// [i0, i1) in order. Eight rows at a time: their sums over k below the eight are independent, so
// eight subtracts are in flight where one row's wait on each other's latency; each row then
// takes its terms from the rows of the eight before it, in increasing k, as one row alone does.
__attribute__((export_name("cholesky_forward_rows"))) void
cholesky_forward_rows(const double *l, int n, double *b, int first, int i0, int i1) {
  int i = i0;
  for (; i + 7 < i1; i += 8) {
    const double *r = l + i * n;
    double s[8];
    for (int q = 0; q < 8; q++) s[q] = b[i + q];
    for (int k = first; k < i; k++) {
      const double bk = b[k];
      s[0] -= r[k] * bk;
      s[1] -= r[n + k] * bk;
      s[2] -= r[2 * n + k] * bk;
      s[3] -= r[3 * n + k] * bk;
      s[4] -= r[4 * n + k] * bk;
      s[5] -= r[5 * n + k] * bk;
      s[6] -= r[6 * n + k] * bk;
      s[7] -= r[7 * n + k] * bk;
    }
    for (int q = 0; q < 8; q++) {
      const double *rq = r + q * n;
      double v = s[q];
      for (int k = i; k < i + q; k++) v -= rq[k] * b[k];
      b[i + q] = v / rq[i + q];
    }
  }
  for (; i < i1; i++) {
    const double *r = l + i * n;
    double v = b[i];
    for (int k = first; k < i; k++) v -= r[k] * b[k];
    b[i] = v / r[i];
  }
}

// b_i = (b_i - sum_k L_ki b_k) / L_ii, k from n - 1 down to i + 1 (backSubstituteTransposed),
// for i from i1 - 1 down to i0. Summed in decreasing k, a row's sum needs the entries just found
// only at its end, so eight rows i .. i + 7 run their sums over k >= i + 8 together: L_k,i .. L_k,i+7
// are adjacent in row k of L, one lane pair per two rows, where one sum at a time waited on each
// subtract's latency and read L down a column. Each row then takes its terms k = i + 7 down to
// its own, as one row alone does.
__attribute__((export_name("cholesky_back_rows"))) void
cholesky_back_rows(const double *l, int n, double *b, int i0, int i1) {
  int i = i1 - 8;
  for (; i >= i0; i -= 8) {
    v128_t s0 = wasm_v128_load(b + i), s1 = wasm_v128_load(b + i + 2);
    v128_t s2 = wasm_v128_load(b + i + 4), s3 = wasm_v128_load(b + i + 6);
    for (int k = n - 1; k >= i + 8; k--) {
      const double *r = l + k * n + i;
      const v128_t bk = wasm_v128_load64_splat(b + k);
      s0 = wasm_f64x2_sub(s0, wasm_f64x2_mul(wasm_v128_load(r), bk));
      s1 = wasm_f64x2_sub(s1, wasm_f64x2_mul(wasm_v128_load(r + 2), bk));
      s2 = wasm_f64x2_sub(s2, wasm_f64x2_mul(wasm_v128_load(r + 4), bk));
      s3 = wasm_f64x2_sub(s3, wasm_f64x2_mul(wasm_v128_load(r + 6), bk));
    }
    double s[8];
    wasm_v128_store(s, s0);
    wasm_v128_store(s + 2, s1);
    wasm_v128_store(s + 4, s2);
    wasm_v128_store(s + 6, s3);
    for (int q = 7; q >= 0; q--) {
      double v = s[q];
      for (int k = i + 7; k > i + q; k--) v -= l[k * n + i + q] * b[k];
      b[i + q] = v / l[(i + q) * n + i + q];
    }
  }
  for (i += 7; i >= i0; i--) {
    double v = b[i];
    for (int k = n - 1; k > i; k--) v -= l[k * n + i] * b[k];
    b[i] = v / l[i * n + i];
  }
}
