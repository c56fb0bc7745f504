// The tridiagonal reduction (tridiagonalForm in linalg/tridiagonal-form.ts) in WebAssembly: the
// same operations in the same order, a multiply then an add (no fused multiply-add), so the answer
// is the TypeScript's bit for bit. Each step's pass over the trailing block (fusedColumns there)
// is in SIMD: over columns [from, to) of the leading m x m block of the lower triangle,
// A -= u q' + q u' and p += A v with the updated entries. The two lanes of an f64x2 hold two
// neighbouring entries k, k + 1 of a column, so the update of A and the sums into p[k], p[k + 1]
// are lane by lane, and the TypeScript's two partial sums of a column's A v (g over even offsets,
// h over odd) are the two lanes of one accumulator. (Four columns a sweep instead of two, to share
// the loads of u, q, v and p, ran 10 % slower: too few registers.)
#include <wasm_simd128.h>

// The module has no C library (-nostdlib): loops that clear or copy stay loops instead of becoming
// calls of memset and memcpy.
#define LOOPS_STAY_LOOPS __attribute__((no_builtin))

static void columns(double *w, int n, int m, int from, int to, const double *u, const double *q,
                    const double *v, double *p) {
  int j = from;
  for (; j + 1 < to; j += 2) {
    double *c0 = w + j * n;
    double *c1 = c0 + n;
    const double u0 = u[j], q0 = q[j], v0 = v[j];
    const double u1 = u[j + 1], q1 = q[j + 1], v1 = v[j + 1];
    // The corner A[j][j], A[j+1][j], A[j+1][j+1].
    const double a00 = c0[j] - 2 * u0 * q0;
    const double a10 = c0[j + 1] - (u0 * q1 + q0 * u1);
    const double a11 = c1[j + 1] - 2 * u1 * q1;
    c0[j] = a00;
    c0[j + 1] = a10;
    c1[j + 1] = a11;
    // Lane 0: g (even offsets from j + 2), lane 1: h (odd offsets).
    v128_t gh0 = wasm_f64x2_make(a00 * v0 + a10 * v1, 0.0);
    v128_t gh1 = wasm_f64x2_make(a10 * v0 + a11 * v1, 0.0);
    const v128_t U0 = wasm_f64x2_splat(u0), Q0 = wasm_f64x2_splat(q0), V0 = wasm_f64x2_splat(v0);
    const v128_t U1 = wasm_f64x2_splat(u1), Q1 = wasm_f64x2_splat(q1), V1 = wasm_f64x2_splat(v1);
    int k = j + 2;
    for (; k + 1 < m; k += 2) {
      const v128_t Q = wasm_v128_load(q + k), U = wasm_v128_load(u + k), V = wasm_v128_load(v + k);
      const v128_t X = wasm_f64x2_sub(wasm_v128_load(c0 + k),
                                      wasm_f64x2_add(wasm_f64x2_mul(U0, Q), wasm_f64x2_mul(Q0, U)));
      const v128_t Y = wasm_f64x2_sub(wasm_v128_load(c1 + k),
                                      wasm_f64x2_add(wasm_f64x2_mul(U1, Q), wasm_f64x2_mul(Q1, U)));
      wasm_v128_store(c0 + k, X);
      wasm_v128_store(c1 + k, Y);
      gh0 = wasm_f64x2_add(gh0, wasm_f64x2_mul(X, V));
      gh1 = wasm_f64x2_add(gh1, wasm_f64x2_mul(Y, V));
      const v128_t term = wasm_f64x2_add(wasm_f64x2_mul(X, V0), wasm_f64x2_mul(Y, V1));
      wasm_v128_store(p + k, wasm_f64x2_add(wasm_v128_load(p + k), term));
    }
    double g0 = wasm_f64x2_extract_lane(gh0, 0), h0 = wasm_f64x2_extract_lane(gh0, 1);
    double g1 = wasm_f64x2_extract_lane(gh1, 0), h1 = wasm_f64x2_extract_lane(gh1, 1);
    if (k < m) {
      const double x0 = c0[k] - (u0 * q[k] + q0 * u[k]);
      const double y0 = c1[k] - (u1 * q[k] + q1 * u[k]);
      c0[k] = x0;
      c1[k] = y0;
      g0 += x0 * v[k];
      g1 += y0 * v[k];
      p[k] += x0 * v0 + y0 * v1;
    }
    p[j] += g0 + h0;
    p[j + 1] += g1 + h1;
  }
  if (j < to) {
    double *c = w + j * n;
    const double uj = u[j], qj = q[j], vj = v[j];
    const double a = c[j] - 2 * uj * qj;
    c[j] = a;
    double g = a * vj;
    for (int k = j + 1; k < m; k++) {
      const double x = c[k] - (uj * q[k] + qj * u[k]);
      c[k] = x;
      g += x * v[k];
      p[k] += x * vj;
    }
    p[j] += g;
  }
}

// The Householder vector of row r[0..m-1] in place; e[m] the new off-diagonal; h = u'u / 2 or 0
// (householderVector in tridiagonal-form.ts, the same operations).
static double householder_vector(double *r, int m, double *e) {
  double scale = 0;
  for (int k = 0; k < m; k++) scale += __builtin_fabs(r[k]);
  if (scale == 0) {
    e[m] = 0;
    return 0;
  }
  double h = 0;
  for (int k = 0; k < m; k++) {
    r[k] /= scale;
    h += r[k] * r[k];
  }
  const double f = r[m - 1];
  double g = __builtin_sqrt(h);
  if (f > 0) g = -g;
  e[m] = scale * g;
  h -= f * g;
  r[m - 1] = f - g;
  return h;
}

// out = A u on the leading m x m block (blockTimes in tridiagonal-form.ts).
LOOPS_STAY_LOOPS static void block_times(const double *w, int n, int m, const double *u,
                                          double *out) {
  for (int k = 0; k < m; k++) out[k] = 0;
  for (int j = 0; j < m; j++) {
    const double *c = w + j * n;
    const double uj = u[j];
    double g = c[j] * uj;
    for (int k = j + 1; k < m; k++) {
      g += c[k] * u[k];
      out[k] += c[k] * uj;
    }
    out[j] += g;
  }
}

// passSplit in tridiagonal-form.ts: floor(m (1 - Math.SQRT1_2)), Math.SQRT1_2 being this double.
static int pass_split(int m) { return (int)(m * (1 - 0.70710678118654752440)); }

// The first reflector, from row n - 1: state = [h, ready] for the steps.
__attribute__((export_name("tridiagonal_begin"))) LOOPS_STAY_LOOPS void
tridiagonal_begin(double *w, int n, double *v, double *e, double *state) {
  for (int j = 0; j < n - 1; j++) v[j] = w[j * n + n - 1];
  state[0] = householder_vector(v, n - 1, e);
  state[1] = 0;
}

// Step i of the reduction up to its pass (the loop of tridiagonalForm in tridiagonal-form.ts, the
// same operations in the same order), carrying [h, ready] in `state` from one step to the next.
// Returns the pass's split (its columns [0, split) sum into p, zeroed here, and [split, i - 1)
// into p2), or -1 where the step has no pass.
LOOPS_STAY_LOOPS static int step_to_pass(double *w, int n, int i, double *u, double *q, double *v,
                                         double *p, double *e, double *half_norms, double *state) {
  double h = state[0];
  if (h == 0) {
    // Row i is already zero left of the diagonal: nothing to reflect; the next row as it stands.
    // Step i's reflector slots hold zeros, as in the TypeScript's fresh array.
    for (int j = 0; j < i; j++) w[i * n + j] = 0;
    state[1] = 0;
    if (i > 1) {
      for (int j = 0; j < i - 1; j++) v[j] = w[j * n + i - 1];
      state[0] = householder_vector(v, i - 1, e);
    }
    return -1;
  }
  for (int j = 0; j < i; j++) u[j] = v[j];
  half_norms[i] = h;
  for (int j = 0; j < i; j++) w[i * n + j] = u[j];
  if (state[1] == 0) block_times(w, n, i, u, p);
  double f = 0;
  for (int j = 0; j < i; j++) {
    p[j] /= h;
    f += p[j] * u[j];
  }
  const double hh = f / (h + h);
  for (int j = 0; j < i; j++) q[j] = p[j] - hh * u[j];
  const int last = i - 1;
  const double ul = u[last], ql = q[last];
  for (int j = 0; j <= last; j++) w[j * n + last] -= u[j] * ql + q[j] * ul;
  if (last == 0) return -1;
  for (int j = 0; j < last; j++) v[j] = w[j * n + last];
  h = householder_vector(v, last, e);
  state[0] = h;
  if (h == 0) {
    for (int j = 0; j < last; j++) {
      double *c = w + j * n;
      const double uj = u[j], qj = q[j];
      for (int k = j; k < last; k++) c[k] -= uj * q[k] + qj * u[k];
    }
    state[1] = 0;
    return -1;
  }
  for (int k = 0; k < last; k++) p[k] = 0;
  return pass_split(last);
}

// The second column range [split, m) of a pass into p2, zeroed first (passShare in
// tridiagonal-form.ts): the kernel team's helper makes it while the caller makes the first.
__attribute__((export_name("tridiagonal_pass_share"))) LOOPS_STAY_LOOPS void
tridiagonal_pass_share(double *w, int n, int m, int split, const double *u, const double *q,
                       const double *v, double *p2) {
  for (int k = 0; k < m; k++) p2[k] = 0;
  columns(w, n, m, split, m, u, q, v, p2);
}

// The end of a step's pass: the second range's sums into p.
static void pass_end(double *p, const double *p2, int split, int m, double *state) {
  for (int k = split; k < m; k++) p[k] += p2[k];
  state[1] = 1;
}

// Steps i = from, from - 1, ..., down to but not including `to`, each with its whole pass.
__attribute__((export_name("tridiagonal_steps"))) void
tridiagonal_steps(double *w, int n, double *u, double *q, double *v, double *p, double *p2,
                  double *e, double *half_norms, double *state, int from, int to) {
  for (int i = from; i > to; i--) {
    const int split = step_to_pass(w, n, i, u, q, v, p, e, half_norms, state);
    if (split < 0) continue;
    columns(w, n, i - 1, 0, split, u, q, v, p);
    tridiagonal_pass_share(w, n, i - 1, split, u, q, v, p2);
    pass_end(p, p2, split, i - 1, state);
  }
}

// Step i with its pass made in two shares (two threads): returns the split, or -1 where the step
// has no pass. The caller then makes tridiagonal_pass_mine, the helper tridiagonal_pass_share,
// and the caller ends the step with tridiagonal_pass_end.
__attribute__((export_name("tridiagonal_step_to_pass"))) int
tridiagonal_step_to_pass(double *w, int n, int i, double *u, double *q, double *v, double *p,
                         double *e, double *half_norms, double *state) {
  return step_to_pass(w, n, i, u, q, v, p, e, half_norms, state);
}

// A pass's first column range [0, split) into p.
__attribute__((export_name("tridiagonal_pass_mine"))) void
tridiagonal_pass_mine(double *w, int n, int m, int split, const double *u, const double *q,
                      const double *v, double *p) {
  columns(w, n, m, 0, split, u, q, v, p);
}

__attribute__((export_name("tridiagonal_pass_end"))) void
tridiagonal_pass_end(double *p, const double *p2, int split, int m, double *state) {
  pass_end(p, p2, split, m, state);
}

// sqrt(a^2 + b^2) where neither square can overflow or underflow (hypot in symmetric-eigen.ts);
// elsewhere, and for a NaN, *outside is set: the TypeScript, which has Math.hypot, takes over.
static inline double plain_hypot(double a, double b, int *outside) {
  const double fa = __builtin_fabs(a), fb = __builtin_fabs(b);
  if (fa < 1e150 && fb < 1e150 && (fa > 1e-150 || fb > 1e-150)) return __builtin_sqrt(a * a + b * b);
  *outside = 1;
  return 1;
}

// Eigenvalues l0 <= l < l1 of the implicit QL iteration (diagonalise in symmetric-eigen.ts, the
// same operations in the same order) on d and e (e already shifted down by one), rotating
// `tracked` too where `track` is 1; state = [f, tst1] carried from one call to the next. Returns 0,
// 1 where an entry is out of the plain hypot's range or NaN (the caller redoes the whole in
// TypeScript from its own copies), 2 where an eigenvalue took more than 60 iterations.
__attribute__((export_name("tridiagonal_ql"))) int
tridiagonal_ql(double *d, double *e, double *tracked, int track, int n, int l0, int l1,
               double *state) {
  const double eps = 0x1p-52;
  double f = state[0], tst1 = state[1];
  int outside = 0;
  for (int l = l0; l < l1; l++) {
    const double size = __builtin_fabs(d[l]) + __builtin_fabs(e[l]);
    if (size != size) return 1;
    if (size > tst1) tst1 = size;
    int m = l;
    while (m < n) {
      if (__builtin_fabs(e[m]) <= eps * tst1) break;
      m++;
    }
    if (m == n) return 1;
    if (m > l) {
      int iterations = 0;
      do {
        if (++iterations > 60) return 2;
        double g = d[l];
        double p = (d[l + 1] - g) / (2 * e[l]);
        double r = plain_hypot(p, 1, &outside);
        if (p < 0) r = -r;
        d[l] = e[l] / (p + r);
        d[l + 1] = e[l] * (p + r);
        const double dl1 = d[l + 1];
        double h = g - d[l];
        for (int i = l + 2; i < n; i++) d[i] -= h;
        f += h;
        p = d[m];
        double c = 1, c2 = c, c3 = c;
        const double el1 = e[l + 1];
        double s = 0, s2 = 0;
        for (int i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i];
          h = c * p;
          r = plain_hypot(p, e[i], &outside);
          e[i + 1] = s * r;
          s = e[i] / r;
          c = p / r;
          p = c * d[i] - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]);
          if (track) {
            const double hk = tracked[i + 1];
            tracked[i + 1] = s * tracked[i] + c * hk;
            tracked[i] = c * tracked[i] - s * hk;
          }
        }
        if (outside) return 1;
        p = (-s * s2 * c3 * el1 * e[l]) / dl1;
        e[l] = s * p;
        d[l] = c * p;
      } while (__builtin_fabs(e[l]) > eps * tst1);
    }
    d[l] += f;
    e[l] = 0;
  }
  state[0] = f;
  state[1] = tst1;
  return 0;
}
