// jstat 1.9.6 ships no type declarations; this types only the members Kneepoint calls.
declare module "jstat" {
  interface JStatContinuous2 {
    cdf(x: number, df: number): number;
    inv(p: number, df: number): number;
  }
  interface JStatCentralF {
    cdf(x: number, df1: number, df2: number): number;
    inv(p: number, df1: number, df2: number): number;
  }
  interface JStatApi {
    studentt: JStatContinuous2;
    centralF: JStatCentralF;
    /** Least squares by QR decomposition: A is rows × columns, b one value per row. */
    lstsq(a: number[][], b: number[]): number[];
  }
  const jStat: JStatApi;
  export default jStat;
}
