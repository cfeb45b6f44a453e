// Minimal types for the untyped `jstat` package, used only in tests as an independent second opinion.
declare module 'jstat' {
  const jStat: {
    normal: { cdf(x: number, mean: number, sd: number): number; inv(p: number, mean: number, sd: number): number };
  };
  export default jStat;
}
