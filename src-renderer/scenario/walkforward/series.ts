/**
 * Curves of the walk-forward view from a growth-of-1 series: the drawdown beneath it (the fall
 * from the running peak, common practice), and thinning to a drawable number of points that
 * always keeps each stretch's lowest and highest value, so no trough disappears from the picture.
 */
export function drawdowns(growth: ArrayLike<number>): Float64Array {
  const out = new Float64Array(growth.length);
  let peak = 1;
  for (let t = 0; t < growth.length; t++) {
    peak = Math.max(peak, growth[t]);
    out[t] = growth[t] / peak - 1;
  }
  return out;
}

/** Indices to draw: at most about `maxPoints`, first and last kept, each bucket's min and max kept. */
export function thinIndices(values: ArrayLike<number>, maxPoints: number): number[] {
  const n = values.length;
  if (n <= maxPoints) return Array.from({ length: n }, (_, i) => i);
  const buckets = Math.max(1, Math.floor((maxPoints - 2) / 2));
  const size = (n - 2) / buckets;
  const out = [0];
  for (let b = 0; b < buckets; b++) {
    const from = 1 + Math.floor(b * size);
    const to = Math.min(n - 1, 1 + Math.floor((b + 1) * size));
    let lo = from;
    let hi = from;
    for (let i = from; i < to; i++) {
      if (values[i] < values[lo]) lo = i;
      if (values[i] > values[hi]) hi = i;
    }
    if (to > from) out.push(Math.min(lo, hi), ...(lo === hi ? [] : [Math.max(lo, hi)]));
  }
  out.push(n - 1);
  return out;
}
