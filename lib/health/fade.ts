/**
 * A cell's fade from its capacity points: lib/stats' analyzeFade (least-squares fade per 100
 * cycles, SOH, end-of-life projection) and detectKnee (Bacon–Watts, Fermín-Cueto et al. 2020).
 */
import { analyzeFade, detectKnee, type FadeAnalysis, type KneeResult } from "@/lib/stats";
import type { CellCapacityPoint } from "./measurements";

export interface CellFade {
  fade: FadeAnalysis;
  /** Null with fewer than 10 points (the knee test's minimum). */
  knee: KneeResult | null;
}

/** Null without points or without a usable rated capacity. */
export function cellFade(points: readonly CellCapacityPoint[], ratedCapacityMah: number, eolThresholdPct: number): CellFade | null {
  if (points.length === 0 || !(ratedCapacityMah > 0)) return null;
  const fade = analyzeFade(
    points.map((p) => ({ cycle: p.cycle, date: p.date, capacity_mAh: p.capacity_mAh })),
    { ratedCapacity_mAh: ratedCapacityMah, eolThreshold: eolThresholdPct / 100 },
  );
  const knee = detectKnee(points.map((p) => ({ x: p.cycle, y: p.capacity_mAh })));
  return { fade, knee };
}

/** Capacity lost per 100 cycles as % of rated, or null when the trend is not available. */
export function fadeRatePct(f: CellFade | null): number | null {
  return f && f.fade.byCycle.ok ? f.fade.byCycle.lossPer100Cycles_pctRated.value : null;
}
