// The cross product's 4 x 4 block kernel (linalg/cross-product.ts) in WebAssembly SIMD. Each
// entry of C is summed over the periods in the same order, with a multiply then an add as in the
// TypeScript kernel (no fused multiply-add), so the answer is the same bit for bit; the two lanes
// of an f64x2 are two neighbouring entries of a row of C, never two parts of one sum.
#include <wasm_simd128.h>

#define PANEL 4

// One 4 x 4 block of C over periods [k0, k1), added into the lower triangle of `out` (n x n).
// `a` and `b` are the packed panels of the block's rows and columns (PANEL values a period).
static void block(const double *a, const double *b, int k0, int k1, double *out, int n, int i0,
                  int j0, int i_last) {
  v128_t c0a = wasm_f64x2_splat(0.0), c0b = c0a, c1a = c0a, c1b = c0a;
  v128_t c2a = c0a, c2b = c0a, c3a = c0a, c3b = c0a;
  for (int k = k0; k < k1; k++) {
    const double *ak = a + k * PANEL;
    const double *bk = b + k * PANEL;
    v128_t b01 = wasm_v128_load(bk), b23 = wasm_v128_load(bk + 2);
    v128_t a0 = wasm_f64x2_splat(ak[0]), a1 = wasm_f64x2_splat(ak[1]);
    v128_t a2 = wasm_f64x2_splat(ak[2]), a3 = wasm_f64x2_splat(ak[3]);
    c0a = wasm_f64x2_add(c0a, wasm_f64x2_mul(a0, b01));
    c0b = wasm_f64x2_add(c0b, wasm_f64x2_mul(a0, b23));
    c1a = wasm_f64x2_add(c1a, wasm_f64x2_mul(a1, b01));
    c1b = wasm_f64x2_add(c1b, wasm_f64x2_mul(a1, b23));
    c2a = wasm_f64x2_add(c2a, wasm_f64x2_mul(a2, b01));
    c2b = wasm_f64x2_add(c2b, wasm_f64x2_mul(a2, b23));
    c3a = wasm_f64x2_add(c3a, wasm_f64x2_mul(a3, b01));
    c3b = wasm_f64x2_add(c3b, wasm_f64x2_mul(a3, b23));
  }
  const v128_t rows[8] = {c0a, c0b, c1a, c1b, c2a, c2b, c3a, c3b};
  for (int r = 0; r < PANEL; r++) {
    const int i = i0 + r;
    if (i > i_last) return;
    double *o = out + i * n + j0;
    // Only entries on or below the diagonal, and inside the matrix.
    const double v0 = wasm_f64x2_extract_lane(rows[2 * r], 0);
    const double v1 = wasm_f64x2_extract_lane(rows[2 * r], 1);
    const double v2 = wasm_f64x2_extract_lane(rows[2 * r + 1], 0);
    const double v3 = wasm_f64x2_extract_lane(rows[2 * r + 1], 1);
    if (j0 <= i) o[0] += v0;
    if (j0 + 1 <= i) o[1] += v1;
    if (j0 + 2 <= i) o[2] += v2;
    if (j0 + 3 <= i) o[3] += v3;
  }
}

// Row panel `row_panel`'s blocks of the lower triangle over periods [k0, k1): the packed X holds
// ceil(n / PANEL) panels of t periods each.
__attribute__((export_name("cross_product_row_panel"))) void
cross_product_row_panel(const double *packed, double *out, int t, int n, int row_panel, int k0,
                        int k1) {
  const int i0 = row_panel * PANEL;
  const int i_last = (i0 + PANEL < n ? i0 + PANEL : n) - 1;
  const int col_panels = i_last / PANEL + 1;
  const double *a = packed + row_panel * t * PANEL;
  for (int J = 0; J < col_panels; J++)
    block(a, packed + J * t * PANEL, k0, k1, out, n, i0, J * PANEL, i_last);
}
