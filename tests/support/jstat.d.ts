// Minimal types for the parts of jstat the domain cross-checks use.
declare module "jstat" {
  export const jStat: {
    normal: { cdf(x: number, mean: number, sd: number): number; inv(p: number, mean: number, sd: number): number };
    hypgeom: { pdf(k: number, N: number, m: number, n: number): number; cdf(k: number, N: number, m: number, n: number): number };
  };
}
