import { describe, expect, it } from "vitest";
import { chargeCurve, curveCycles, dischargeCurve, icaCurvesOfCycle, overlay } from "@/lib/charts/curves";
import { plotView, type CapacityCurve } from "@/lib/charts/plot-series";
import { reportView } from "@/lib/notebook/report-view";
import { analysedCapacityCheck } from "./support/analysed-log";

const curve = (step: number, cycle: number, kind: CapacityCurve["kind"], q: number[], v: number[]): CapacityCurve => ({ step, cycle, kind, capacity_mAh: q, voltage_V: v });

describe("chargeCurve", () => {
  it("joins the CC and CV steps of a cycle end to end and marks the switch", () => {
    // Analytic: a constant 0.5 A for 7200 s is 0.5 · 7200 / 3.6 = 1000 mAh (domain notes: mAh = A·s / 3.6).
    const cc = (0.5 * 7200) / 3.6;
    const joined = chargeCurve(
      [
        curve(4, 1, "constant-voltage charge", [0, 30, 60], [4.2, 4.2, 4.2]),
        curve(3, 1, "constant-current charge", [0, 500, cc], [3.6, 3.9, 4.2]),
        curve(6, 2, "constant-current charge", [0, 10], [3.5, 3.6]),
      ],
      1,
    );
    expect(joined?.capacity_mAh).toEqual([0, 500, 1000, 1000, 1030, 1060]);
    expect(joined?.voltage_V).toEqual([3.6, 3.9, 4.2, 4.2, 4.2, 4.2]);
    expect(joined?.switchAt).toEqual({ capacity_mAh: 1000, voltage_V: 4.2 });
    expect(chargeCurve([], 1)).toBeNull();
  });

  it("ends at the engine's charge capacity and switches at its CC→CV point on a simulated log", async () => {
    const { report, series } = await analysedCapacityCheck(2);
    const plot = plotView(series);
    const cycle = reportView(report)?.cycles[0];
    if (!cycle?.charge) throw new Error("no charge in the simulated cycle");
    const joined = chargeCurve(plot.capacityCurves, cycle.cycle);
    // Capacities of consecutive steps add up (charge is conserved): the joined curve ends at the cycle's charge.
    expect(joined?.capacity_mAh.at(-1)).toBeCloseTo(cycle.charge.mAh ?? Number.NaN, 6);
    expect(joined?.switchAt?.capacity_mAh).toBeCloseTo(cycle.charge.transition?.capacity_mAh ?? Number.NaN, 6);
    // The simulator charges to 4.2 V (tests/support/bench-logs.ts), within the engine's noise.
    expect(joined?.switchAt?.voltage_V).toBeCloseTo(4.2, 2);
  });
});

describe("dischargeCurve", () => {
  const curves = [
    curve(2, 1, "constant-current discharge", [0, 400], [3.8, 3.0]),
    curve(5, 2, "constant-current discharge", [0, 5], [4.1, 4.0]),
    curve(7, 2, "constant-current discharge", [0, 500, 1050], [4.1, 3.7, 3.0]),
    curve(4, 2, "constant-current charge", [0, 1100], [3.0, 4.2]),
  ];

  it("takes the cycle's discharge step that delivered most", () => {
    expect(dischargeCurve(curves, 2)).toEqual({ capacity_mAh: [0, 500, 1050], voltage_V: [4.1, 3.7, 3.0], cycle: 2 });
    expect(dischargeCurve(curves, 1)?.capacity_mAh).toEqual([0, 400]);
  });

  it("takes the last cycle with a discharge when no cycle is named, and null when there is none", () => {
    expect(dischargeCurve(curves, null)?.cycle).toBe(2);
    expect(dischargeCurve(curves, 3)).toBeNull();
    expect(curveCycles(curves)).toEqual([1, 2]);
  });
});

describe("overlay and dQ/dV", () => {
  it("aligns several curves on one capacity axis and keeps their labels", () => {
    const o = overlay([
      { label: "run A", x: [0, 500, 1000], y: [4.1, 3.7, 3.0] },
      { label: "run B", x: [0, 450, 900], y: [4.1, 3.6, 3.0] },
    ]);
    expect(o.labels).toEqual(["run A", "run B"]);
    expect(o.x).toEqual([0, 450, 500, 900, 1000]);
    expect(o.ys[1]).toEqual([4.1, 3.6, null, 3.0, null]);
  });

  it("labels each constant-current dQ/dV curve with its direction, step and C-rate", () => {
    const curves = icaCurvesOfCycle(
      [
        { step: 5, cycle: 1, kind: "constant-current discharge", c_rate: 0.2, voltage_V: [3.6, 3.605], dQdV_mAh_per_V: [900, 950] },
        { step: 1, cycle: 1, kind: "constant-current charge", c_rate: 0.5, voltage_V: [3.7], dQdV_mAh_per_V: [1200] },
        { step: 9, cycle: 2, kind: "constant-current charge", c_rate: null, voltage_V: [3.7], dQdV_mAh_per_V: [1200] },
      ],
      1,
    );
    expect(curves.map((c) => c.label)).toEqual(["Charge, step 1 at 0.50C", "Discharge, step 5 at 0.20C"]);
    expect(curves[1]?.x).toEqual([3.6, 3.605]);
  });
});
