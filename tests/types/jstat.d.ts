// jstat ships no type declarations: the part of it the tests take as their statistics reference.
declare module 'jstat' {
  const jstat: {
    jStat: {
      binomial: { cdf(k: number, n: number, p: number): number };
      poisson: { cdf(k: number, mean: number): number };
      chisquare: { cdf(x: number, dof: number): number; inv(p: number, dof: number): number };
      normal: { cdf(x: number, mean: number, std: number): number; inv(p: number, mean: number, std: number): number };
      gammaln(x: number): number;
      mean(values: number[]): number;
      stdev(values: number[], sample?: boolean): number;
    };
  };
  export default jstat;
}
