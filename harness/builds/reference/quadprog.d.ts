// Types for the CommonJS npm package `quadprog` (a port of the R/Fortran Goldfarb–Idnani solver).
// Arrays are 1-based as in Fortran: index 0 is unused.
declare module 'quadprog' {
  export interface QuadprogResult {
    solution: number[];
    Lagrangian: number[];
    value: number[];
    unconstrained_solution: number[];
    iterations: number[];
    iact: number[];
    message: string;
  }
  /** min −dᵀb + ½·bᵀDb subject to Aᵀb ≥ b0 (the first meq as equalities). Overwrites D and d. */
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
