import { describe, expect, it } from "vitest";
import { plotView } from "@/lib/charts/plot-series";
import { legendKinds, stepBands, stepGroup } from "@/lib/charts/step-bands";
import { reportView } from "@/lib/notebook/report-view";
import { analysedCapacityCheck } from "./support/analysed-log";

describe("stepBands", () => {
  it("spans each step from its edge to the next edge, the last to the end of the log", () => {
    const bands = stepBands(
      [
        { time_s: 9605, step: 3, kind: "constant-current charge" },
        { time_s: 0, step: 1, kind: "constant-current discharge" },
        { time_s: 7805, step: 2, kind: "rest" },
      ],
      12000,
    );
    expect(bands).toEqual([
      { step: 1, kind: "constant-current discharge", group: "discharge", from: 0, to: 7805 },
      { step: 2, kind: "rest", group: "rest", from: 7805, to: 9605 },
      { step: 3, kind: "constant-current charge", group: "charge", from: 9605, to: 12000 },
    ]);
  });

  it("matches the engine's own step start, end and duration for a simulated capacity check", async () => {
    const { report, series } = await analysedCapacityCheck(3);
    const view = reportView(report);
    const plot = plotView(series);
    if (!view) throw new Error("report not read");
    const end = view.totals.duration_s ?? 0;
    const bands = stepBands(plot.stepEdges, end);
    // The engine's steps are contiguous: each ends where the next begins (lib/analysis/steps.ts).
    expect(bands.map((b) => [b.step, b.kind, b.from, b.to])).toEqual(view.steps.map((s) => [s.step, s.kind, s.start_s, s.end_s]));
    const widths = bands.map((b) => b.to - b.from);
    view.steps.forEach((s, i) => expect(widths[i]).toBeCloseTo(s.duration_s ?? Number.NaN, 6));
  });

  it("drops bands of no width and edges past the end", () => {
    const bands = stepBands(
      [
        { time_s: 0, step: 1, kind: "rest" },
        { time_s: 0, step: 2, kind: "constant-current charge" },
        { time_s: 50, step: 3, kind: "rest" },
      ],
      40,
    );
    expect(bands).toEqual([{ step: 2, kind: "constant-current charge", group: "charge", from: 0, to: 40 }]);
  });

  it("groups kinds by colour and lists the kinds present in reading order", () => {
    expect(stepGroup("constant-voltage charge")).toBe("charge");
    expect(stepGroup("other")).toBe("other");
    const bands = stepBands(
      [
        { time_s: 0, step: 1, kind: "constant-current discharge" },
        { time_s: 10, step: 2, kind: "rest" },
        { time_s: 20, step: 3, kind: "constant-current charge" },
      ],
      30,
    );
    expect(legendKinds(bands)).toEqual(["constant-current charge", "rest", "constant-current discharge"]);
  });
});
