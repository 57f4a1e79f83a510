import jStat from "jstat";
import { linearRegression, rSquared } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { leastSquares } from "@/lib/stats/least-squares";
import { fitLine, inverseAtLevel, slopeInterval } from "@/lib/stats/line-fit";
import { tUpperCritical } from "@/lib/stats/distributions";

// R's built-in `cars` data set (Ezekiel 1930: speed in mph, stopping distance in ft), 50 rows.
const SPEED = [4, 4, 7, 7, 8, 9, 10, 10, 10, 11, 11, 12, 12, 12, 12, 13, 13, 13, 13, 14, 14, 14, 14, 15, 15, 15, 16, 16, 17, 17, 17, 18, 18, 18, 18, 19, 19, 19, 20, 20, 20, 20, 20, 22, 23, 24, 24, 24, 24, 25];
const DIST = [2, 10, 4, 22, 16, 10, 18, 26, 34, 17, 28, 14, 20, 24, 28, 26, 34, 34, 46, 26, 36, 60, 80, 20, 26, 54, 32, 40, 32, 40, 50, 42, 56, 76, 84, 36, 46, 68, 32, 48, 52, 56, 64, 66, 54, 70, 92, 93, 120, 85];

describe("straight-line fit", () => {
  it("reproduces R's summary(lm(dist ~ speed, data = cars))", () => {
    // Published R output, widely reproduced: intercept −17.579095 (se 6.7584402), slope 3.932409
    // (se 0.4155128), residual standard error 15.38 on 48 df, multiple R² 0.6511.
    const fit = fitLine(SPEED, DIST);
    expect(fit).not.toBeNull();
    if (!fit) return;
    expect(fit.intercept).toBeCloseTo(-17.579095, 5);
    expect(fit.slope).toBeCloseTo(3.932409, 5);
    expect(fit.interceptSe).toBeCloseTo(6.7584402, 5);
    expect(fit.slopeSe).toBeCloseTo(0.4155128, 6);
    expect(fit.residualSd).toBeCloseTo(15.38, 2);
    expect(fit.df).toBe(48);
    expect(fit.rSquared).toBeCloseTo(0.6511, 4);
  });

  it("agrees with simple-statistics linearRegression and rSquared", () => {
    const fit = fitLine(SPEED, DIST);
    const pairs = SPEED.map((x, i) => [x, DIST[i] as number]);
    const ref = linearRegression(pairs);
    expect(fit?.slope).toBeCloseTo(ref.m, 12);
    expect(fit?.intercept).toBeCloseTo(ref.b, 12);
    expect(fit?.rSquared).toBeCloseTo(rSquared(pairs, (x) => ref.b + ref.m * x), 12);
  });

  it("gives the t-based slope interval b ± t(0.025, n − 2)·se", () => {
    const fit = fitLine(SPEED, DIST);
    if (!fit) throw new Error("no fit");
    const ci = slopeInterval(fit);
    // R's confint(lm(dist ~ speed, cars)) prints 3.096964 to 4.767853 for the slope (published R
    // output, reproduced in many tutorials); the formula with the handbook-checked t quantile must agree.
    expect(ci.low).toBeCloseTo(3.096964, 5);
    expect(ci.high).toBeCloseTo(4.767853, 5);
    expect((ci.high - ci.low) / 2).toBeCloseTo(tUpperCritical(0.025, 48) * fit.slopeSe, 12);
  });

  it("returns null for fewer than three points or a single x", () => {
    expect(fitLine([1, 2], [3, 4])).toBeNull();
    expect(fitLine([5, 5, 5], [1, 2, 3])).toBeNull();
  });
});

describe("inverse estimation (Fieller)", () => {
  it("is symmetric about x̄ at the mean response, with the closed-form half-width", () => {
    const fit = fitLine(SPEED, DIST);
    if (!fit) throw new Error("no fit");
    const inv = inverseAtLevel(fit, fit.yMean);
    // At level ȳ the band equation b²u² = t²s²(1/n + u²/Sxx) gives u = t·s/√(n·(b² − t²s²/Sxx)).
    const t = tUpperCritical(0.025, fit.df);
    const half = (t * fit.residualSd) / Math.sqrt(fit.n * (fit.slope ** 2 - (t * fit.residualSd) ** 2 / fit.sxx));
    expect(inv?.x).toBeCloseTo(fit.xMean, 10);
    expect(inv?.interval?.low).toBeCloseTo(fit.xMean - half, 10);
    expect(inv?.interval?.high).toBeCloseTo(fit.xMean + half, 10);
  });

  it("puts each end of the interval on the confidence band", () => {
    const fit = fitLine(SPEED, DIST);
    if (!fit) throw new Error("no fit");
    const level = 100;
    const inv = inverseAtLevel(fit, level);
    const t = tUpperCritical(0.025, fit.df);
    for (const x of [inv?.interval?.low, inv?.interval?.high]) {
      if (x === undefined) throw new Error("no interval");
      const gap = Math.abs(fit.intercept + fit.slope * x - level);
      const band = t * fit.residualSd * Math.sqrt(1 / fit.n + (x - fit.xMean) ** 2 / fit.sxx);
      expect(gap).toBeCloseTo(band, 8);
    }
    expect(inv?.interval?.low).toBeLessThan(inv?.x as number);
    expect(inv?.interval?.high).toBeGreaterThan(inv?.x as number);
  });

  it("has no bounded interval when the slope's interval includes zero", () => {
    // Slope 0.1 against pattern noise of ±5: se(b) far above b.
    const xs = [0, 1, 2, 3, 4, 5, 6, 7];
    const ys = xs.map((x, i) => 10 + 0.1 * x + 5 * ([1, -1, -1, 1][i % 4] as number));
    const fit = fitLine(xs, ys);
    if (!fit) throw new Error("no fit");
    const ci = slopeInterval(fit);
    expect(ci.low).toBeLessThan(0);
    expect(inverseAtLevel(fit, 5)?.interval).toBeNull();
  });
});

describe("small least-squares solver", () => {
  it("agrees with jstat's QR least squares", () => {
    const columns = [SPEED.map(() => 1), SPEED.map((x) => x / 25), SPEED.map((x) => Math.abs(x / 25 - 0.6))];
    const ours = leastSquares(columns, DIST);
    const rows = SPEED.map((_, i) => columns.map((c) => c[i] as number));
    const ref = jStat.lstsq(rows, DIST);
    expect(ours).not.toBeNull();
    ref.forEach((v, j) => expect(ours?.coefficients[j]).toBeCloseTo(v, 8));
  });

  it("reports dependent columns as unsolvable", () => {
    const x = [1, 2, 3, 4];
    expect(leastSquares([x, x.map((v) => 2 * v)], [1, 2, 3, 4])).toBeNull();
  });
});
