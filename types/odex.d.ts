// Types for the npm package `odex` (ODEX extrapolation integrator), used only as a reference in
// tests. The package ships its TypeScript source next to the JavaScript; pointing the compiler here
// keeps our strict type-check from compiling that source.
export interface OdexSolution {
  y: number[];
  outcome: number;
  nStep: number;
  xEnd: number;
}

export declare class Solver {
  constructor(n: number);
  absoluteTolerance: number | number[];
  relativeTolerance: number | number[];
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): OdexSolution;
}

declare const odex: { Solver: typeof Solver };
export default odex;
