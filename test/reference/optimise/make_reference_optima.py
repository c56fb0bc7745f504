#!/usr/bin/python3
"""Reference optima for Holdfast's optimiser, from general-purpose solvers outside the project.

* Debian's python3-cvxopt (cvxopt.solvers.qp, a primal-dual interior-point method) on
  - EuStockMarkets (R's datasets package, Debian r-base-core: daily closes of four European
    indices 1991-1998), daily log returns, sample covariance, annualised by 260 (the series'
    frequency attribute);
  - seeded synthetic factor-model universes of N = 50, 150 and 300 assets (invented numbers).
* R's quadprog (Debian r-cran-quadprog, Goldfarb-Idnani dual method) on the EuStockMarkets cases,
  run through /usr/bin/Rscript, as a second, independent solver.

Maximum diversification is solved in the rescaled variable of Choueifaty and Coignard (2008):
minimise y'Sy s.t. sigma'y = 1, y >= 0, y_i <= u_i sum(y), group bands homogenised likewise;
w = y / sum(y). Minimum variance directly. Writes test/reference/fixtures/optimise/reference-optima.json.
Run: /usr/bin/python3 test/reference/optimise/make_reference_optima.py
"""
import json, os, subprocess, tempfile
import numpy as np
import cvxopt
from cvxopt import matrix, solvers

solvers.options.update({"show_progress": False, "abstol": 1e-12, "reltol": 1e-12, "feastol": 1e-12, "maxiters": 200})
HERE = os.path.dirname(os.path.abspath(__file__))


def col(v):
    return matrix(np.asarray(v, dtype=float).reshape(-1, 1))


def constraint_rows(n, ids, c):
    """Rows G w <= h (weights space) of caps and bands, plus the budget."""
    G, h = [], []
    lo, hi = c["weightBounds"]["default"]
    for i in range(n):
        e = np.zeros(n); e[i] = -1; G.append(e); h.append(-lo)
        e = np.zeros(n); e[i] = 1; G.append(e); h.append(hi)
    for g in c.get("groups", []):
        m = np.array([1.0 if a in g["members"] else 0.0 for a in ids])
        if "max" in g: G.append(m); h.append(g["max"])
        if "min" in g: G.append(-m); h.append(-g["min"])
    return np.array(G), np.array(h)


def accept(sol):
    # cvxopt stops with 'unknown' when it cannot reach the tight tolerances asked here; its last
    # iterate is still used when its residuals are small (they are printed into the fixture).
    ok = sol["status"] == "optimal" or (sol["primal infeasibility"] < 1e-9 and sol["dual infeasibility"] < 1e-9)
    assert ok, (sol["status"], sol["primal infeasibility"], sol["dual infeasibility"])


def min_variance(S, ids, c):
    n = len(ids)
    G, h = constraint_rows(n, ids, c)
    sol = solvers.qp(matrix(S), col(np.zeros(n)), matrix(G), col(h), matrix(np.ones((1, n))), matrix(1.0))
    accept(sol)
    return np.array(sol["x"]).ravel()


def max_diversification(S, ids, c):
    n = len(ids)
    sigma = np.sqrt(np.diag(S))
    G, h = constraint_rows(n, ids, c)
    # Homogenise: G w <= h becomes G y - h sum(y) <= 0.
    Gy = G - np.outer(h, np.ones(n))
    sol = solvers.qp(matrix(S), col(np.zeros(n)), matrix(Gy), col(np.zeros(len(h))),
                     matrix(sigma.reshape(1, n)), matrix(1.0))
    accept(sol)
    y = np.array(sol["x"]).ravel()
    return y / y.sum()


def dr(S, w):
    return float(w @ np.sqrt(np.diag(S)) / np.sqrt(w @ S @ w))


def quadprog_in_r(S, ids, c, kind):
    """The same problem through R's quadprog::solve.QP (constraints as columns of Amat, A'x >= b0)."""
    n = len(ids)
    G, h = constraint_rows(n, ids, c)
    if kind == "max-diversification":
        sigma = np.sqrt(np.diag(S))
        A = np.vstack([sigma, -(G - np.outer(h, np.ones(n)))]).T
        b0 = np.concatenate([[1.0], np.zeros(len(h))])
    else:
        A = np.vstack([np.ones(n), -G]).T
        b0 = np.concatenate([[1.0], -h])
    with tempfile.TemporaryDirectory() as d:
        np.savetxt(os.path.join(d, "S.csv"), S, delimiter=",", fmt="%.17g")
        np.savetxt(os.path.join(d, "A.csv"), A, delimiter=",", fmt="%.17g")
        np.savetxt(os.path.join(d, "b.csv"), b0, delimiter=",", fmt="%.17g")
        code = (f"library(quadprog); d <- '{d}'; S <- as.matrix(read.csv(file.path(d,'S.csv'), header=FALSE));"
                "A <- as.matrix(read.csv(file.path(d,'A.csv'), header=FALSE)); b <- read.csv(file.path(d,'b.csv'), header=FALSE)[,1];"
                "r <- solve.QP(S, rep(0, nrow(S)), A, b, meq=1); cat(sprintf('%.17g', r$solution), sep='\\n')")
        out = subprocess.run(["/usr/bin/Rscript", "-e", code], check=True, capture_output=True, text=True).stdout
    x = np.array([float(v) for v in out.split()])
    return x / x.sum() if kind == "max-diversification" else x


def eu_stock_markets():
    out = subprocess.run(["/usr/bin/Rscript", "-e", "write.csv(as.data.frame(EuStockMarkets), row.names=FALSE)"],
                         check=True, capture_output=True, text=True).stdout.strip().splitlines()
    names = [h.strip('"') for h in out[0].split(",")]
    P = np.array([[float(v) for v in line.split(",")] for line in out[1:]])
    r = np.diff(np.log(P), axis=0)
    return names, np.cov(r, rowvar=False, ddof=1) * 260, r.shape[0]


def rversion(pkg):
    return subprocess.run(["/usr/bin/Rscript", "-e", f"cat(as.character(packageVersion('{pkg}')))"],
                          check=True, capture_output=True, text=True).stdout.strip()


cases = []
names, S, T = eu_stock_markets()
eu_constraints = [
    ("long-only", {"weightBounds": {"default": [0, 1]}}),
    ("caps 35%", {"weightBounds": {"default": [0, 0.35]}}),
    ("band", {"weightBounds": {"default": [0, 0.6]}, "groups": [{"name": "Core", "members": ["DAX", "CAC"], "min": 0.3, "max": 0.45}]}),
]
for label, c in eu_constraints:
    for kind, fn in (("max-diversification", max_diversification), ("min-variance", min_variance)):
        w = fn(S, names, c)
        wr = quadprog_in_r(S, names, c, kind)
        assert np.max(np.abs(w - wr)) < 1e-7, (label, kind, w, wr)
        cases.append({"name": f"EuStockMarkets {kind} {label}", "assets": names, "covariance": S.tolist(),
                      "objective": kind, "constraints": c, "weights": w.tolist(), "quadprogWeights": wr.tolist(),
                      "diversificationRatio": dr(S, w), "volatility": float(np.sqrt(w @ S @ w)), "observations": T})

rng = np.random.default_rng(20240601)
for n, cap in ((50, 0.06), (150, 0.03), (300, 0.02)):
    k = 4
    B = rng.normal(0, 0.08, (n, k)); B[:, 0] = np.abs(B[:, 0]) + 0.08
    d = rng.uniform(0.003, 0.05, n)
    S = B @ B.T + np.diag(d)
    ids = [f"S{i + 1:03d}" for i in range(n)]
    groups = [{"name": "Block A", "members": ids[: n // 3], "min": 0.2, "max": 0.4},
              {"name": "Block B", "members": ids[n // 3: 2 * n // 3], "max": 0.3}]
    for kind, fn in (("max-diversification", max_diversification), ("min-variance", min_variance)):
        c = {"weightBounds": {"default": [0, cap]}, "groups": groups}
        w = fn(S, ids, c)
        cases.append({"name": f"synthetic N={n} {kind} cap {cap} bands", "assets": ids, "factorLoadings": B.tolist(),
                      "specificVariances": d.tolist(), "objective": kind, "constraints": c, "weights": w.tolist(),
                      "diversificationRatio": dr(S, w), "volatility": float(np.sqrt(w @ S @ w))})

doc = {"source": f"cvxopt {cvxopt.__version__} solvers.qp (Debian python3-cvxopt), numpy {np.__version__}; "
                 f"EuStockMarkets cases also by R quadprog {rversion('quadprog')} solve.QP (r-cran-quadprog); "
                 "script test/reference/optimise/make_reference_optima.py",
       "cases": cases}
with open(os.path.join(HERE, "..", "fixtures", "optimise", "reference-optima.json"), "w") as f:
    json.dump(doc, f)
print(len(cases), "cases")
