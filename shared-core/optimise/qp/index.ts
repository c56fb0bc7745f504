/**
 * The dense convex QP solver's one public entry point: everything outside `optimise/qp/` imports
 * from here. `solveQp` solves; `phaseOne` names the constraints that conflict; the dense
 * factorisations serve the few other dense solves of the core (risk parity's Newton steps, the
 * Sharpe-ratio test's covariance); `QP_TOLERANCES` holds every setting of the solver.
 */
export { solveQp, type SolveQpOptions } from './solve-qp.js';
export { phaseOne, type PhaseOneResult } from './phase-one.js';
export { choleskyInPlace, choleskySolveInPlace, luFactor, luSolve, type LuFactor } from './dense-factor.js';
export { addDot } from './kernels.js';
export {
  QP_TOLERANCES,
  type QpConflict,
  type QpProblem,
  type QpResult,
  type QpSolution,
  type QpStats,
  type QpWarmStart,
  type SparseRow,
} from './types.js';
