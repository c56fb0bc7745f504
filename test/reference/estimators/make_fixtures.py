"""Reference values for the covariance estimators and risk analytics of Holdfast.

Run with Debian's interpreter and libraries (python3-numpy, python3-sklearn, python3-scipy):
    test/reference/estimators/make-fixtures.sh
It reads the EuStockMarkets closes written by eustockmarkets.R and writes one JSON file per
data set under test/reference/fixtures/estimators/. The TypeScript tests read only the JSON.

What each reference is:
- sample: numpy.cov (divisor T - 1).
- ewma: the formula of the estimators issue with numpy, S = sum_t w_t r_t r_t', zero mean,
  w_t proportional to lambda^(T - t), sum w_t = 1 (RiskMetrics Technical Document, 1996).
- ledoit-wolf, scaled identity: sklearn.covariance.LedoitWolf (Ledoit and Wolf 2004, JMVA 88).
- oas: sklearn.covariance.OAS (Chen, Wiesel, Eldar and Hero 2010, IEEE TSP 58).
- ledoit-wolf, constant correlation and single index: direct numpy versions of the
  estimators in Ledoit and Wolf (2004), J. Portfolio Management 30(4), and Ledoit and Wolf
  (2003), J. Empirical Finance 10 (the matrix formulas of the papers' appendices, with the 1/T
  sample covariance of de-meaned data), written out as plainly as possible; the TypeScript
  computes the same sums in O(N^2 + NT) without the N x N x T products, so agreement checks
  that rearrangement.
- denoised: numpy.linalg.eigh of the sample correlation; eigenvalues below the
  Marchenko-Pastur edge (1 + sqrt(N/T))^2 replaced by their mean, unit diagonal restored,
  rescaled by the sample variances (Laloux, Cizeau, Bouchaud and Potters 1999, PRL 83).
- robust: Tyler's (1987, Annals of Statistics 15) M-estimator of shape, by its fixed-point
  iteration in numpy, of data centred at the coordinate-wise median and scaled by the MAD
  (Hampel 1974, JASA 69); covariance = diag(MAD) corr(shape) diag(MAD).
- nonlinear: analytical nonlinear shrinkage (Ledoit and Wolf 2020, Annals of Statistics 48),
  written out from the authors' published MATLAB function from memory (see nonlinear()).
- analytics: volatility, DR (Choueifaty and Coignard 2008), Euler risk contributions,
  effective number of bets (Meucci 2009, Risk 22) with numpy.
"""

import json
import math
import os
import sys

import numpy as np
import scipy
import sklearn
from scipy.stats import norm
from sklearn.covariance import OAS, LedoitWolf

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "fixtures", "estimators")
MAD_CONSTANT = 1.0 / norm.ppf(0.75)


def ewma(x, lam):
    t = x.shape[0]
    w = lam ** (t - 1 - np.arange(t))
    w = w / w.sum()
    return (x * w[:, None]).T @ x, 1.0 / np.sum(w**2)


def lw_constant_correlation(x):
    t, n = x.shape
    x = x - x.mean(0)
    sample = x.T @ x / t
    var = np.diag(sample).copy()
    sqrtvar = np.sqrt(var)
    rbar = (np.sum(sample / np.outer(sqrtvar, sqrtvar)) - n) / (n * (n - 1))
    prior = rbar * np.outer(sqrtvar, sqrtvar)
    np.fill_diagonal(prior, var)
    y = x**2
    phi_mat = y.T @ y / t - 2 * (x.T @ x) * sample / t + sample**2
    phi = phi_mat.sum()
    term1 = (x**3).T @ x / t
    help_ = x.T @ x / t
    term2 = np.diag(help_)[:, None] * sample
    term3 = help_ * var[:, None]
    term4 = var[:, None] * sample
    theta = term1 - term2 - term3 + term4
    np.fill_diagonal(theta, 0)
    rho = np.trace(phi_mat) + rbar * np.sum(np.outer(1 / sqrtvar, sqrtvar) * theta)
    gamma = np.linalg.norm(sample - prior, "fro") ** 2
    kappa = (phi - rho) / gamma
    shrinkage = max(0.0, min(1.0, kappa / t))
    return shrinkage * prior + (1 - shrinkage) * sample, shrinkage


def lw_single_index(x):
    t, n = x.shape
    x = x - x.mean(0)
    m = x.mean(1)
    sample = x.T @ x / t
    cov_m = x.T @ m / t
    var_m = m @ m / t
    prior = np.outer(cov_m, cov_m) / var_m
    np.fill_diagonal(prior, np.diag(sample))
    y = x**2
    phi_mat = y.T @ y / t - 2 * (x.T @ x) * sample / t + sample**2
    phi = phi_mat.sum()
    z = x * m[:, None]
    v1 = y.T @ z / t - cov_m[:, None] * sample
    roff1 = np.sum(v1 * cov_m[None, :]) / var_m - np.sum(np.diag(v1) * cov_m) / var_m
    v3 = z.T @ z / t - var_m * sample
    roff3 = np.sum(v3 * np.outer(cov_m, cov_m)) / var_m**2 - np.sum(np.diag(v3) * cov_m**2) / var_m**2
    rho = np.trace(phi_mat) + 2 * roff1 - roff3
    gamma = np.linalg.norm(sample - prior, "fro") ** 2
    kappa = (phi - rho) / gamma
    shrinkage = max(0.0, min(1.0, kappa / t))
    return shrinkage * prior + (1 - shrinkage) * sample, shrinkage


def denoised(x):
    t, n = x.shape
    s = np.cov(x, rowvar=False)
    sd = np.sqrt(np.diag(s))
    c = s / np.outer(sd, sd)
    vals, vecs = np.linalg.eigh(c)
    edge = (1 + math.sqrt(n / t)) ** 2
    low = vals < edge
    clipped = int(low.sum())
    if clipped > 0:
        vals = vals.copy()
        vals[low] = vals[low].mean()
    c2 = (vecs * vals) @ vecs.T
    d = np.sqrt(np.diag(c2))
    c2 = c2 / np.outer(d, d)
    return c2 * np.outer(sd, sd), clipped


def tyler(x, tol=1e-14, max_iter=10000):
    t, n = x.shape
    med = np.median(x, axis=0)
    mad = MAD_CONSTANT * np.median(np.abs(x - med), axis=0)
    z = (x - med) / mad
    keep = np.any(z != 0, axis=1)
    z = z[keep]
    v = np.eye(n)
    for it in range(1, max_iter + 1):
        d = np.einsum("ti,ij,tj->t", z, np.linalg.inv(v), z)
        v_new = (z / d[:, None]).T @ z * (n / z.shape[0])
        v_new = v_new * (n / np.trace(v_new))
        step = np.max(np.abs(v_new - v))
        v = v_new
        if step < tol:
            break
    sd = np.sqrt(np.diag(v))
    r = v / np.outer(sd, sd)
    return r * np.outer(mad, mad), it, mad, med


def nonlinear(x):
    """Analytical nonlinear shrinkage (Ledoit and Wolf 2020, Annals of Statistics 48), written
    out from the authors' published MATLAB function analytical_shrinkage (recalled, not copied):
    de-meaned data with effective sample size n = T - 1, Epanechnikov kernel with locally adaptive
    bandwidth h * lambda_j, h = n^(-1/3), and its Hilbert transform."""
    t, p = x.shape
    x = x - x.mean(0)
    n = t - 1
    sample = x.T @ x / n
    lam, u = np.linalg.eigh(sample)
    lam = lam[max(0, p - n):]
    m = min(p, n)
    L = np.tile(lam[:, None], (1, m))
    h = n ** (-1 / 3)
    H = h * L.T
    z = (L - L.T) / H
    f = (3 / 4 / math.sqrt(5)) * np.mean(np.maximum(1 - z**2 / 5, 0) / H, axis=1)
    with np.errstate(divide="ignore", invalid="ignore"):
        hf = (-3 / 10 / math.pi) * z + (3 / 4 / math.sqrt(5) / math.pi) * (1 - z**2 / 5) * np.log(
            np.abs((math.sqrt(5) - z) / (math.sqrt(5) + z))
        )
    edge = np.abs(z) == math.sqrt(5)
    hf[edge] = (-3 / 10 / math.pi) * z[edge]
    Hf = np.mean(hf / H, axis=1)
    if p <= n:
        d = lam / ((math.pi * (p / n) * lam * f) ** 2 + (1 - (p / n) - math.pi * (p / n) * lam * Hf) ** 2)
    else:
        Hf0 = (1 / math.pi) * (
            3 / 10 / h**2 + 3 / 4 / math.sqrt(5) / h * (1 - 1 / 5 / h**2) * math.log((1 + math.sqrt(5) * h) / (1 - math.sqrt(5) * h))
        ) * np.mean(1 / lam)
        d0 = 1 / (math.pi * (p - n) / n * Hf0)
        d1 = lam / (math.pi**2 * lam**2 * (f**2 + Hf**2))
        d = np.concatenate([np.full(p - n, d0), d1])
    return (u * d) @ u.T


def erc_weights(cov):
    """Equal risk contribution by Newton on y'Sigma y / 2 - sum ln y / n (Spinu 2013)."""
    n = cov.shape[0]
    y = np.ones(n) / np.sqrt(np.diag(cov))
    for _ in range(100):
        g = cov @ y - 1.0 / (n * y)
        h = cov + np.diag(1.0 / (n * y**2))
        y = y - np.linalg.solve(h, g)
    return y / y.sum()


def analytics(cov, w, ref):
    vol = np.sqrt(np.diag(cov))
    var = w @ cov @ w
    sw = cov @ w
    vals, vecs = np.linalg.eigh(cov)
    p = (vecs.T @ w) ** 2 * vals
    p = p / p.sum()
    p = p[p > 0]
    d = w - ref
    return {
        "weights": w.tolist(),
        "reference": ref.tolist(),
        "volatility": math.sqrt(var),
        "assetVolatilities": vol.tolist(),
        "diversificationRatio": float(w @ vol / math.sqrt(var)),
        "marginalRisk": (sw / math.sqrt(var)).tolist(),
        "riskContributions": (w * sw / var).tolist(),
        "effectiveBets": float(np.exp(-np.sum(p * np.log(p)))),
        "effectiveHoldings": float(np.sum(np.abs(w)) ** 2 / np.sum(w**2)),
        "trackingError": float(math.sqrt(d @ cov @ d)),
        "correlation": (cov / np.outer(vol, vol)).tolist(),
    }


def case(name, description, x, extra=None):
    t, n = x.shape
    lw = LedoitWolf().fit(x)
    oas = OAS().fit(x)
    cc, cc_delta = lw_constant_correlation(x)
    si, si_delta = lw_single_index(x)
    dn, dn_clipped = denoised(x)
    sample = np.cov(x, rowvar=False)
    e94, e94_eff = ewma(x, 0.94)
    half_life = 30
    e_hl, e_hl_eff = ewma(x, 0.5 ** (1 / half_life))
    out = {
        "name": name,
        "description": description,
        "generator": {
            "python": sys.version.split()[0],
            "numpy": np.__version__,
            "scipy": scipy.__version__,
            "sklearn": sklearn.__version__,
        },
        "T": t,
        "N": n,
        "returns": x.tolist(),
        "sample": {"covariance": sample.tolist(), "eigenvalues": np.linalg.eigvalsh(sample).tolist()},
        "ewma": {
            "lambda0.94": {"covariance": e94.tolist(), "effectiveObservations": e94_eff},
            "halfLife30": {"covariance": e_hl.tolist(), "effectiveObservations": e_hl_eff},
        },
        "ledoitWolf": {
            "scaledIdentity": {"covariance": lw.covariance_.tolist(), "shrinkage": float(lw.shrinkage_)},
            "constantCorrelation": {"covariance": cc.tolist(), "shrinkage": cc_delta},
            "singleIndex": {"covariance": si.tolist(), "shrinkage": si_delta},
        },
        "oas": {"covariance": oas.covariance_.tolist(), "shrinkage": float(oas.shrinkage_)},
        "denoised": {"covariance": dn.tolist(), "eigenvaluesClipped": dn_clipped},
        "nonlinear": {"covariance": nonlinear(x).tolist()},
        "conditionNumbers": {
            "ledoitWolfScaledIdentity": float(np.linalg.cond(lw.covariance_)),
            "oas": float(np.linalg.cond(oas.covariance_)),
        },
    }
    if t > n:
        rb, iterations, mad, med = tyler(x)
        out["robust"] = {"covariance": rb.tolist(), "iterations": iterations, "mad": mad.tolist()}
        out["conditionNumbers"]["sample"] = float(np.linalg.cond(sample))
    if extra:
        out.update(extra)
    path = os.path.join(OUT, f"{name}.json")
    with open(path, "w") as f:
        json.dump(out, f)
        f.write("\n")
    print(f"wrote {path}: T={t} N={n}")


def factor_returns(rng, t, n, factors, df):
    """Returns of a seeded factor model with Student-t noise (invented data)."""
    loadings = rng.normal(0.0, 1.0, (n, factors)) * np.array([1.0] + [0.5] * (factors - 1))
    f = rng.standard_t(df, (t, factors)) * 0.01
    e = rng.standard_t(df, (t, n)) * 0.01 * rng.uniform(0.5, 1.5, n)
    return 0.0003 + f @ loadings.T + e


def main():
    with open(os.path.join(OUT, "eustockmarkets.json")) as f:
        eu = json.load(f)
    closes = np.array(eu["closes"])
    x = np.diff(np.log(closes), axis=0)
    rng = np.random.default_rng(20240611)
    w = rng.uniform(0.1, 1.0, 4)
    w = w / w.sum()
    case(
        "eustock",
        "daily log returns of datasets::EuStockMarkets (R 4.2.2), T=1859, N=4",
        x,
        {"analytics": analytics(np.cov(x, rowvar=False) * 252, w, np.ones(4) / 4)},
    )

    rng = np.random.default_rng(20240612)
    case("wide", "seeded factor model with t(5) noise, N=60 > T=40 (invented)", factor_returns(rng, 40, 60, 3, 5))

    rng = np.random.default_rng(20240613)
    mid = factor_returns(rng, 200, 30, 4, 6)
    cov_mid = np.cov(mid, rowvar=False) * 252
    w_mid = rng.uniform(0.0, 1.0, 30)
    w_mid[rng.choice(30, 8, replace=False)] = 0.0
    w_mid = w_mid / w_mid.sum()
    case(
        "mid",
        "seeded factor model with t(6) noise, N=30, T=200 (invented)",
        mid,
        {"analytics": analytics(cov_mid, w_mid, np.ones(30) / 30)},
    )

    rng = np.random.default_rng(20240614)
    corr = np.full((6, 6), 0.4) + 0.6 * np.eye(6)
    chol = np.linalg.cholesky(corr)
    g = rng.normal(size=(250, 6)) @ chol.T
    chi = rng.chisquare(3, size=250)
    heavy = 0.01 * g / np.sqrt(chi / 3)[:, None]
    heavy[[17, 90, 201]] += np.array([0.2, -0.25, 0.15, 0.3, -0.2, 0.1])
    case("heavy", "seeded multivariate t(3), N=6, T=250, three gross outliers (invented)", heavy)

    # Equal risk contribution example of Maillard, Roncalli and Teiletche (2010), JPM 36(4):
    # vols 10/20/30/40%, correlation 0.8 between the first two, -0.5 between the last two.
    vol = np.array([0.1, 0.2, 0.3, 0.4])
    corr = np.eye(4)
    corr[0, 1] = corr[1, 0] = 0.8
    corr[2, 3] = corr[3, 2] = -0.5
    cov = corr * np.outer(vol, vol)
    erc = erc_weights(cov)
    with open(os.path.join(OUT, "erc-example.json"), "w") as f:
        json.dump({"covariance": cov.tolist(), "weights": erc.tolist(), "numpy": np.__version__}, f)
        f.write("\n")
    print("wrote erc-example.json:", np.round(erc * 100, 2))


if __name__ == "__main__":
    main()
