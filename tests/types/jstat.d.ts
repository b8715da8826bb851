// jstat ships no types; the tests use only these functions as cross-check oracles.
declare module "jstat" {
  export const jStat: {
    beta: { inv(p: number, a: number, b: number): number; cdf(x: number, a: number, b: number): number };
    normal: { inv(p: number, mean: number, sd: number): number; cdf(x: number, mean: number, sd: number): number };
    [name: string]: unknown;
  };
  const jstat: { jStat: typeof jStat };
  export default jstat;
}
