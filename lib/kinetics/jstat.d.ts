// Minimal typings for the parts of jstat 1.9 used by lib/kinetics (the package ships none).
declare module "jstat" {
  interface ContinuousDistribution {
    cdf(x: number, ...params: number[]): number;
    pdf(x: number, ...params: number[]): number;
    inv(p: number, ...params: number[]): number;
  }
  interface JStat {
    studentt: ContinuousDistribution;
    centralF: ContinuousDistribution;
    chisquare: ContinuousDistribution;
    normal: ContinuousDistribution;
    jStat: JStat;
  }
  // The package is CommonJS/UMD: only the default import is reliable under Node ESM.
  const jStat: JStat;
  export default jStat;
}
