// jstat ships no types; declare only the parts analysis/ uses (all checked against @stdlib in tests).
declare module 'jstat' {
  interface JStat {
    normal: {
      inv(p: number, mean: number, sd: number): number;
      cdf(x: number, mean: number, sd: number): number;
    };
    beta: { inv(p: number, alpha: number, beta: number): number };
    chisquare: { inv(p: number, dof: number): number };
  }
  const jStat: JStat;
  export default jStat;
}
