// Types for the part of jStat (npm `jstat`) the statistics tests compare against.
declare module 'jstat' {
  export const jStat: {
    beta: {
      inv(p: number, a: number, b: number): number;
      cdf(x: number, a: number, b: number): number;
    };
    normal: {
      inv(p: number, mean: number, sd: number): number;
      cdf(x: number, mean: number, sd: number): number;
    };
  };
}
