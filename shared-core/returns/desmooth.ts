/**
 * Desmoothing of appraisal-smoothed returns (Getmansky, Lo and Makarov 2004, "An econometric
 * model of serial correlation and illiquidity in hedge fund returns", J. Financial Economics 74):
 * the observed return is a moving average of true returns, R^o_t = theta_0 R_t + ... +
 * theta_k R_{t-k} with sum theta = 1. Fit the MA(k) X_t = mu + e_t + b_1 e_{t-1} + ... by
 * exact Gaussian maximum likelihood, set theta_0 = 1 / (1 + sum b), theta_j = b_j theta_0, and
 * invert the filter: R_t = (R^o_t - sum_j theta_j R_{t-j}) / theta_0.
 */
export interface Desmoothed {
  /** The desmoothed (true) return estimates, same length as the input. */
  returns: Float64Array;
  /** theta_0 .. theta_k, summing to 1. */
  theta: number[];
  /** MA coefficients b_1 .. b_k and the mean of the fitted model. */
  ma: number[];
  mean: number;
  /** Smoothing index xi = sum theta_j^2 (1 when there is no smoothing; GLM 2004). */
  smoothingIndex: number;
  logLikelihood: number;
}

/** Default MA order: two lags, the case GLM (2004) estimate for their fund returns. */
export const DESMOOTH_LAGS = 2;

export function desmooth(observed: ArrayLike<number>, lags = DESMOOTH_LAGS): Desmoothed {
  if (lags !== 1 && lags !== 2) throw new RangeError(`desmoothing supports 1 or 2 lags, not ${lags}`);
  const x = Float64Array.from(observed);
  const t = x.length;
  let mean = 0;
  for (const v of x) mean += v;
  mean /= t;
  let spread = 0;
  for (const v of x) spread += (v - mean) ** 2;
  spread = Math.sqrt(spread / t) || 1;
  // Minimise -2 log L over (mean, b_1..b_k); the mean is searched in units of the spread.
  const objective = (p: Float64Array) => {
    const ma = p.subarray(1);
    if (!invertible(ma)) return Infinity;
    return -2 * maLogLikelihood(x, mean + p[0] * spread, ma);
  };
  const start = new Float64Array(lags + 1);
  const best = nelderMead(objective, start, 0.1, 1e-13, 20_000);
  const ma = Array.from(best.subarray(1));
  const mu = mean + best[0] * spread;
  const theta0 = 1 / (1 + ma.reduce((a, b) => a + b, 0));
  const theta = [theta0, ...ma.map((b) => b * theta0)];
  const returns = new Float64Array(t);
  for (let s = 0; s < t; s++) {
    let v = x[s];
    // Before the first observation the true returns are taken at the mean (sum theta = 1 keeps it).
    for (let j = 1; j <= lags; j++) v -= theta[j] * (s - j >= 0 ? returns[s - j] : mu);
    returns[s] = v / theta0;
  }
  return {
    returns,
    theta,
    ma,
    mean: mu,
    smoothingIndex: theta.reduce((a, b) => a + b * b, 0),
    logLikelihood: maLogLikelihood(x, mu, best.subarray(1)),
  };
}

/**
 * Exact Gaussian log-likelihood of an MA(q) with the innovation variance concentrated out, by
 * the innovations algorithm (Brockwell and Davis, Time Series: Theory and Methods, 2nd ed.
 * 1991, section 5.2): -T/2 (log(2 pi s^2) + 1) - 1/2 sum log r_n, s^2 = (1/T) sum (x - xhat)^2 / r.
 */
export function maLogLikelihood(x: ArrayLike<number>, mean: number, ma: ArrayLike<number>): number {
  const t = x.length;
  const q = ma.length;
  const b = [1, ...Array.from(ma)];
  const gamma = new Float64Array(q + 1); // autocovariances for unit innovation variance
  for (let h = 0; h <= q; h++) for (let j = 0; j + h <= q; j++) gamma[h] += b[j] * b[j + h];
  const v = new Float64Array(t);
  const theta = new Float64Array(t * (q + 1)); // theta[n][m], m = 1..q
  const innovation = new Float64Array(t);
  v[0] = gamma[0];
  let squares = 0;
  let logs = Math.log(v[0]);
  innovation[0] = x[0] - mean;
  squares += (innovation[0] * innovation[0]) / v[0];
  for (let n = 1; n < t; n++) {
    for (let k = Math.max(0, n - q); k < n; k++) {
      let s = gamma[n - k];
      for (let j = Math.max(0, n - q); j < k; j++)
        s -= theta[k * (q + 1) + (k - j)] * theta[n * (q + 1) + (n - j)] * v[j];
      theta[n * (q + 1) + (n - k)] = s / v[k];
    }
    let vn = gamma[0];
    for (let j = Math.max(0, n - q); j < n; j++) vn -= theta[n * (q + 1) + (n - j)] ** 2 * v[j];
    v[n] = vn;
    let prediction = 0;
    for (let m = 1; m <= Math.min(n, q); m++) prediction += theta[n * (q + 1) + m] * innovation[n - m];
    innovation[n] = x[n] - mean - prediction;
    squares += (innovation[n] * innovation[n]) / vn;
    logs += Math.log(vn);
  }
  const sigma2 = squares / t;
  return -0.5 * (t * (Math.log(2 * Math.PI * sigma2) + 1) + logs);
}

/** The roots of 1 + b_1 z (+ b_2 z^2) lie outside the unit circle (the invertibility region of an MA(1) or MA(2)). */
function invertible(b: ArrayLike<number>): boolean {
  if (b.length === 1) return Math.abs(b[0]) < 1;
  const [b1, b2] = [b[0], b[1]];
  // The MA(2) triangle: the AR(2) stationarity triangle with the signs of the coefficients flipped.
  return b2 < 1 && b2 - b1 < 1 && b2 + b1 > -1;
}

/** Nelder-Mead simplex minimisation (Nelder and Mead 1965, Computer Journal 7), standard coefficients. */
function nelderMead(
  f: (p: Float64Array) => number,
  start: Float64Array,
  step: number,
  tolerance: number,
  maxEvaluations: number,
): Float64Array {
  const d = start.length;
  let points = [Float64Array.from(start)];
  for (let i = 0; i < d; i++) {
    const p = Float64Array.from(start);
    p[i] += step;
    points.push(p);
  }
  let values = points.map(f);
  let evaluations = d + 1;
  for (let restart = 0; restart < 3; restart++) {
    while (evaluations < maxEvaluations) {
      const order = values.map((_, i) => i).sort((a, b) => values[a] - values[b]);
      points = order.map((i) => points[i]);
      values = order.map((i) => values[i]);
      if (Math.abs(values[d] - values[0]) <= tolerance * (Math.abs(values[0]) + tolerance)) break;
      const centroid = new Float64Array(d);
      for (let i = 0; i < d; i++) for (let j = 0; j < d; j++) centroid[j] += points[i][j] / d;
      const along = (c: number) => centroid.map((v, j) => v + c * (points[d][j] - v));
      const reflected = along(-1);
      const fr = f(reflected);
      evaluations++;
      if (fr < values[0]) {
        const expanded = along(-2);
        const fe = f(expanded);
        evaluations++;
        if (fe < fr) [points[d], values[d]] = [expanded, fe];
        else [points[d], values[d]] = [reflected, fr];
      } else if (fr < values[d - 1]) [points[d], values[d]] = [reflected, fr];
      else {
        const contracted = fr < values[d] ? along(-0.5) : along(0.5);
        const fc = f(contracted);
        evaluations++;
        if (fc < Math.min(fr, values[d])) [points[d], values[d]] = [contracted, fc];
        else {
          for (let i = 1; i <= d; i++) {
            points[i] = points[i].map((v, j) => points[0][j] + 0.5 * (v - points[0][j]));
            values[i] = f(points[i]);
          }
          evaluations += d;
        }
      }
    }
    // Restart around the best point: a collapsed simplex can stop short of the minimum.
    const best = points[values.indexOf(Math.min(...values))];
    points = [Float64Array.from(best)];
    for (let i = 0; i < d; i++) {
      const p = Float64Array.from(best);
      p[i] += step / 10 ** (restart + 1);
      points.push(p);
    }
    values = points.map(f);
    evaluations += d + 1;
  }
  return points[values.indexOf(Math.min(...values))];
}
