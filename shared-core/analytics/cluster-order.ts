/**
 * Orders assets so that correlated blocks sit together on the heat map: agglomerative
 * clustering with average linkage (UPGMA) on the correlation distance d = sqrt((1 - rho) / 2)
 * (Mantegna 1999, Eur. Phys. J. B, "Hierarchical structure in financial markets"), leaves read
 * left to right. Ties and child order follow scipy.cluster.hierarchy (linkage, then leaves_list):
 * a merged cluster gets id n + step, its smaller-id child goes left.
 */

export interface Dendrogram {
  /** One row per merge: [left id, right id, distance, size], as scipy's linkage matrix Z. */
  merges: [number, number, number, number][];
  /** Leaf indices in display order. */
  order: number[];
}

/** `correlation` is N x N row-major (a Matrix's data or plain rows flattened). */
export function correlationDistance(correlation: ArrayLike<number>, n: number): Float64Array {
  const d = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      const rho = Math.max(-1, Math.min(1, correlation[i * n + j]));
      d[i * n + j] = i === j ? 0 : Math.sqrt((1 - rho) / 2);
    }
  return d;
}

/** Average-linkage clustering of a symmetric distance matrix (O(N^3); N is a universe, not a market). */
export function averageLinkage(distance: ArrayLike<number>, n: number): Dendrogram {
  if (n === 0) return { merges: [], order: [] };
  // Working distances between active clusters, indexed by slot; slot i starts as leaf i.
  const d = Float64Array.from(distance as ArrayLike<number>);
  const active = new Array<boolean>(n).fill(true);
  const slotId = Array.from({ length: n }, (_, i) => i);
  const size = new Array<number>(n).fill(1);
  const merges: Dendrogram['merges'] = [];
  for (let step = 0; step < n - 1; step++) {
    let best = Infinity;
    let a = -1;
    let b = -1;
    for (let i = 0; i < n; i++) {
      if (!active[i]) continue;
      for (let j = i + 1; j < n; j++) {
        if (!active[j]) continue;
        const v = d[i * n + j];
        if (v < best) {
          best = v;
          a = i;
          b = j;
        }
      }
    }
    const idA = slotId[a];
    const idB = slotId[b];
    const merged = size[a] + size[b];
    merges.push([Math.min(idA, idB), Math.max(idA, idB), best, merged]);
    // Lance-Williams update for average linkage: size-weighted mean of the two distances.
    for (let k = 0; k < n; k++) {
      if (!active[k] || k === a || k === b) continue;
      const v = (size[a] * d[a * n + k] + size[b] * d[b * n + k]) / merged;
      d[a * n + k] = v;
      d[k * n + a] = v;
    }
    active[b] = false;
    size[a] = merged;
    slotId[a] = n + step;
  }
  return { merges, order: leaves(merges, n) };
}

function leaves(merges: Dendrogram['merges'], n: number): number[] {
  if (n === 1) return [0];
  const out: number[] = [];
  const stack = [n + merges.length - 1];
  while (stack.length > 0) {
    const id = stack.pop() as number;
    if (id < n) out.push(id);
    else {
      const [left, right] = merges[id - n];
      stack.push(right, left);
    }
  }
  return out;
}

/** The display order of assets for a correlation matrix. */
export function clusterOrder(correlation: ArrayLike<number>, n: number): number[] {
  return averageLinkage(correlationDistance(correlation, n), n).order;
}
