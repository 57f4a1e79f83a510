import { describe, expect, it } from "vitest";
import { axisLabel, quantities, readout, timeScaleFor, toTimeUnit } from "@/lib/charts/units";

describe("chart units", () => {
  it("gives every quantity a unit and every axis label carries it", () => {
    for (const q of Object.values(quantities)) {
      expect(q.unit.length).toBeGreaterThan(0);
      expect(axisLabel(q)).toBe(`${q.label} (${q.unit})`);
    }
    expect(axisLabel(quantities.voltage)).toBe("Voltage (V)");
    expect(axisLabel(quantities.incrementalCapacity)).toBe("dQ/dV (mAh/V)");
  });

  it("writes read-outs with their unit, counts without", () => {
    expect(readout(4.2, quantities.voltage)).toBe("4.200\u00a0V");
    expect(readout(-0.5, quantities.current)).toBe("\u22120.500\u00a0A");
    expect(readout(12, quantities.count)).toBe("12");
  });

  it("chooses seconds, minutes or hours by the length of the run", () => {
    expect(timeScaleFor(90).unit).toBe("s");
    expect(timeScaleFor(3600).unit).toBe("min");
    expect(timeScaleFor(7200).unit).toBe("min");
    expect(timeScaleFor(7201).unit).toBe("h");
    expect(timeScaleFor(Number.NaN).unit).toBe("s");
  });

  it("converts seconds to the chosen unit", () => {
    // 1 h = 3600 s, 1 min = 60 s (SI Brochure, 9th ed., Table 8).
    const hours = timeScaleFor(39170.1);
    expect(hours.quantity.unit).toBe("h");
    expect(toTimeUnit([0, 1800, 39170.1], hours)).toEqual([0, 0.5, 39170.1 / 3600]);
    expect(toTimeUnit([90, 600], timeScaleFor(3000))).toEqual([1.5, 10]);
  });
});
