/**
 * The pure parts behind flags: a cell's measurements across runs (cycle axis, capacity points,
 * dates, DC resistance, coulombic efficiency) and each rule's verdict, on constructed inputs whose
 * answers are worked out by hand here.
 */
import jStat from "jstat";
import { mean, sampleStandardDeviation } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { evaluateRule, type CellInput } from "@/lib/flags/rules";
import { cellMeasurements, resistanceRise, type RunCycleInput, type RunInput } from "@/lib/health/measurements";

const t0 = Date.parse("2026-11-01T08:00:00Z");
const full = (cycle: number, discharged: number, ce: number | null = 0.999, endS: number | null = null): RunCycleInput => ({
  cycle,
  chargedMah: discharged / (ce ?? 1),
  dischargedMah: discharged,
  coulombicEfficiency: ce,
  dischargeEndS: endS,
});

function runOf(id: string, purpose: string, day: number, cycles: RunCycleInput[], dcir: RunInput["dcir"] = [], durationS: number | null = null): RunInput {
  return { runId: id, analysisId: `a-${id}`, purpose, endedAt: new Date(t0 + day * 86_400_000), durationS, cycles, dcir };
}

function cellOf(id: string, runs: RunInput[], extra: Partial<CellInput> = {}): CellInput {
  return { id, serial: id.toUpperCase(), status: "active", batchId: "b1", lotCode: "LOT-1", ratedCapacityMah: 1000, measurements: cellMeasurements(runs), dangers: [], ...extra };
}

describe("a cell's measurements across runs", () => {
  it("counts full cycles of every run on one axis and takes capacity points from capacity checks and cycle-life runs", () => {
    const formation = runOf("f", "formation", 0, [full(1, 900, 0.85), full(2, 950, 0.97)]);
    // A capacity check that starts with a discharge from an unknown state: only the discharge after the charge counts.
    const check = runOf("c", "capacity check", 1, [{ cycle: 1, chargedMah: null, dischargedMah: 400, coulombicEfficiency: null, dischargeEndS: 3600 }, full(2, 980, 0.998, 20_000)], [], 21_000);
    const life = runOf("l", "cycle life", 5, [full(1, 975), full(2, 970), full(3, 965)]);
    const m = cellMeasurements([life, check, formation]);
    expect(m.totalCycles).toBe(6);
    expect(m.capacity.map((p) => [p.cycle, p.capacity_mAh, p.runId])).toEqual([
      [3, 980, "c"],
      [4, 975, "l"],
      [5, 970, "l"],
      [6, 965, "l"],
    ]);
    // Upload at t0 + 1 day; the discharge ended 21000 − 20000 = 1000 s before the log did.
    expect(m.capacity[0]?.date).toBe(new Date(t0 + 86_400_000 - 1_000_000).toISOString());
    expect(m.efficiency.map((e) => [e.runId, e.min, e.cycle])).toEqual([
      ["f", 0.85, 1],
      ["c", 0.998, 2],
      ["l", 0.999, 1],
    ]);
  });

  it("takes the median DC resistance per run, IEC two-current results before step edges, and compares like with like", () => {
    const runs = [
      runOf("r1", "internal resistance", 0, [], [{ method: "IEC 61960-3 DC", resistance_mOhm: 40 }, { method: "IEC 61960-3 DC", resistance_mOhm: 44 }, { method: "step-edge", resistance_mOhm: 90 }]),
      runOf("r2", "cycle life", 10, [], [{ method: "step-edge", resistance_mOhm: 60 }, { method: "step-edge", resistance_mOhm: 70 }, { method: "step-edge", resistance_mOhm: 200 }]),
      runOf("r3", "internal resistance", 20, [], [{ method: "IEC 61960-3 DC", resistance_mOhm: 63 }]),
    ];
    const m = cellMeasurements(runs);
    expect(m.resistance.map((r) => [r.runId, r.method, r.median_mOhm, r.n])).toEqual([
      ["r1", "IEC 61960-3 DC", 42, 2],
      ["r2", "step-edge", 70, 3],
      ["r3", "IEC 61960-3 DC", 63, 1],
    ]);
    // (63 / 42 − 1) · 100 = 50 %: the step-edge run in between is not compared with the IEC ones.
    const rise = resistanceRise(m.resistance);
    expect(rise?.first.runId).toBe("r1");
    expect(rise?.risePct).toBeCloseTo(50, 10);
    expect(resistanceRise(m.resistance.slice(0, 2))).toBeNull();
  });
});

describe("flag rules", () => {
  const soh = { id: "r-soh", kind: "soh-below" as const, bound: null };

  it("flags state of health below the end-of-life setting, or below the rule's own bound", () => {
    const worn = cellOf("w", [runOf("c1", "capacity check", 0, [full(1, 950)]), runOf("c2", "capacity check", 30, [full(1, 760)])]);
    const fine = cellOf("f", [runOf("c3", "capacity check", 0, [full(1, 960)])]);
    const [flag, ...rest] = evaluateRule(soh, [worn, fine], 80);
    expect(rest).toEqual([]);
    // 760 / 1000 = 76 % of rated, below the 80 % threshold (Diao et al. 2019 convention).
    expect(flag).toMatchObject({ cellId: "w", evidenceAnalysisId: "a-c2", value: 76, bound: 80, unit: "%" });
    expect(evaluateRule({ ...soh, bound: 75 }, [worn], 80)).toEqual([]);
    expect(evaluateRule(soh, [{ ...worn, status: "retired" }], 80)).toEqual([]);
  });

  it("flags a cell fading faster than the bound, when the slope's interval is wholly above zero", () => {
    const rule = { id: "r-rate", kind: "fade-rate-above" as const, bound: 10 };
    // Q_n = 1000 − 1.5·n plus a small alternating wobble: least squares gives 1.5 mAh per cycle to within the wobble,
    // 150 mAh per 100 cycles = 15 % of the 1000 mAh rating.
    const cycles = Array.from({ length: 20 }, (_, n) => full(n + 1, 1000 - 1.5 * (n + 1) + (n % 2 ? 0.5 : -0.5)));
    const [flag, ...rest] = evaluateRule(rule, [cellOf("fast", [runOf("life", "cycle life", 0, cycles)])], 80);
    expect(rest).toEqual([]);
    expect(flag?.value).toBeCloseTo(15, 0);
    expect(flag).toMatchObject({ cellId: "fast", bound: 10, unit: "% per 100 cycles", evidenceAnalysisId: "a-life" });
    // End of life at 800 mAh: 1000 − 1.5·n = 800 at n ≈ 133.
    expect(flag?.summary).toMatch(/end of life projected at cycle 13[2-4]/);
    const slow = Array.from({ length: 20 }, (_, n) => full(n + 1, 1000 - 0.5 * (n + 1)));
    expect(evaluateRule(rule, [cellOf("slow", [runOf("life2", "cycle life", 0, slow)])], 80)).toEqual([]);
    // Two points give no trend at all; nothing is flagged on them.
    expect(evaluateRule(rule, [cellOf("short", [runOf("life3", "cycle life", 0, cycles.slice(0, 2))])], 80)).toEqual([]);
  });

  it("flags coulombic efficiency below the bound in the latest run, formation runs left out", () => {
    const rule = { id: "r-ce", kind: "ce-below" as const, bound: 98 };
    const formed = cellOf("a", [runOf("l1", "cycle life", 0, [full(1, 950, 0.995), full(2, 948, 0.975)]), runOf("f1", "formation", 3, [full(1, 900, 0.8)])]);
    const [flag] = evaluateRule(rule, [formed], 80);
    expect(flag).toMatchObject({ cellId: "a", evidenceAnalysisId: "a-l1", bound: 98 });
    expect(flag?.value).toBeCloseTo(97.5, 10);
    const healthy = cellOf("b", [runOf("l2", "cycle life", 0, [full(1, 950, 0.995)])]);
    expect(evaluateRule(rule, [healthy], 80)).toEqual([]);
  });

  it("flags a DC resistance rise above the bound", () => {
    const rule = { id: "r-dcir", kind: "dcir-rise" as const, bound: 40 };
    const iec = (id: string, day: number, r: number) => runOf(id, "internal resistance", day, [], [{ method: "IEC 61960-3 DC", resistance_mOhm: r }]);
    const [flag] = evaluateRule(rule, [cellOf("a", [iec("d1", 0, 40), iec("d2", 50, 60)])], 80);
    expect(flag).toMatchObject({ evidenceAnalysisId: "a-d2", value: 50, bound: 40 });
    expect(evaluateRule(rule, [cellOf("b", [iec("d3", 0, 40), iec("d4", 50, 55)])], 80)).toEqual([]);
  });

  it("flags the cell whose fade rate the Grubbs test singles out within its batch, and only a faster one", () => {
    // Capacity falling on a straight line, Q_n = 1000 − k·n over 12 cycles: least squares recovers k exactly,
    // so each cell's fade is 100·k mAh per 100 cycles = 10·k % of the 1000 mAh rating.
    const perCycle = [0.2, 0.21, 0.19, 0.2, 0.22, 0.18, 0.2, 0.9];
    const cells = perCycle.map((k, i) =>
      cellOf(`c${i}`, [runOf(`life${i}`, "cycle life", 0, Array.from({ length: 12 }, (_, n) => full(n + 1, 1000 - k * (n + 1))))]),
    );
    const rule = { id: "r-fade", kind: "fade-outlier" as const, bound: 0.05 };
    const flags = evaluateRule(rule, cells, 80);
    expect(flags.map((f) => f.cellId)).toEqual(["c7"]);
    const rates = perCycle.map((k) => 10 * k);
    const g = (Math.max(...rates) - mean(rates)) / sampleStandardDeviation(rates);
    // Grubbs critical value, e-Handbook §1.3.5.17: ((N − 1)/√N)·√(t²/(N − 2 + t²)), t at α/(2N), N − 2 df (jstat's quantile).
    const n = rates.length;
    const t = jStat.studentt.inv(1 - 0.05 / (2 * n), n - 2);
    const critical = ((n - 1) / Math.sqrt(n)) * Math.sqrt((t * t) / (n - 2 + t * t));
    expect(flags[0]?.value).toBeCloseTo(9, 9);
    expect(flags[0]?.detail.g).toBeCloseTo(g, 9);
    expect(flags[0]?.detail.critical).toBeCloseTo(critical, 9);
    expect(flags[0]?.summary).toContain(`G = ${g.toFixed(2)} > ${critical.toFixed(2)}`);

    // A cell fading much more slowly than the rest is an outlier too, but not a concern: no flag.
    const slow = perCycle.slice(0, 7).concat([0.01]);
    const slowCells = slow.map((k, i) => cellOf(`s${i}`, [runOf(`slow${i}`, "cycle life", 0, Array.from({ length: 12 }, (_, n) => full(n + 1, 1000 - k * (n + 1))))]));
    expect(evaluateRule(rule, slowCells, 80)).toEqual([]);
  });

  it("flags each analysis with a danger finding", () => {
    const rule = { id: "r-safe", kind: "safety-danger" as const, bound: null };
    const finding = (analysisId: string, runId: string) => ({ analysisId, runId, kind: "over-voltage", message: "Voltage reached 4.31 V, above the 4.2 V limit", caution: "Stop using the cell.", timeS: 100, value: 4.31, limitValue: 4.2, unit: "V" });
    const c = cellOf("a", [], { dangers: [finding("a2", "r2"), finding("a2", "r2"), finding("a1", "r1")] });
    const flags = evaluateRule(rule, [c], 80);
    expect(flags.map((f) => [f.evidenceAnalysisId, f.summary])).toEqual([
      ["a2", "Danger: Voltage reached 4.31 V, above the 4.2 V limit (and 1 more)"],
      ["a1", "Danger: Voltage reached 4.31 V, above the 4.2 V limit"],
    ]);
    expect(flags[0]).toMatchObject({ value: 4.31, bound: 4.2, unit: "V" });
  });
});
