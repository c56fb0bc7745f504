"""Reference leaf orders for the heat map's asset ordering.

Average-linkage clustering on the correlation distance sqrt((1 - rho) / 2), leaf order from
scipy.cluster.hierarchy.linkage(method='average') and leaves_list (Debian python3-scipy 1.10.1,
numpy 1.24.2). Correlations come from seeded block-factor returns, so blocks exist to be found.
Run with /usr/bin/python3 test/reference/cluster_order.py; writes fixtures/cluster-order.json.
"""
import json
import os

import numpy as np
import scipy
from scipy.cluster.hierarchy import leaves_list, linkage
from scipy.spatial.distance import squareform


def case(seed, n, blocks, t=500):
    rng = np.random.default_rng(seed)
    labels = rng.integers(0, blocks, size=n)
    factors = rng.standard_normal((t, blocks))
    loadings = rng.uniform(0.4, 1.2, size=n)
    returns = factors[:, labels] * loadings + rng.standard_normal((t, n)) * rng.uniform(0.5, 1.5, size=n)
    corr = np.corrcoef(returns, rowvar=False)
    dist = np.sqrt(np.clip((1.0 - corr) / 2.0, 0.0, None))
    np.fill_diagonal(dist, 0.0)
    z = linkage(squareform(dist, checks=False), method="average")
    return {
        "seed": seed,
        "n": n,
        "correlation": corr.reshape(-1).tolist(),
        "linkage": z.tolist(),
        "order": leaves_list(z).tolist(),
    }


cases = [case(1, 6, 2), case(7, 12, 3), case(2024, 25, 4), case(99, 40, 5)]
out = {
    "source": f"scipy {scipy.__version__} linkage(method='average') + leaves_list, numpy {np.__version__}",
    "cases": cases,
}
path = os.path.join(os.path.dirname(__file__), "fixtures", "cluster-order.json")
with open(path, "w") as f:
    json.dump(out, f)
print(f"wrote {path}")
