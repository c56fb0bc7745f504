// One pass of the tridiagonal reduction (linalg/tridiagonal-form.ts, fusedColumns) in WebAssembly
// SIMD: over columns [from, to) of the leading m x m block of the lower triangle, A -= u q' + q u'
// and p += A v with the updated entries. The same sums in the same order as the TypeScript, a
// multiply then an add (no fused multiply-add): the two lanes of an f64x2 hold two neighbouring
// entries k, k + 1 of a column, so the update of A and the sums into p[k], p[k + 1] are lane by
// lane, and the TypeScript's two partial sums of a column's A v (g over even offsets, h over odd)
// are the two lanes of one accumulator.
#include <wasm_simd128.h>

__attribute__((export_name("tridiagonal_columns"))) void
tridiagonal_columns(double *w, int n, int m, int from, int to, const double *u, const double *q,
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
      wasm_v128_store(p + k, wasm_f64x2_add(wasm_v128_load(p + k),
                                            wasm_f64x2_add(wasm_f64x2_mul(X, V0), wasm_f64x2_mul(Y, V1))));
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
