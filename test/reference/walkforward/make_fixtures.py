"""Reference values for the walk-forward engine, its metrics and the shock propagation.

Run with Debian's interpreter and numpy/scipy (not the pyenv python3):
    /usr/bin/python3 test/reference/walkforward/make_fixtures.py
It reads the EuStockMarkets closes of R's datasets package (written by
test/reference/estimators/eustockmarkets.R, rows on consecutive weekdays from 1991-07-01) and
writes test/reference/fixtures/walkforward/eustock-walkforward.json. The TypeScript tests read
only the JSON.

The computations are written independently of the TypeScript, in the plainest vectorised form:
- a constant-weight portfolio, rebalanced on the last row of each calendar month, held
  buy-and-hold in between: value_t = V_k (1 - c_k) sum_i w_i P_i,t / P_i,k over the segment
  after rebalance k, with c_k = sum_i |w_i - d_i| rate_i and d the drifted weights;
- annualised return (prod(1 + r))^(P/n) - 1, volatility numpy.std(ddof=1) sqrt(P), Sharpe
  ratio of excess returns (Sharpe 1994), maximum drawdown from numpy.maximum.accumulate;
- the conditional expectation of a shock by least squares: numpy.linalg.lstsq regression of
  every asset's log return on the shocked asset's (the sample regression slope equals
  Sigma_i1 / Sigma_11 of the sample covariance), times ln(1 + s);
- the Jobson-Korkie-Memmel statistic with scipy.stats.norm for its p-value.
"""

import json
import os

import numpy as np
import scipy
from scipy.stats import norm

ROOT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "..")
SOURCE = os.path.join(ROOT, "test/reference/fixtures/estimators/eustockmarkets.json")
OUT = os.path.join(ROOT, "test/reference/fixtures/walkforward/eustock-walkforward.json")

with open(SOURCE) as f:
    data = json.load(f)
dates = data["dates"]
P = np.array(data["closes"], dtype=float)  # T x 4
T, N = P.shape
weights = np.array([0.4, 0.3, 0.2, 0.1])
rates = np.array([0.001, 0.001, 0.002, 0.002])
start = 250
per_year = 252
cash_rate = 0.02

month = [d[:7] for d in dates]
rebalance_rows = [start] + [t for t in range(start + 1, T - 1) if month[t] != month[t + 1]]

value = np.empty(T)
value[start] = 1.0
costs = []
turnovers = []
drifted = None
for k, row in enumerate(rebalance_rows):
    end = rebalance_rows[k + 1] if k + 1 < len(rebalance_rows) else T - 1
    if drifted is None:
        traded = np.abs(weights)
    else:
        traded = np.abs(weights - drifted)
    cost = float(np.sum(traded * rates))
    costs.append(cost)
    turnovers.append(float(np.sum(traded)))
    after_cost = value[row] * (1 - cost)
    seg = P[row + 1 : end + 1] / P[row]
    value[row + 1 : end + 1] = after_cost * (seg @ weights)
    holding = weights * P[end] / P[row]
    drifted = holding / holding.sum()

returns = value[start + 1 :] / value[start:-1] - 1
n = returns.size
ann_return = float(np.prod(1 + returns) ** (per_year / n) - 1)
vol = float(np.std(returns, ddof=1) * np.sqrt(per_year))
rf = (1 + cash_rate) ** (1 / per_year) - 1
ex = returns - rf
sharpe = float(ex.mean() / ex.std(ddof=1) * np.sqrt(per_year))
curve = value[start:]
peaks = np.maximum.accumulate(curve)
dd = 1 - curve / peaks
trough = int(np.argmax(dd))
peak = int(np.argmax(curve[: trough + 1]))

# Equal-weight second candidate for the i.i.d. Sharpe-difference test.
value_b = np.empty(T)
value_b[start] = 1.0
for k, row in enumerate(rebalance_rows):
    end = rebalance_rows[k + 1] if k + 1 < len(rebalance_rows) else T - 1
    seg = P[row + 1 : end + 1] / P[row]
    value_b[row + 1 : end + 1] = value_b[row] * (seg @ np.full(N, 0.25))
returns_b = value_b[start + 1 :] / value_b[start:-1] - 1
xa = returns - rf
xb = returns_b - rf
sa = xa.mean() / xa.std(ddof=1)
sb = xb.mean() / xb.std(ddof=1)
rho = np.corrcoef(xa, xb)[0, 1]
var = (2 - 2 * rho + 0.5 * (sa**2 + sb**2 - 2 * sa * sb * rho**2)) / n
z = float((sa - sb) / np.sqrt(var))

# Shock: EU1 falls 20%; every asset's expected move by least-squares regression on EU1.
logret = np.diff(np.log(P), axis=0)
x = logret[:, 0] - logret[:, 0].mean()
moves = []
for i in range(N):
    y = logret[:, i] - logret[:, i].mean()
    beta = np.linalg.lstsq(x[:, None], y, rcond=None)[0][0]
    moves.append(float(np.expm1(beta * np.log(0.8))))

fixture = {
    "name": "EuStockMarkets walk-forward references",
    "generator": f"test/reference/walkforward/make_fixtures.py, numpy {np.__version__}, scipy {scipy.__version__}",
    "source": data["source"],
    "settings": {
        "weights": weights.tolist(),
        "costRates": rates.tolist(),
        "startIndex": start,
        "periodsPerYear": per_year,
        "cashRate": cash_rate,
        "rebalance": "monthly",
    },
    "rebalanceDates": [dates[r] for r in rebalance_rows],
    "turnovers": turnovers,
    "costs": costs,
    "growth": curve[1:].tolist(),
    "annualisedReturn": ann_return,
    "volatility": vol,
    "sharpeRatio": sharpe,
    "maxDrawdown": {"depth": float(dd[trough]), "peakDate": dates[start + peak], "troughDate": dates[start + trough]},
    "equalWeightGrowth": value_b[start + 1 :].tolist(),
    "jobsonKorkieMemmel": {"z": z, "pValue": float(2 * norm.sf(abs(z)))},
    "shockEU1minus20": moves,
}
os.makedirs(os.path.dirname(OUT), exist_ok=True)
with open(OUT, "w") as f:
    json.dump(fixture, f, indent=1)
    f.write("\n")
