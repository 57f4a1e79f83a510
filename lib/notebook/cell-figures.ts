/**
 * A cell's figures from its runs: the latest delivered capacity (from the newest run with a full
 * cycle), its SOH against rated, the coulombic efficiency of that same cycle, the newest DC
 * resistance, and the findings of its newest analysed run. Runs that only pulse or rest (an
 * internal-resistance test) contribute resistance but never a capacity.
 */
import { deliveredCapacity, sohPercent, type CycleCapacity } from "@/lib/charts/capacity";
import { summariseDcir, iecMethod, type DcirSummary } from "./dcir";

export interface RunFigures {
  runId: string;
  /** When the run's test ended: as stated on upload, else the upload time. "Latest" follows it. */
  endedAt: Date | string;
  /** Null until the run's first analysis is stored. */
  analysed: boolean;
  findingsCount: number | null;
  safetyFindingsCount: number | null;
  dcirIecMohm: number[];
  dcirEdgeMohm: number[];
  cycles: CycleCapacity[];
}

export interface CellFigures {
  runs: number;
  lastTestedAt: string | null;
  delivered: { runId: string; at: string; cycle: number; mAh: number } | null;
  sohPercent: number | null;
  coulombicEfficiency: number | null;
  dcir: (DcirSummary & { runId: string }) | null;
  findings: number | null;
  safetyFindings: number | null;
}

const iso = (d: Date | string) => (typeof d === "string" ? new Date(d) : d).toISOString();

export function dcirOf(run: Pick<RunFigures, "dcirIecMohm" | "dcirEdgeMohm">): DcirSummary | null {
  return summariseDcir([
    ...run.dcirIecMohm.map((r) => ({ method: iecMethod, resistance_mOhm: r })),
    ...run.dcirEdgeMohm.map((r) => ({ method: "step-edge", resistance_mOhm: r })),
  ]);
}

export function cellFigures(runs: readonly RunFigures[], ratedMah: number | null): CellFigures {
  const newestFirst = [...runs].filter((r) => r.analysed).sort((a, b) => iso(b.endedAt).localeCompare(iso(a.endedAt)));
  let delivered: CellFigures["delivered"] = null;
  let ce: number | null = null;
  for (const r of newestFirst) {
    const d = deliveredCapacity(r.cycles);
    if (d?.afterCharge) {
      delivered = { runId: r.runId, at: iso(r.endedAt), cycle: d.cycle, mAh: d.mAh };
      ce = d.coulombicEfficiency;
      break;
    }
  }
  let dcir: CellFigures["dcir"] = null;
  for (const r of newestFirst) {
    const s = dcirOf(r);
    if (s) {
      dcir = { ...s, runId: r.runId };
      break;
    }
  }
  const newest = newestFirst[0];
  return {
    runs: runs.length,
    lastTestedAt: newest ? iso(newest.endedAt) : null,
    delivered,
    sohPercent: sohPercent(delivered?.mAh, ratedMah),
    coulombicEfficiency: ce,
    dcir,
    findings: newest?.findingsCount ?? null,
    safetyFindings: newest?.safetyFindingsCount ?? null,
  };
}
