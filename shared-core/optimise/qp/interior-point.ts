/**
 * Primal-dual interior-point method with Mehrotra's predictor-corrector (Mehrotra 1992, SIAM J.
 * Optimization 2; the form of Nocedal and Wright, Numerical Optimization, 2nd ed. 2006, ch. 16.6)
 * for the QP of types.ts. Slacks s (G x + s = h) and bound slacks are eliminated, leaving the
 * n x n normal matrix H = P + G'WG + diag(bound terms), factored once per iteration and used for
 * both the predictor and the corrector; equality rows go through the small Schur complement
 * A H^-1 A'. It stops at a modest residual and leaves the last digits to polishing (polish.ts),
 * which solves the identified active set exactly.
 */
import { choleskyInPlace, choleskySolveInPlace } from './dense-factor.js';
import { addRow, rowDot } from './kkt.js';
import { QP_TOLERANCES, type QpProblem, type QpSolution } from './types.js';

export interface InteriorPointOutcome {
  status: 'converged' | 'iteration-limit' | 'breakdown' | 'stalled-infeasible';
  solution: QpSolution;
  /** Primal slacks of G rows and bounds at the last iterate (for active-set identification). */
  slackG: Float64Array;
  slackL: Float64Array;
  slackU: Float64Array;
  iterations: number;
  residual: number;
}

export interface InteriorPointOptions {
  tolerance: number;
  maxIterations?: number;
  /** Stop early (to let phase one decide) when primal infeasibility stalls. */
  detectInfeasibility?: boolean;
  shouldCancel?: () => boolean;
}

const norm = (v: Float64Array): number => {
  let m = 0;
  for (let i = 0; i < v.length; i++) m = Math.max(m, Math.abs(v[i]));
  return m;
};

export function interiorPoint(p: QpProblem, options: InteriorPointOptions): InteriorPointOutcome {
  const n = p.q.length;
  const me = p.A.length;
  const mi = p.G.length;
  const L: number[] = [];
  const U: number[] = [];
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(p.lb[i])) L.push(i);
    if (Number.isFinite(p.ub[i])) U.push(i);
  }
  const nl = L.length;
  const nu = U.length;
  const mTotal = mi + nl + nu;
  const maxIt = options.maxIterations ?? QP_TOLERANCES.maxIterations;

  // Starting point: inside the bounds, unit slacks and multipliers (an infeasible start).
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const lo = p.lb[i];
    const hi = p.ub[i];
    if (Number.isFinite(lo) && Number.isFinite(hi)) x[i] = 0.5 * (lo + hi);
    else if (Number.isFinite(lo)) x[i] = lo + 1;
    else if (Number.isFinite(hi)) x[i] = hi - 1;
  }
  const y = new Float64Array(me);
  const s = new Float64Array(mi);
  const z = new Float64Array(mi).fill(1);
  for (let r = 0; r < mi; r++) s[r] = Math.max(p.h[r] - rowDot(p.G[r], x), 1);
  const sl = new Float64Array(nl);
  const zl = new Float64Array(nl).fill(1);
  const su = new Float64Array(nu);
  const zu = new Float64Array(nu).fill(1);
  for (let k = 0; k < nl; k++) sl[k] = Math.max(x[L[k]] - p.lb[L[k]], 1);
  for (let k = 0; k < nu; k++) su[k] = Math.max(p.ub[U[k]] - x[U[k]], 1);

  const qScale = 1 + norm(p.q);
  let bScale = 1 + norm(p.b) + norm(p.h);
  for (const i of L) bScale = Math.max(bScale, 1 + Math.abs(p.lb[i]));
  for (const i of U) bScale = Math.max(bScale, 1 + Math.abs(p.ub[i]));

  const H = new Float64Array(n * n);
  const rd = new Float64Array(n);
  const rp = new Float64Array(me);
  const ri = new Float64Array(mi);
  const rl = new Float64Array(nl);
  const ru = new Float64Array(nu);
  let it = 0;
  let residual = Infinity;
  let bestPrimal = Infinity;
  let stallCount = 0;
  let status: InteriorPointOutcome['status'] = 'iteration-limit';

  for (; it < maxIt; it++) {
    if (options.shouldCancel?.()) break;
    // Residuals.
    for (let i = 0; i < n; i++) {
      const off = i * n;
      let v = p.q[i];
      for (let j = 0; j < n; j++) v += p.P.data[off + j] * x[j];
      rd[i] = v;
    }
    for (let r = 0; r < me; r++) addRow(rd, p.A[r], y[r]);
    for (let r = 0; r < mi; r++) addRow(rd, p.G[r], z[r]);
    for (let k = 0; k < nl; k++) rd[L[k]] -= zl[k];
    for (let k = 0; k < nu; k++) rd[U[k]] += zu[k];
    for (let r = 0; r < me; r++) rp[r] = rowDot(p.A[r], x) - p.b[r];
    for (let r = 0; r < mi; r++) ri[r] = rowDot(p.G[r], x) + s[r] - p.h[r];
    for (let k = 0; k < nl; k++) rl[k] = sl[k] - x[L[k]] + p.lb[L[k]];
    for (let k = 0; k < nu; k++) ru[k] = x[U[k]] + su[k] - p.ub[U[k]];
    let gap = 0;
    for (let r = 0; r < mi; r++) gap += s[r] * z[r];
    for (let k = 0; k < nl; k++) gap += sl[k] * zl[k];
    for (let k = 0; k < nu; k++) gap += su[k] * zu[k];
    const mu = mTotal > 0 ? gap / mTotal : 0;
    let pObj = 0;
    for (let i = 0; i < n; i++) pObj += x[i] * (0.5 * (rd[i] - p.q[i]) + p.q[i]);
    const primalRes = Math.max(norm(rp), norm(ri), norm(rl), norm(ru)) / bScale;
    const dualRes = norm(rd) / qScale;
    residual = Math.max(primalRes, dualRes, gap / (1 + Math.abs(pObj)));
    if (residual <= options.tolerance) {
      status = 'converged';
      break;
    }
    if (options.detectInfeasibility && it >= 25) {
      if (primalRes < bestPrimal * 0.5) {
        bestPrimal = primalRes;
        stallCount = 0;
      } else if (primalRes > 1e-7 && ++stallCount >= 12) {
        status = 'stalled-infeasible';
        break;
      }
    } else if (primalRes < bestPrimal) bestPrimal = primalRes;

    // Normal matrix H = P + G' (Z/S) G + diag(zl/sl + zu/su).
    H.set(p.P.data.subarray(0, n * n));
    for (let r = 0; r < mi; r++) {
      const w = z[r] / s[r];
      const { idx, val } = p.G[r];
      for (let a = 0; a < idx.length; a++) {
        const off = idx[a] * n;
        const wa = w * val[a];
        for (let c = 0; c < idx.length; c++) H[off + idx[c]] += wa * val[c];
      }
    }
    for (let k = 0; k < nl; k++) H[L[k] * n + L[k]] += zl[k] / sl[k];
    for (let k = 0; k < nu; k++) H[U[k] * n + U[k]] += zu[k] / su[k];
    let maxDiag = 0;
    for (let i = 0; i < n; i++) maxDiag = Math.max(maxDiag, Math.abs(H[i * n + i]));
    if (!Number.isFinite(maxDiag)) {
      status = 'breakdown';
      break;
    }
    // A singular H (a direction free of curvature and constraints) gets a small ridge.
    const Hf = new Float64Array(H);
    let factored = choleskyInPlace(Hf, n);
    for (let attempt = 0, reg = 1e-14 * (maxDiag || 1); !factored && attempt < 6; attempt++, reg *= 100) {
      Hf.set(H);
      for (let i = 0; i < n; i++) Hf[i * n + i] += reg;
      factored = choleskyInPlace(Hf, n);
    }
    if (!factored) {
      status = 'breakdown';
      break;
    }

    // Schur complement of the equality rows: S = A H^-1 A'.
    const M: Float64Array[] = [];
    for (let r = 0; r < me; r++) {
      const col = new Float64Array(n);
      addRow(col, p.A[r], 1);
      choleskySolveInPlace(Hf, n, col);
      M.push(col);
    }
    const Sm = new Float64Array(me * me);
    for (let a = 0; a < me; a++) for (let c = 0; c < me; c++) Sm[a * me + c] = rowDot(p.A[a], M[c]);
    let sMax = 0;
    for (let a = 0; a < me; a++) sMax = Math.max(sMax, Sm[a * me + a]);
    // Dependent equality rows make S singular: a small ridge picks one of the equal solutions.
    const Sf = new Float64Array(Sm);
    let sFactored = me === 0 || choleskyInPlace(Sf, me);
    for (let attempt = 0, reg = 1e-14 * (sMax || 1); !sFactored && attempt < 8; attempt++, reg *= 100) {
      Sf.set(Sm);
      for (let a = 0; a < me; a++) Sf[a * me + a] += reg;
      sFactored = choleskyInPlace(Sf, me);
    }
    if (!sFactored) {
      status = 'breakdown';
      break;
    }

    const solveNewton = (f: Float64Array): { dx: Float64Array; dy: Float64Array } => {
      const t = Float64Array.from(f);
      choleskySolveInPlace(Hf, n, t);
      const dy = new Float64Array(me);
      for (let r = 0; r < me; r++) dy[r] = rowDot(p.A[r], t) + rp[r];
      if (me > 0) choleskySolveInPlace(Sf, me, dy);
      for (let r = 0; r < me; r++) {
        const col = M[r];
        const d = dy[r];
        for (let i = 0; i < n; i++) t[i] -= col[i] * d;
      }
      return { dx: t, dy };
    };

    const direction = (rc: Float64Array, rcl: Float64Array, rcu: Float64Array) => {
      const f = new Float64Array(n);
      for (let i = 0; i < n; i++) f[i] = -rd[i];
      for (let r = 0; r < mi; r++) addRow(f, p.G[r], -(z[r] * ri[r] - rc[r]) / s[r]);
      for (let k = 0; k < nl; k++) f[L[k]] += (zl[k] * rl[k] - rcl[k]) / sl[k];
      for (let k = 0; k < nu; k++) f[U[k]] -= (zu[k] * ru[k] - rcu[k]) / su[k];
      const { dx, dy } = solveNewton(f);
      const ds = new Float64Array(mi);
      const dz = new Float64Array(mi);
      for (let r = 0; r < mi; r++) {
        ds[r] = -ri[r] - rowDot(p.G[r], dx);
        dz[r] = (-rc[r] - z[r] * ds[r]) / s[r];
      }
      const dsl = new Float64Array(nl);
      const dzl = new Float64Array(nl);
      for (let k = 0; k < nl; k++) {
        dsl[k] = -rl[k] + dx[L[k]];
        dzl[k] = (-rcl[k] - zl[k] * dsl[k]) / sl[k];
      }
      const dsu = new Float64Array(nu);
      const dzu = new Float64Array(nu);
      for (let k = 0; k < nu; k++) {
        dsu[k] = -ru[k] - dx[U[k]];
        dzu[k] = (-rcu[k] - zu[k] * dsu[k]) / su[k];
      }
      return { dx, dy, ds, dz, dsl, dzl, dsu, dzu };
    };
    const maxStep = (v: Float64Array, dv: Float64Array, cap: number): number => {
      let a = cap;
      for (let k = 0; k < v.length; k++) if (dv[k] < 0) a = Math.min(a, -v[k] / dv[k]);
      return a;
    };
    const stepOf = (d: ReturnType<typeof direction>): number => {
      let a = 1;
      a = maxStep(s, d.ds, a);
      a = maxStep(z, d.dz, a);
      a = maxStep(sl, d.dsl, a);
      a = maxStep(zl, d.dzl, a);
      a = maxStep(su, d.dsu, a);
      a = maxStep(zu, d.dzu, a);
      return a;
    };

    // Predictor (affine scaling).
    const rc = new Float64Array(mi);
    const rcl = new Float64Array(nl);
    const rcu = new Float64Array(nu);
    for (let r = 0; r < mi; r++) rc[r] = s[r] * z[r];
    for (let k = 0; k < nl; k++) rcl[k] = sl[k] * zl[k];
    for (let k = 0; k < nu; k++) rcu[k] = su[k] * zu[k];
    const aff = direction(rc, rcl, rcu);
    let d = aff;
    if (mTotal > 0) {
      const aAff = stepOf(aff);
      let gapAff = 0;
      for (let r = 0; r < mi; r++) gapAff += (s[r] + aAff * aff.ds[r]) * (z[r] + aAff * aff.dz[r]);
      for (let k = 0; k < nl; k++) gapAff += (sl[k] + aAff * aff.dsl[k]) * (zl[k] + aAff * aff.dzl[k]);
      for (let k = 0; k < nu; k++) gapAff += (su[k] + aAff * aff.dsu[k]) * (zu[k] + aAff * aff.dzu[k]);
      const sigma = Math.pow(gapAff / mTotal / mu, 3);
      // Corrector: centring plus the second-order term of the predictor.
      for (let r = 0; r < mi; r++) rc[r] = s[r] * z[r] + aff.ds[r] * aff.dz[r] - sigma * mu;
      for (let k = 0; k < nl; k++) rcl[k] = sl[k] * zl[k] + aff.dsl[k] * aff.dzl[k] - sigma * mu;
      for (let k = 0; k < nu; k++) rcu[k] = su[k] * zu[k] + aff.dsu[k] * aff.dzu[k] - sigma * mu;
      d = direction(rc, rcl, rcu);
    }
    const alpha = mTotal > 0 ? Math.min(1, QP_TOLERANCES.stepToBoundary * stepOf(d)) : 1;
    for (let i = 0; i < n; i++) x[i] += alpha * d.dx[i];
    for (let r = 0; r < me; r++) y[r] += alpha * d.dy[r];
    for (let r = 0; r < mi; r++) {
      s[r] += alpha * d.ds[r];
      z[r] += alpha * d.dz[r];
    }
    for (let k = 0; k < nl; k++) {
      sl[k] += alpha * d.dsl[k];
      zl[k] += alpha * d.dzl[k];
    }
    for (let k = 0; k < nu; k++) {
      su[k] += alpha * d.dsu[k];
      zu[k] += alpha * d.dzu[k];
    }
    if (!x.every(Number.isFinite)) {
      status = 'breakdown';
      break;
    }
  }

  const zlFull = new Float64Array(n);
  const zuFull = new Float64Array(n);
  const slackL = new Float64Array(n).fill(Infinity);
  const slackU = new Float64Array(n).fill(Infinity);
  for (let k = 0; k < nl; k++) {
    zlFull[L[k]] = zl[k];
    slackL[L[k]] = sl[k];
  }
  for (let k = 0; k < nu; k++) {
    zuFull[U[k]] = zu[k];
    slackU[U[k]] = su[k];
  }
  let obj = 0;
  for (let i = 0; i < n; i++) {
    const off = i * n;
    let v = 0;
    for (let j = 0; j < n; j++) v += p.P.data[off + j] * x[j];
    obj += x[i] * (0.5 * v + p.q[i]);
  }
  return {
    status,
    solution: { x, y, z, zl: zlFull, zu: zuFull, objective: obj },
    slackG: s,
    slackL,
    slackU,
    iterations: it,
    residual,
  };
}
