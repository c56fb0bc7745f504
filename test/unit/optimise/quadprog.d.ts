// Types for the npm package quadprog 1.6.1 (a JavaScript port of R's quadprog, Goldfarb-Idnani
// dual method), used only as a reference in tests. Arrays are 1-based as in the Fortran original.
declare module 'quadprog' {
  export interface QuadprogResult {
    solution: number[];
    value: number[];
    Lagrangian: number[];
    iact: number[];
    message: string;
  }
  export function solveQP(
    Dmat: number[][],
    dvec: number[],
    Amat: number[][],
    bvec: number[],
    meq?: number,
    factorized?: number[],
  ): QuadprogResult;
  const quadprog: { solveQP: typeof solveQP };
  export default quadprog;
}
