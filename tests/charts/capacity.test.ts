import { describe, expect, it } from "vitest";
import { capacityByCycle, capacityByCycleOfRuns, capacityByDate, deliveredCapacity, sohPercent, type CycleCapacity } from "@/lib/charts/capacity";

const cycle = (n: number, chargedMah: number | null, dischargedMah: number | null, ce: number | null = null): CycleCapacity => ({ cycle: n, chargedMah, dischargedMah, coulombicEfficiency: ce });

describe("deliveredCapacity", () => {
  it("takes the last full cycle, not a first discharge from an unknown state of charge", () => {
    // The demo capacity check's shape: a discharge to empty, then a full charge and discharge.
    const cycles = [cycle(2, 1093.31, 1093.41, 1.0001), cycle(1, null, 442.9)];
    expect(deliveredCapacity(cycles)).toEqual({ cycle: 2, mAh: 1093.41, coulombicEfficiency: 1.0001, afterCharge: true });
    // Of several full cycles the last is the cell's present capacity.
    expect(deliveredCapacity([...cycles, cycle(3, 1085, 1080.5, 0.9959)])?.mAh).toBe(1080.5);
  });

  it("falls back to the last discharge, marked, when no cycle had a charge", () => {
    expect(deliveredCapacity([cycle(1, null, 980), cycle(2, 0, 975)])).toEqual({ cycle: 2, mAh: 975, coulombicEfficiency: null, afterCharge: false });
    expect(deliveredCapacity([cycle(1, 500, null)])).toBeNull();
    expect(deliveredCapacity([])).toBeNull();
  });
});

describe("sohPercent", () => {
  it("is delivered over rated capacity, in percent", () => {
    // SOH = Q_delivered / Q_rated (capacity definition, common practice): 800 of 1000 mAh is 80 %,
    // the usual end-of-life line (Diao et al., Energies 12 (2019) 2910, §1).
    expect(sohPercent(800, 1000)).toBe(80);
    expect(sohPercent(1093.41, 1000)).toBeCloseTo(109.341, 9);
    expect(sohPercent(800, 0)).toBeNull();
    expect(sohPercent(null, 1000)).toBeNull();
  });
});

describe("capacity series", () => {
  it("plots full cycles only, in cycle order", () => {
    expect(capacityByCycle([cycle(3, 990, 985), cycle(1, null, 400), cycle(2, 1000, 995)])).toEqual({ x: [2, 3], y: [995, 985] });
  });

  it("aligns several runs on the cycle number", () => {
    const o = capacityByCycleOfRuns([
      { label: "A", cycles: [cycle(1, 1000, 990), cycle(2, 1000, 985)] },
      { label: "B", cycles: [cycle(2, 1000, 970), cycle(3, 1000, 960)] },
    ]);
    expect(o).toEqual({ x: [1, 2, 3], ys: [[990, 985, null], [null, 970, 960]], labels: ["A", "B"] });
  });

  it("puts runs on a time axis in UNIX seconds, oldest first, without runs that have no capacity", () => {
    const x1 = Date.UTC(2026, 10, 20, 8, 15) / 1000;
    const x2 = Date.UTC(2026, 11, 1, 9, 0) / 1000;
    expect(
      capacityByDate([
        { at: "2026-12-01T09:00:00Z", deliveredMah: 1080 },
        { at: new Date("2026-11-20T08:15:00Z"), deliveredMah: 1093.4 },
        { at: "2026-11-25T00:00:00Z", deliveredMah: null },
      ]),
    ).toEqual({ x: [x1, x2], y: [1093.4, 1080] });
  });
});
