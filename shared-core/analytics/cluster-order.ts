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

/**
 * Average-linkage clustering of a symmetric distance matrix. Each active slot keeps its nearest
 * active slot after it and that distance, so a step looks at one entry per slot instead of every
 * pair (O(N^2) per step was 28 ms of a 300-asset comparison per estimate, three times over); only
 * the slots whose nearest neighbour was merged, or that the merged cluster comes nearer to, are
 * looked at again. The pair chosen is the one a scan of every pair, rows then columns in
 * increasing order, would choose (the first of the smallest distances), so ties resolve as
 * before.
 */
export function averageLinkage(distance: ArrayLike<number>, n: number): Dendrogram {
  if (n === 0) return { merges: [], order: [] };
  // Working distances between active clusters, indexed by slot; slot i starts as leaf i.
  const d = Float64Array.from(distance as ArrayLike<number>);
  const active = new Uint8Array(n).fill(1);
  const slotId = Array.from({ length: n }, (_, i) => i);
  const size = new Float64Array(n).fill(1);
  // nearest[i]: the first active slot j > i at the smallest d[i][j] (-1 when none); gap[i] that distance.
  const nearest = new Int32Array(n).fill(-1);
  const gap = new Float64Array(n).fill(Infinity);
  for (let i = 0; i < n; i++) nearestAfter(d, n, i, active, nearest, gap);
  const merges: Dendrogram['merges'] = [];
  for (let step = 0; step < n - 1; step++) {
    let best = Infinity;
    let a = -1;
    for (let i = 0; i < n; i++)
      if (active[i] && nearest[i] >= 0 && gap[i] < best) {
        best = gap[i];
        a = i;
      }
    const b = nearest[a];
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
    active[b] = 0;
    size[a] = merged;
    slotId[a] = n + step;
    // Slot a's distances all changed; slots before b lose b; slots before a see a at a new distance.
    nearestAfter(d, n, a, active, nearest, gap);
    for (let k = 0; k < b; k++) {
      if (!active[k] || k === a) continue;
      if (nearest[k] === a || nearest[k] === b) nearestAfter(d, n, k, active, nearest, gap);
      else if (k < a) {
        const v = d[k * n + a];
        if (v < gap[k] || (v === gap[k] && a < nearest[k])) {
          gap[k] = v;
          nearest[k] = a;
        }
      }
    }
  }
  return { merges, order: leaves(merges, n) };
}

/** The first active slot after i at the smallest distance from i, into nearest[i] and gap[i]. */
function nearestAfter(
  d: Float64Array,
  n: number,
  i: number,
  active: Uint8Array,
  nearest: Int32Array,
  gap: Float64Array,
): void {
  let best = Infinity;
  let at = -1;
  const row = i * n;
  for (let j = i + 1; j < n; j++)
    if (active[j] && d[row + j] < best) {
      best = d[row + j];
      at = j;
    }
  nearest[i] = at;
  gap[i] = best;
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
