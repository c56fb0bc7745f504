"""High-precision reference for the kernel terms of the analytical nonlinear shrinkage.

Ledoit and Wolf (2020), "Analytical nonlinear shrinkage of large-dimensional covariance
matrices", Annals of Statistics 48: at each non-null sample eigenvalue lambda_i, the Epanechnikov
kernel estimate f of the eigenvalue density and its Hilbert transform Hf, with the locally
adaptive bandwidth h * lambda_j, x = (lambda_i - lambda_j) / (h lambda_j):
    f(lambda_i)  = (1/m) sum_j 3 / (4 sqrt 5) max(1 - x^2/5, 0) / (h lambda_j)
    Hf(lambda_i) = (1/m) sum_j [-3 x / (10 pi) + 3 / (4 sqrt 5 pi) (1 - x^2/5) log|(sqrt5 - x)/(sqrt5 + x)|] / (h lambda_j)
the Hilbert transform at zero of the point mass when N > n,
    Hf0 = (1/pi) [3 / (10 h^2) + 3 / (4 sqrt 5 h) (1 - 1/(5 h^2)) log((1 + sqrt5 h)/(1 - sqrt5 h))] mean(1/lambda),
the shrunk eigenvalues d (c = N/n):
    N <= n: d_i = lambda_i / ((pi c lambda_i f_i)^2 + (1 - c - pi c lambda_i Hf_i)^2)
    N > n:  d_i = lambda_i / (pi^2 lambda_i^2 (f_i^2 + Hf_i^2)), and the N - n null ones 1 / (pi (N - n)/n Hf0),
and the kernel's Hilbert transform itself (the bracket of Hf) at points from 1e-6 to 1e6.

The sample eigenvalues come from numpy (seeded data), written to the JSON as doubles; mpmath then
evaluates every sum at 60 significant digits from exactly those doubles and the double h, so the
TypeScript test measures only the rounding of its own evaluation. Run with Debian's interpreter
(python3-numpy, python3-mpmath):
    /usr/bin/python3 test/reference/estimators/nonlinear_hilbert.py
It writes test/reference/fixtures/estimators/nonlinear-hilbert.json; CI reads only the JSON.
"""

import json
import os

import mpmath
import numpy as np
from mpmath import mp, mpf

mp.dps = 60


def sample_eigenvalues(rng, t, p, population):
    """Non-null eigenvalues (ascending) of the sample covariance of de-meaned data, divisor n = T - 1.
    population "spread": the paper's simulations, 20 % of eigenvalues 1, 40 % 3, 40 % 10;
    "twins": half the assets nearly repeat the other half;
    "factor": one common factor (betas 0.5-1.5, factor volatility 4 %) and 1 % idiosyncratic
    volatility, as monthly asset returns are, so the largest eigenvalue is some 10^4 times the
    smallest and the kernel's arguments x reach 10^5."""
    if population == "twins":
        # Pairs of nearly the same asset (a fund and its share class, say): eigenvalues down to 1e-7 of the largest.
        half = p // 2
        base = 0.04 * rng.standard_normal((t, 1)) * rng.uniform(0.5, 1.5, half) + 0.01 * rng.standard_normal((t, half))
        twin = base + 1e-4 * rng.standard_normal((t, half))
        x = np.hstack([base, twin, 0.02 * rng.standard_normal((t, p - 2 * half))])
    elif population == "spread":
        scale = np.sqrt(np.where(np.arange(p) < p // 5, 1.0, np.where(np.arange(p) < 3 * p // 5, 3.0, 10.0)))
        x = rng.standard_normal((t, p)) * scale
    else:
        beta = rng.uniform(0.5, 1.5, p)
        x = 0.04 * rng.standard_normal((t, 1)) * beta + 0.01 * rng.standard_normal((t, p))
    x = x - x.mean(0)
    n = t - 1
    lam = np.linalg.eigvalsh(x.T @ x / n)
    return lam[max(0, p - n):], n


def kernel_terms(lam, h):
    m = len(lam)
    s5 = mp.sqrt(5)
    f, hf = [], []
    for li in lam:
        dens = mpf(0)
        hil = mpf(0)
        for lj in lam:
            width = mpf(h) * mpf(lj)
            x = (mpf(li) - mpf(lj)) / width
            dens += max(1 - x * x / 5, mpf(0)) / width
            if abs(x) == s5:
                term = -3 * x / (10 * mp.pi)
            else:
                term = -3 * x / (10 * mp.pi) + 3 / (4 * s5 * mp.pi) * (1 - x * x / 5) * mp.log(abs((s5 - x) / (s5 + x)))
            hil += term / width
        f.append(3 / (4 * s5) * dens / m)
        hf.append(hil / m)
    return f, hf


DESCRIPTIONS = {
    "factor": "one factor",
    "twins": "pairs of nearly equal assets",
    "spread": "population eigenvalues 1/3/10 (20/40/40 %)",
}


def case(name, seed, t, p, population):
    rng = np.random.default_rng(seed)
    lam, n = sample_eigenvalues(rng, t, p, population)
    lam = [float(v) for v in lam]
    h = float(n) ** (-1.0 / 3.0)
    f, hf = kernel_terms(lam, h)
    s5 = mp.sqrt(5)
    hm = mpf(h)
    mean_inverse = sum(1 / mpf(v) for v in lam) / len(lam)
    hf0 = (1 / mp.pi) * (3 / (10 * hm**2) + 3 / (4 * s5 * hm) * (1 - 1 / (5 * hm**2)) * mp.log((1 + s5 * hm) / (1 - s5 * hm))) * mean_inverse
    if p <= n:
        c = mpf(p) / n
        d = [mpf(l) / ((mp.pi * c * l * fi) ** 2 + (1 - c - mp.pi * c * l * hi) ** 2) for l, fi, hi in zip(lam, f, hf)]
    else:
        d0 = 1 / (mp.pi * mpf(p - n) / n * hf0)
        d = [d0] * (p - n) + [mpf(l) / (mp.pi**2 * mpf(l) ** 2 * (fi**2 + hi**2)) for l, fi, hi in zip(lam, f, hf)]
    return {
        "name": name,
        "description": f"{p} assets, {t} periods (n = {n}), seeded numpy data, "
        + DESCRIPTIONS[population],
        "T": t,
        "N": p,
        "n": n,
        "h": h,
        "eigenvalues": lam,
        "density": [float(v) for v in f],
        "hilbert": [float(v) for v in hf],
        "hilbertNull": float(hf0),
        "shrunk": [float(v) for v in d],
    }


def kernel_points():
    """K(x), the Hilbert transform of the kernel, at doubles from 1e-6 to 1e6 and their negatives,
    both sides of |x| = sqrt 5 and of 4 sqrt 5 (where the TypeScript switches to a series)."""
    s5 = mp.sqrt(5)
    xs = [1e-6, 0.01, 0.5, 1.0, 2.0, 2.2360679, 2.2360680, 2.3, 3.0, 5.0, 8.9442719, 8.9442720, 9.0, 20.0, 1e3, 1e5, 1e6]
    points = []
    for x in xs + [-v for v in xs]:
        xm = mpf(x)
        k = -3 * xm / (10 * mp.pi) + 3 / (4 * s5 * mp.pi) * (1 - xm * xm / 5) * mp.log(abs((s5 - xm) / (s5 + xm)))
        points.append([x, float(k)])
    return points


def main():
    out = {
        "kernel": kernel_points(),
        "source": "mpmath " + mpmath.__version__ + " at " + str(mp.dps) + " digits; eigenvalues from numpy " + np.__version__,
        "cases": [
            case("wide-factor", 150120, 120, 150, "factor"),
            case("wide", 150121, 120, 150, "spread"),
            case("tall", 100200, 200, 100, "spread"),
            case("twins", 25030, 30, 25, "twins"),
        ],
    }
    path = os.path.join(os.path.dirname(__file__), "..", "fixtures", "estimators", "nonlinear-hilbert.json")
    with open(path, "w") as fh:
        json.dump(out, fh)
        fh.write("\n")


if __name__ == "__main__":
    main()
