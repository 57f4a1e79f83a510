import { describe, expect, it } from "vitest";
import { matchCells, spreadPct } from "@/lib/stats/matching";

// Constructed cells with a known answer (no external source). Sets of three, capacity within 2 %
// and DCIR within 5 % of the set mean (tolerances are vendor guidance, not a standard).
const CELLS = [
  { serial: "A1", capacity_mAh: 2000, dcir_mOhm: 30.0 },
  { serial: "A2", capacity_mAh: 2010, dcir_mOhm: 30.5 },
  { serial: "A3", capacity_mAh: 2020, dcir_mOhm: 31.0 },
  { serial: "B1", capacity_mAh: 2100, dcir_mOhm: 30.0 },
  { serial: "B2", capacity_mAh: 2105, dcir_mOhm: 40.0 },
  { serial: "B3", capacity_mAh: 2110, dcir_mOhm: 30.6 },
  { serial: "B4", capacity_mAh: 2115, dcir_mOhm: 30.3 },
  { serial: "C1", capacity_mAh: 2300, dcir_mOhm: 29.0 },
  { serial: "C2", capacity_mAh: 2305, dcir_mOhm: 29.4 },
  { serial: "D1", capacity_mAh: 2500 },
];

describe("matched sets", () => {
  const r = matchCells(CELLS, { setSize: 3 });

  it("forms the two sets the greedy rule must find", () => {
    // A1 anchors the window ≤ 2040 mAh: A1–A3, DCIR spread 1/30.5 = 3.3 %. B1 anchors ≤ 2142 mAh:
    // B1, B2, B3, B4; the tightest DCIR run holding B1 is B1 30.0, B4 30.3, B3 30.6 (2.0 %).
    expect(r.sets.map((s) => s.serials)).toEqual([
      ["A1", "A2", "A3"],
      ["B1", "B4", "B3"],
    ]);
    expect(r.sets[0]?.capacitySpread_pct).toBeCloseTo((20 / 2010) * 100, 10);
    expect(r.sets[0]?.dcirSpread_pct).toBeCloseTo((1 / 30.5) * 100, 10);
    expect(r.sets[1]?.meanCapacity_mAh).toBeCloseTo((2100 + 2115 + 2110) / 3, 10);
    expect(r.dcirTolerance_pct).toBe(5);
  });

  it("leaves the rest over, each with its reason", () => {
    const reasons = Object.fromEntries(r.leftOver.map((l) => [l.serial, l.reason]));
    expect(Object.keys(reasons).sort()).toEqual(["B2", "C1", "C2", "D1"]);
    expect(reasons.D1).toMatch(/no DCIR/);
    expect(reasons.B2).toMatch(/within 2 % capacity/);
    expect(reasons.C1).toMatch(/only 2 cell\(s\) left/);
  });

  it("keeps every set within both tolerances", () => {
    for (const s of r.sets) {
      expect(s.capacitySpread_pct).toBeLessThanOrEqual(2);
      expect(s.dcirSpread_pct ?? Infinity).toBeLessThanOrEqual(5);
    }
  });

  it("refuses a set whose DCIR spread is over tolerance", () => {
    const wide = [
      { serial: "E1", capacity_mAh: 2000, dcir_mOhm: 30 },
      { serial: "E2", capacity_mAh: 2001, dcir_mOhm: 35 },
      { serial: "E3", capacity_mAh: 2002, dcir_mOhm: 40 },
    ];
    const m = matchCells(wide, { setSize: 3 });
    expect(m.sets).toHaveLength(0);
    // (40 − 30)/35 = 28.6 %.
    expect(m.leftOver[0]?.reason).toMatch(/28\.6 %, over 5 %/);
  });

  it("matches by capacity alone when DCIR is switched off", () => {
    const caps = [2000, 2101, 2001, 2100, 2002, 2102].map((capacity_mAh, i) => ({ serial: `S${i}`, capacity_mAh }));
    const m = matchCells(caps, { setSize: 3, dcirTolerance_pct: null });
    expect(m.sets.map((s) => s.serials)).toEqual([
      ["S0", "S2", "S4"],
      ["S3", "S1", "S5"],
    ]);
    expect(m.dcirTolerance_pct).toBeNull();
    expect(m.sets[0]?.dcirSpread_pct).toBeNull();
  });

  it("accepts a set exactly at the capacity window edge", () => {
    // Window ≤ 2000·1.02 = 2040; spread 40/2020 = 1.98 % ≤ 2 %.
    const edge = [2000, 2020, 2040].map((capacity_mAh, i) => ({ serial: `T${i}`, capacity_mAh }));
    expect(matchCells(edge, { setSize: 3 }).sets).toHaveLength(1);
    expect(spreadPct([2000, 2020, 2040])).toBeCloseTo((40 / 2020) * 100, 12);
  });

  it("rejects bad settings and duplicate serials", () => {
    expect(() => matchCells(CELLS, { setSize: 1 })).toThrow(RangeError);
    expect(() => matchCells([CELLS[0] as (typeof CELLS)[number], CELLS[0] as (typeof CELLS)[number]], { setSize: 2 })).toThrow(/twice/);
  });
});
