#!/usr/bin/python3
"""Recomputes the four-asset equal-risk-contribution example of Maillard, Roncalli and Teiletche
(2010, J. Portfolio Management 36(4)): vols 10/20/30/40%, correlation 0.8 between the first two,
-0.5 between the last two, 0 elsewhere. Independent of Holdfast: Newton's method on Spinu's
(2013) convex problem in numpy, then the fixed point is checked by scipy.optimize.minimize on the
same objective. Run with Debian's /usr/bin/python3 (python3-numpy, python3-scipy)."""
import json, os
import numpy as np
import scipy
from scipy.optimize import minimize

vol = np.array([0.1, 0.2, 0.3, 0.4])
corr = np.eye(4)
corr[0, 1] = corr[1, 0] = 0.8
corr[2, 3] = corr[3, 2] = -0.5
S = np.outer(vol, vol) * corr
b = np.full(4, 0.25)

y = 1 / vol
for _ in range(100):
    g = S @ y - b / y
    H = S + np.diag(b / y**2)
    d = -np.linalg.solve(H, g)
    t = 1.0
    while np.any(y + t * d <= 0):
        t /= 2
    y = y + t * d
    if -g @ d < 1e-28:
        break
w = y / y.sum()
res = minimize(lambda z: 0.5 * z @ S @ z - b @ np.log(z), 1 / vol, jac=lambda z: S @ z - b / z,
               method="L-BFGS-B", bounds=[(1e-9, None)] * 4, options={"ftol": 1e-15, "gtol": 1e-12})
w2 = res.x / res.x.sum()
assert np.max(np.abs(w - w2)) < 1e-6, (w, w2)
rc = w * (S @ w) / (w @ S @ w)
out = {
    "source": "Maillard, Roncalli and Teiletche (2010), J. Portfolio Management 36(4), four-asset example; "
              f"recomputed with numpy {np.__version__} (Newton on Spinu 2013) and checked by scipy {scipy.__version__} L-BFGS-B",
    "vols": vol.tolist(), "correlation": corr.tolist(), "covariance": S.tolist(),
    "weights": w.tolist(), "riskContributions": rc.tolist(),
    "equalWeightVolatility": float(np.sqrt(np.full(4, .25) @ S @ np.full(4, .25))),
}
here = os.path.dirname(os.path.abspath(__file__))
with open(os.path.join(here, "..", "fixtures", "optimise", "erc-four-asset.json"), "w") as f:
    json.dump(out, f, indent=1)
print(w)
