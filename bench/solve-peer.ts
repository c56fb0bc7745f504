/**
 * The peer of `holdfast solve` in the bench: the script a quant would write with numpy,
 * scikit-learn's LedoitWolf and cvxopt's QP (Debian's python3-numpy, python3-sklearn,
 * python3-cvxopt), dense matrices throughout. It reads the same price file and a small JSON
 * spec of the mandate (per-asset cap, group bands, a turnover limit against current weights)
 * and solves minimum variance, or maximum diversification in the rescaled variable
 * y = w / (sigma'w) (min y'Sy, sigma'y = 1, every limit multiplied by s = sum(y)); with a
 * turnover limit one auxiliary t_i >= |x_i - c_i s| per asset. Prints status, DR and volatility.
 */
export const PEER_SCRIPT = String.raw`
import sys, json
import numpy as np
from sklearn.covariance import LedoitWolf
from cvxopt import matrix, solvers
solvers.options["show_progress"] = False
spec = json.load(open(sys.argv[2]))
P = np.loadtxt(sys.argv[1], delimiter=",", skiprows=1, converters={0: lambda s: 0.0})[:, 1:]
r = np.diff(np.log(P), axis=0)
S = LedoitWolf().fit(r).covariance_ * 252
n = S.shape[0]
sigma = np.sqrt(np.diag(S))
md = spec["objective"] == "max-diversification"
turn = spec.get("turnover")
m = 2 * n if turn is not None else n
# s: the scale row (sum of the asset variables) for max diversification, the constant 1 otherwise.
srow = np.concatenate([np.ones(n), np.zeros(m - n)]) if md else np.zeros(m)
one = 0.0 if md else 1.0
G, h = [], []
def row(coef, scale, rhs=0.0):
    # coef . x <= rhs, with scale * (s or 1) moved to the left: coef . x - scale * s <= scale * one
    G.append(coef - scale * srow)
    h.append(scale * one + rhs)
E = np.eye(m)
for i in range(n):
    row(-E[i], 0.0)
    row(E[i], spec["cap"])
for g in spec.get("groups", []):
    e = np.zeros(m); e[g["members"]] = 1.0
    if "max" in g: row(e, g["max"])
    if "min" in g: row(-e, -g["min"])
if turn is not None:
    c = np.array(spec["current"])
    for i in range(n):
        # x_i - c_i s - t_i <= 0 and -x_i + c_i s - t_i <= 0
        row(E[i] - E[n + i], c[i])
        row(-E[i] - E[n + i], -c[i])
    row(np.concatenate([np.zeros(n), np.ones(n)]), turn)
Pm = np.zeros((m, m)); Pm[:n, :n] = S
A = np.concatenate([sigma, np.zeros(m - n)]) if md else np.concatenate([np.ones(n), np.zeros(m - n)])
sol = solvers.qp(matrix(Pm), matrix(np.zeros((m, 1))), matrix(np.array(G)), matrix(np.array(h).reshape(-1, 1)),
                 matrix(A.reshape(1, m)), matrix(1.0))
x = np.array(sol["x"]).ravel()[:n]
w = x / x.sum()
print(json.dumps({"status": sol["status"], "iterations": sol["iterations"], "dr": float(w @ sigma / np.sqrt(w @ S @ w)),
                  "volatility": float(np.sqrt(w @ S @ w))}))
`;
