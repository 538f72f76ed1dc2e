// Minimal typing for the parts of jstat the tests use as an independent cross-check.
declare module 'jstat' {
  interface StudentT {
    inv(p: number, dof: number): number;
    cdf(x: number, dof: number): number;
  }
  interface CentralF {
    cdf(x: number, dof1: number, dof2: number): number;
  }
  export const jStat: { studentt: StudentT; centralF: CentralF };
  const jStatDefault: { jStat: { studentt: StudentT; centralF: CentralF } } & {
    studentt: StudentT;
    centralF: CentralF;
  };
  export default jStatDefault;
}
