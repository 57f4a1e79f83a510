import { describe, expect, it } from "vitest";
import { plotView } from "@/lib/charts/plot-series";
import { reportView } from "@/lib/notebook/report-view";
import { trapezoidTotals_mAh } from "../support/bench-logs";
import { analysedCapacityCheck } from "../charts/support/analysed-log";

describe("reportView", () => {
  it("reads a stored engine report whose totals agree with an independent trapezoid count", async () => {
    const { csv, report } = await analysedCapacityCheck(4);
    const view = reportView(report);
    expect(view).not.toBeNull();
    // Trapezoidal rule over the same CSV (tests/support/bench-logs.ts), to 0.5 %.
    const ref = trapezoidTotals_mAh(csv);
    expect(view?.totals.charged_mAh ?? 0).toBeGreaterThan(ref.charged * 0.995);
    expect(view?.totals.charged_mAh ?? 0).toBeLessThan(ref.charged * 1.005);
    expect(view?.cycles[0]?.charge?.cv?.final_current_label).toMatch(/^C\/\d+$/);
    expect(view?.steps.length).toBeGreaterThanOrEqual(4);
  });

  it("turns missing numbers into null and refuses an unknown step kind", () => {
    const base = { totals: {}, steps: [{ step: 1, kind: "rest", start_s: 0, end_s: null }], cycles: [{ cycle: 1, charge: null }] };
    const view = reportView(base);
    expect(view?.totals.charged_mAh).toBeNull();
    expect(view?.steps[0]?.end_s).toBeNull();
    expect(view?.dcir).toEqual([]);
    expect(view?.limits_used.ratedCapacity_mAh).toBeNull();
    expect(reportView({ ...base, steps: [{ step: 1, kind: "trickle" }] })).toBeNull();
    expect(reportView("not a report")).toBeNull();
  });
});

describe("plotView", () => {
  it("reads every trace of a stored series; a log without temperature has none", async () => {
    const { series } = await analysedCapacityCheck(5);
    const view = plotView(series);
    expect(view.voltage?.x.length).toBe(view.voltage?.y.length);
    expect(view.stepEdges.length).toBeGreaterThan(0);
    expect(view.switchPoints).toHaveLength(1);
    const withoutTemperature = plotView({ ...series, temperature: undefined });
    expect(withoutTemperature.temperature).toBeNull();
    expect(plotView({ voltage: "garbage", step_edges: [{ time_s: "x" }] })).toMatchObject({ voltage: null, stepEdges: [] });
  });
});
