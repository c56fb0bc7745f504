import { luFactor, luSolve } from '../optimise/qp/index.js';
import { normalCdf } from './normal.js';

/**
 * The HAC test of a difference in Sharpe ratios of Ledoit and Wolf (2008, "Robust performance
 * hypothesis testing with the Sharpe ratio", J. Empirical Finance 15), section 3.1: for excess
 * returns a, b and v = (mu_a, mu_b, gamma_a, gamma_b) with gamma = E[x^2], the difference
 * Delta = f(v) = mu_a / sqrt(gamma_a - mu_a^2) - mu_b / sqrt(gamma_b - mu_b^2) has the standard
 * error sqrt(grad f' Psi grad f / T), where Psi is the long-run covariance of
 * u_t = (a_t - mu_a, b_t - mu_b, a_t^2 - gamma_a, b_t^2 - gamma_b). Unlike the i.i.d. test of
 * Jobson and Korkie, it stays valid under heavy tails and volatility clustering.
 *
 * Psi is the prewhitened quadratic-spectral kernel estimate of Andrews and Monahan (1992,
 * Econometrica 60): a VAR(1) fitted by least squares whitens u, the kernel sum runs on its
 * residuals with Andrews' (1991, Econometrica 59) AR(1) plug-in bandwidth
 * S = 1.3221 (n alpha(2))^(1/5), and (I - A)^-1 recolours the result; times T / (T - 4), the
 * small-sample factor. The arithmetic follows R's sandwich package (meatHAC, weightsAndrews,
 * bwAndrews, version 3.0-2), which the tests use as the reference.
 */
export interface SharpeHacTest {
  /** Difference of per-period Sharpe ratios (moments divided by T), a minus b. */
  difference: number;
  standardError: number;
  z: number;
  /** Two-sided p-value of "equal Sharpe ratios" from the normal distribution. */
  pValue: number;
  /** The kernel bandwidth chosen from the data. */
  bandwidth: number;
  /** The long-run covariance of u_t, 4 x 4 row-major. */
  psi: Float64Array;
}

export const SHARPE_HAC_METHOD =
  'HAC test of Ledoit and Wolf (2008), prewhitened quadratic-spectral kernel (Andrews and Monahan 1992)';

const K = 4;
/** Kernel weights below this are dropped (sandwich's `tol`). */
const WEIGHT_TOLERANCE = 1e-7;

export function sharpeHacTest(a: ArrayLike<number>, b: ArrayLike<number>, rf = 0): SharpeHacTest {
  const T = a.length;
  if (b.length !== T) throw new RangeError('the two return series must cover the same dates');
  if (T < 10) throw new RangeError('at least 10 returns are needed for the HAC test');
  let same = true;
  for (let t = 0; t < T && same; t++) same = a[t] === b[t];
  // The same strategy twice (two candidates with equal weights): no difference, nothing to test.
  if (same) return { difference: 0, standardError: 0, z: 0, pValue: 1, bandwidth: NaN, psi: new Float64Array(K * K) };
  const x = Float64Array.from(a, (v) => v - rf);
  const y = Float64Array.from(b, (v) => v - rf);
  let ma = 0;
  let mb = 0;
  let ga = 0;
  let gb = 0;
  for (let t = 0; t < T; t++) {
    ma += x[t];
    mb += y[t];
    ga += x[t] * x[t];
    gb += y[t] * y[t];
  }
  ma /= T;
  mb /= T;
  ga /= T;
  gb /= T;
  const u = new Float64Array(T * K);
  for (let t = 0; t < T; t++) {
    u[t * K] = x[t] - ma;
    u[t * K + 1] = y[t] - mb;
    u[t * K + 2] = x[t] * x[t] - ga;
    u[t * K + 3] = y[t] * y[t] - gb;
  }
  const { psi, bandwidth } = prewhitenedQsCovariance(u, T);
  const sa = Math.sqrt(ga - ma * ma);
  const sb = Math.sqrt(gb - mb * mb);
  const grad = [ga / sa ** 3, -gb / sb ** 3, -ma / (2 * sa ** 3), mb / (2 * sb ** 3)];
  let q = 0;
  for (let i = 0; i < K; i++) for (let j = 0; j < K; j++) q += grad[i] * psi[i * K + j] * grad[j];
  const difference = ma / sa - mb / sb;
  const standardError = Math.sqrt(Math.max(0, q) / T);
  const z = standardError > 0 ? difference / standardError : 0;
  return { difference, standardError, z, pValue: 2 * (1 - normalCdf(Math.abs(z))), bandwidth, psi };
}

/** Long-run covariance of the rows of u (T x K, centred), prewhitened QS kernel, times T / (T - K). */
export function prewhitenedQsCovariance(u: Float64Array, T: number): { psi: Float64Array; bandwidth: number } {
  // VAR(1) without intercept by least squares: A = (sum u_t u_{t-1}')(sum u_{t-1} u_{t-1}')^-1.
  const xx = new Float64Array(K * K);
  const yx = new Float64Array(K * K);
  for (let t = 1; t < T; t++)
    for (let i = 0; i < K; i++)
      for (let j = 0; j < K; j++) {
        xx[i * K + j] += u[(t - 1) * K + i] * u[(t - 1) * K + j];
        yx[i * K + j] += u[t * K + i] * u[(t - 1) * K + j];
      }
  // A = yx xx^-1, i.e. A' = xx^-1 yx' (xx is symmetric).
  // Row i of A solves xx a_i = (row i of yx), xx being symmetric.
  const A = rowsSolving(xx, yx);
  const n = T - 1;
  const e = new Float64Array(n * K);
  for (let t = 1; t < T; t++)
    for (let i = 0; i < K; i++) {
      let s = u[t * K + i];
      for (let j = 0; j < K; j++) s -= A[i * K + j] * u[(t - 1) * K + j];
      e[(t - 1) * K + i] = s;
    }
  const bandwidth = andrewsBandwidth(e, n);
  const weights: number[] = [];
  for (let j = 0; j < n; j++) weights.push(quadraticSpectral(j / bandwidth));
  let last = 0;
  weights.forEach((w, j) => {
    if (Math.abs(w) > WEIGHT_TOLERANCE) last = j;
  });
  // Kernel sum as sandwich's meatHAC: half the lag-0 term plus the weighted lags, then its
  // transpose. The 16 cross-products of a lag are summed at once over the four columns.
  const cols = [0, 1, 2, 3].map((c) => Float64Array.from({ length: n }, (_, t) => e[t * K + c]));
  const [c0, c1, c2, c3] = cols;
  const s = new Float64Array(K * K);
  const lagSums = new Float64Array(K * K);
  for (let lag = 0; lag <= last; lag++) {
    // Sixteen scalar accumulators: V8 keeps them in registers.
    let s00 = 0,
      s01 = 0,
      s02 = 0,
      s03 = 0,
      s10 = 0,
      s11 = 0,
      s12 = 0,
      s13 = 0;
    let s20 = 0,
      s21 = 0,
      s22 = 0,
      s23 = 0,
      s30 = 0,
      s31 = 0,
      s32 = 0,
      s33 = 0;
    for (let t = 0, u = lag; u < n; t++, u++) {
      const a0 = c0[t];
      const a1 = c1[t];
      const a2 = c2[t];
      const a3 = c3[t];
      const b0 = c0[u];
      const b1 = c1[u];
      const b2 = c2[u];
      const b3 = c3[u];
      s00 += a0 * b0;
      s01 += a0 * b1;
      s02 += a0 * b2;
      s03 += a0 * b3;
      s10 += a1 * b0;
      s11 += a1 * b1;
      s12 += a1 * b2;
      s13 += a1 * b3;
      s20 += a2 * b0;
      s21 += a2 * b1;
      s22 += a2 * b2;
      s23 += a2 * b3;
      s30 += a3 * b0;
      s31 += a3 * b1;
      s32 += a3 * b2;
      s33 += a3 * b3;
    }
    lagSums.set([s00, s01, s02, s03, s10, s11, s12, s13, s20, s21, s22, s23, s30, s31, s32, s33]);
    const w = lag === 0 ? 0.5 * weights[0] : weights[lag];
    for (let k = 0; k < K * K; k++) s[k] += w * lagSums[k];
  }
  const sym = new Float64Array(K * K);
  const adjust = T / (T - K);
  for (let i = 0; i < K; i++) for (let j = 0; j < K; j++) sym[i * K + j] = (s[i * K + j] + s[j * K + i]) * adjust;
  // Recolour: D S D' with D = (I - A)^-1, then per observation of the original series.
  const ia = new Float64Array(K * K);
  for (let i = 0; i < K; i++) for (let j = 0; j < K; j++) ia[i * K + j] = (i === j ? 1 : 0) - A[i * K + j];
  const D = rowsSolving(transpose(ia), identityK()); // rows of D solve (I - A)' d = e_i, so D = (I - A)^-1
  const psi = multiply(multiply(D, sym), transpose(D));
  for (let k = 0; k < psi.length; k++) psi[k] /= T;
  return { psi, bandwidth };
}

/**
 * Andrews' (1991) AR(1) plug-in bandwidth for the QS kernel, every column weighted 1: each column
 * gets an AR(1) with intercept fitted by least squares on its de-meaned values (R's
 * ar(method = "ols")), rho and the residual variance sigma^2 (sum of squares over the rows fitted),
 * alpha(2) = sum 4 rho^2 sigma^4 / (1 - rho)^8 / sum sigma^4 / (1 - rho)^4.
 */
function andrewsBandwidth(e: Float64Array, n: number): number {
  let num = 0;
  let den = 0;
  for (let c = 0; c < K; c++) {
    let mean = 0;
    for (let t = 0; t < n; t++) mean += e[t * K + c];
    mean /= n;
    // Regress z_t on (1, z_{t-1}), t = 1..n-1, z = column minus its mean.
    let s1 = 0;
    let sx = 0;
    let sy = 0;
    let sxx = 0;
    let sxy = 0;
    for (let t = 1; t < n; t++) {
      const zx = e[(t - 1) * K + c] - mean;
      const zy = e[t * K + c] - mean;
      s1++;
      sx += zx;
      sy += zy;
      sxx += zx * zx;
      sxy += zx * zy;
    }
    const rho = (s1 * sxy - sx * sy) / (s1 * sxx - sx * sx);
    const intercept = (sy - rho * sx) / s1;
    let ss = 0;
    for (let t = 1; t < n; t++) {
      const r = e[t * K + c] - mean - intercept - rho * (e[(t - 1) * K + c] - mean);
      ss += r * r;
    }
    const sigma2 = ss / s1;
    num += (4 * rho * rho * sigma2 * sigma2) / (1 - rho) ** 8;
    den += (sigma2 * sigma2) / (1 - rho) ** 4;
  }
  return 1.3221 * (n * (num / den)) ** (1 / 5);
}

/** The quadratic-spectral kernel, with sandwich's smooth continuation below |x| = 0.001. */
function quadraticSpectral(x: number): number {
  const qs = (v: number) => {
    const y = (6 * Math.PI * v) / 5;
    return 3 * (1 / y) ** 2 * (Math.sin(y) / y - Math.cos(y));
  };
  if (Math.abs(x) < 0.001) return Math.exp(1e6 * Math.log(qs(0.001)) * x * x);
  return qs(x);
}

function transpose(m: Float64Array): Float64Array {
  const out = new Float64Array(K * K);
  for (let i = 0; i < K; i++) for (let j = 0; j < K; j++) out[j * K + i] = m[i * K + j];
  return out;
}

function identityK(): Float64Array {
  const out = new Float64Array(K * K);
  for (let i = 0; i < K; i++) out[i * K + i] = 1;
  return out;
}

function multiply(p: Float64Array, q: Float64Array): Float64Array {
  const out = new Float64Array(K * K);
  for (let i = 0; i < K; i++)
    for (let j = 0; j < K; j++) {
      let s = 0;
      for (let k = 0; k < K; k++) s += p[i * K + k] * q[k * K + j];
      out[i * K + j] = s;
    }
  return out;
}

/** The K x K matrix whose row i solves M x = (row i of B), with the optimiser's LU (qp/dense-factor.ts). */
function rowsSolving(m: Float64Array, b: Float64Array): Float64Array {
  const f = luFactor(m, K);
  if (!f) throw new RangeError('the moment conditions are collinear: no HAC test');
  const out = new Float64Array(K * K);
  for (let i = 0; i < K; i++) out.set(luSolve(f, b.subarray(i * K, i * K + K)), i * K);
  return out;
}
