"""Reference figures for the book review (numpy + cvxopt), from the invented book's own data.

For each household with holdings and a computable recommendation:
- holdings valued in the scenario's base currency at the last rate on or before their date;
- monthly log returns of the prices converted into the base currency, sample covariance
  (divisor T-1) annualised by 12 (common practice), on the months up to the revision's day
  ("then") and on all months ("now");
- the recommended maximum-diversification weights on the "then" months, solved by cvxopt as one
  QP in y = k w (Choueifaty and Coignard 2008; homogenised limits, Charnes and Cooper 1962):
  minimise y' S y subject to sigma' y = 1, y >= 0, y_i <= cap k, sum y = k, group and illiquid
  sums <= limit k;
- drift sum |current - target|, and volatility sqrt(w' S w) and diversification ratio
  w' sigma / sqrt(w' S w) of the holdings and of the target, then and now.
"""
import json
import sys

import numpy as np
from cvxopt import matrix, solvers

solvers.options.update({"show_progress": False, "abstol": 1e-13, "reltol": 1e-13, "feastol": 1e-13, "maxiters": 200})


def rate_series(book, currency, base):
    """Units of `base` per one unit of `currency`, month by month (rates are euro per unit)."""
    eur_per = lambda c: np.ones(len(book["dates"])) if c == "EUR" else np.array(book["rates"][c])
    return eur_per(currency) / eur_per(base)


def max_diversification(cov, cap, groups, illiquid, limit_illiquid):
    n = cov.shape[0]
    sigma = np.sqrt(np.diag(cov))
    P = np.zeros((n + 1, n + 1))
    P[:n, :n] = 2 * cov
    P[n, n] = 0.0
    q = np.zeros(n + 1)
    rows, h = [], []
    for i in range(n):  # -y_i <= 0 and y_i - cap k <= 0
        r = np.zeros(n + 1); r[i] = -1; rows.append(r); h.append(0.0)
        r = np.zeros(n + 1); r[i] = 1; r[n] = -cap; rows.append(r); h.append(0.0)
    for members, limit in groups + ([(illiquid, limit_illiquid)] if illiquid else []):
        r = np.zeros(n + 1)
        r[members] = 1
        r[n] = -limit
        rows.append(r); h.append(0.0)
    r = np.zeros(n + 1); r[n] = -1; rows.append(r); h.append(0.0)
    A = np.zeros((2, n + 1))
    A[0, :n] = sigma
    A[1, :n] = 1
    A[1, n] = -1
    b = np.array([1.0, 0.0])
    sol = solvers.qp(matrix(P), matrix(q), matrix(np.array(rows)), matrix(np.array(h)), matrix(A), matrix(b))
    assert sol["status"] == "optimal", sol["status"]
    x = np.array(sol["x"]).ravel()
    w = x[:n] / x[n]
    w[np.abs(w) < 1e-11] = 0.0
    return w


def risk(w, cov):
    vol = float(np.sqrt(w @ cov @ w))
    return {"volatility": vol, "diversificationRatio": float(w @ np.sqrt(np.diag(cov)) / vol)}


def main(src, dst, on_target_too=False):
    book = json.load(open(src))
    dates = book["dates"]
    kinds = {a["id"]: a for a in book["assets"]}
    out = []
    for hh in book["households"]:
        # On-target holdings are written by the store writer from its own solve, so the fixture
        # leaves them out; the bench (--on-target-too) gives them the target itself, so that the
        # script does the same work per household as the review it is timed against.
        if hh["kind"] in ("no-holdings", "cannot-compute") or (hh["kind"] == "on-target" and not on_target_too):
            continue
        sc = hh["scenario"]
        base = sc["baseCurrency"]
        assets = sc["assets"]
        saved_day = hh["savedAt"][:10]
        to_base = rate_series(book, "EUR", base)
        prices = np.array([np.array(book["closes"][a]) * to_base for a in assets]).T
        rets = np.diff(np.log(prices), axis=0)
        ret_dates = dates[1:]
        then_rows = [i for i, d in enumerate(ret_dates) if d <= saved_day]
        cov_then = np.cov(rets[then_rows].T, ddof=1) * 12
        cov_now = np.cov(rets.T, ddof=1) * 12
        cap = sc["constraints"]["weightBounds"]["default"][1]
        groups = [([assets.index(m) for m in g["members"]], g["max"]) for g in sc["constraints"].get("groups", [])]
        illiquid = [i for i, a in enumerate(assets) if kinds[a]["liquidity"] == "illiquid"]
        target = max_diversification(cov_then, cap, groups, illiquid, sc["constraints"]["illiquidMax"])
        values = {a: w for a, w in zip(assets, target)} if hh["kind"] == "on-target" else {}
        for h in hh["holdings"] if hh["kind"] != "on-target" else []:
            t = max(i for i, d in enumerate(dates) if d <= h["asOf"])
            values[h["asset"]] = h["amount"] * rate_series(book, h["currency"], base)[t]
        total = sum(values.values())
        current = np.array([values.get(a, 0.0) / total for a in assets])
        gaps = current - target
        k = int(np.argmax(np.abs(gaps)))
        out.append({
            "household": hh["name"],
            "target": {a: float(w) for a, w in zip(assets, target)},
            "current": {a: float(w) for a, w in zip(assets, current)},
            "drift": {"total": float(np.abs(gaps).sum()), "largest": {"asset": assets[k], "gap": float(gaps[k])}},
            "currentRisk": {"then": risk(current, cov_then), "now": risk(current, cov_now)},
            "recommendedRisk": {"then": risk(target, cov_then), "now": risk(target, cov_now)},
        })
    json.dump({"source": "numpy + cvxopt (Debian python3-numpy, python3-cvxopt), test/reference/review/review_reference.py",
               "households": out}, open(dst, "w"), indent=1)


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2], "--on-target-too" in sys.argv[3:])
