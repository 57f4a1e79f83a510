// The statistics library's public surface; each module documents its sources.
export * from "./distributions";
export * from "./line-fit";
export * from "./linear-projection";
export * from "./fade";
export * from "./knee";
export * from "./describe";
export * from "./capability";
export * from "./outliers";
export * from "./histogram";
export * from "./batch";
export * from "./compare";
export * from "./matching";
export { leastSquares, type LeastSquaresFit } from "./least-squares";
