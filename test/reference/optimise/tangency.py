#!/usr/bin/python3
"""Reference tangency portfolios (maximum Sharpe ratio over a risk-free rate) for Holdfast.

Maximise (w'mu - rf) / sqrt(w'Sigma w) subject to sum w = 1 (and, long-only, 0 <= w_i <= cap):
* long-short, budget only: the closed form w = Sigma^-1 (mu - rf 1) / 1'Sigma^-1 (mu - rf 1)
  (Tobin 1958, Review of Economic Studies 25; any portfolio-theory text), solved by numpy;
* long-only with caps: Debian's python3-cvxopt (cvxopt.solvers.qp) on the homogenised programme
  minimise y'Sigma y s.t. (mu - rf)'y = 1, y >= 0, y_i <= cap sum(y); w = y / sum(y)
  (Cornuejols and Tutuncu 2007, "Optimization Methods in Finance", section 8.2), checked in this
  script against an independent route: the efficient frontier solved by cvxopt at each target
  return, and the Sharpe ratio along it maximised by scipy's bounded scalar search.
Invented, seeded data (a two-factor covariance of 8 assets). Writes
test/reference/fixtures/optimise/tangency.json; CI reads only the JSON.
Run: /usr/bin/python3 test/reference/optimise/tangency.py
"""
import json
import os

import cvxopt
import numpy as np
import scipy
from cvxopt import matrix, solvers
from scipy.optimize import minimize_scalar

solvers.options.update({"show_progress": False, "abstol": 1e-13, "reltol": 1e-13, "feastol": 1e-13, "maxiters": 200})
HERE = os.path.dirname(os.path.abspath(__file__))


def col(v):
    return matrix(np.asarray(v, dtype=float).reshape(-1, 1))


def universe():
    rng = np.random.default_rng(20260105)
    n = 8
    loadings = rng.normal(0.0, 0.12, (n, 2)) + np.array([0.1, 0.0])
    specific = rng.uniform(0.05, 0.2, n)
    S = loadings @ loadings.T + np.diag(specific**2)
    mu = np.round(rng.uniform(0.01, 0.09, n), 4)
    return S, mu


def closed_form(S, mu, rf):
    raw = np.linalg.solve(S, mu - rf)
    return raw / raw.sum()


def homogenised(S, mu, rf, cap):
    n = len(mu)
    # y >= 0 and y_i - cap sum(y) <= 0, as G y <= 0.
    G = np.vstack([-np.eye(n), np.eye(n) - cap * np.ones((n, n))])
    sol = solvers.qp(matrix(2 * S), col(np.zeros(n)), matrix(G), col(np.zeros(2 * n)),
                     matrix((mu - rf).reshape(1, n)), matrix(1.0))
    assert sol["status"] == "optimal" or (sol["primal infeasibility"] < 1e-10 and sol["dual infeasibility"] < 1e-10), sol["status"]
    y = np.array(sol["x"]).ravel()
    return y / y.sum()


def frontier(S, mu, target, cap):
    """Least variance at expected return `target`, long-only with caps."""
    n = len(mu)
    G = np.vstack([-np.eye(n), np.eye(n)])
    h = np.concatenate([np.zeros(n), np.full(n, cap)])
    A = np.vstack([np.ones(n), mu])
    sol = solvers.qp(matrix(2 * S), col(np.zeros(n)), matrix(G), col(h), matrix(A), col([1.0, target]))
    return np.array(sol["x"]).ravel()


def sharpe(S, mu, rf, w):
    return float((w @ mu - rf) / np.sqrt(w @ S @ w))


def by_frontier(S, mu, rf, cap):
    # The reachable returns with caps: from the cheapest to the richest capped portfolio.
    order = np.argsort(mu)
    def extreme(idx):
        w = np.zeros(len(mu)); left = 1.0
        for i in idx:
            w[i] = min(cap, left); left -= w[i]
        return w @ mu
    lo, hi = extreme(order), extreme(order[::-1])
    res = minimize_scalar(lambda t: -sharpe(S, mu, rf, frontier(S, mu, t, cap)), bounds=(lo + 1e-9, hi - 1e-9),
                          method="bounded", options={"xatol": 1e-12})
    return frontier(S, mu, res.x, cap)


def main():
    S, mu = universe()
    cases = []
    # The closed form is the tangency portfolio only for rf below the minimum-variance portfolio's
    # expected return (above it, it is the point of least Sharpe ratio on the frontier's lower half).
    gmv = np.linalg.solve(S, np.ones(len(mu)))
    gmv_return = float(gmv @ mu / gmv.sum())
    for rf in (0.0, 0.015):
        assert rf < gmv_return
        w = closed_form(S, mu, rf)
        cases.append({"name": f"long-short, rf {rf}", "riskFreeRate": rf, "longOnly": False, "cap": None,
                      "weights": w.tolist(), "sharpe": sharpe(S, mu, rf, w), "solver": "closed form (numpy)"})
    for rf in (0.0, 0.03):
        cap = 0.35
        w = homogenised(S, mu, rf, cap)
        check = by_frontier(S, mu, rf, cap)
        assert np.max(np.abs(w - check)) < 1e-5, (w, check)
        assert abs(sharpe(S, mu, rf, w) - sharpe(S, mu, rf, check)) < 1e-9
        cases.append({"name": f"long-only, caps {cap}, rf {rf}", "riskFreeRate": rf, "longOnly": True, "cap": cap,
                      "weights": w.tolist(), "sharpe": sharpe(S, mu, rf, w),
                      "solver": "cvxopt homogenised QP, agreeing with the frontier search to 1e-5"})
    doc = {
        "source": f"numpy {np.__version__}, cvxopt {cvxopt.__version__}, scipy {scipy.__version__}",
        "covariance": S.tolist(),
        "expectedReturns": mu.tolist(),
        "cases": cases,
    }
    with open(os.path.join(HERE, "..", "fixtures", "optimise", "tangency.json"), "w") as f:
        json.dump(doc, f)
        f.write("\n")


if __name__ == "__main__":
    main()
