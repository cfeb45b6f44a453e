// Types for the untyped `fmin` package, used only in tests as an independent second opinion.
declare module 'fmin' {
  export function bisect(
    f: (x: number) => number,
    a: number,
    b: number,
    parameters?: { maxIterations?: number; tolerance?: number },
  ): number;
  export function nelderMead(
    f: (x: number[]) => number,
    x0: number[],
    parameters?: { maxIterations?: number; minErrorDelta?: number; minTolerance?: number; zeroDelta?: number; nonZeroDelta?: number },
  ): { x: number[]; fx: number };
}
