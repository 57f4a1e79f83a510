/**
 * Logging gaps and how charge is counted across them (our own rule, stated for users):
 * across a gap (interval > 5 × typical) no charge is counted — we do not invent what the cell
 * did while nothing was logged — unless both ends sit in the same constant-current level
 * (same current within the edge threshold, not a rest, same logged step), where the current
 * is known to have been constant and the gap is integrated at that level. Every gap becomes a
 * "logging-gap" finding (unless the reader already reported it), except long intervals inside a
 * rest where the voltage barely moved, which is how loggers that record on change behave.
 */
import type { Finding } from "./types";

export interface GapRecord {
  start_s: number;
  end_s: number;
  line: number;
  integrated: boolean;
  quietRest: boolean;
}

const maxGapRecords = 1000;

export class GapLog {
  readonly gaps: GapRecord[] = [];
  count = 0;
  uncounted_s = 0;

  add(g: GapRecord): void {
    this.count += 1;
    if (!g.integrated) this.uncounted_s += g.end_s - g.start_s;
    if (this.gaps.length < maxGapRecords) this.gaps.push(g);
  }

  findings(existing: Finding[]): Finding[] {
    const out: Finding[] = [];
    const known = existing.filter((f) => f.kind === "logging-gap");
    for (const g of this.gaps) {
      if (g.quietRest) continue;
      const overlaps = known.some((f) => f.time_s <= g.end_s && (f.end_s ?? f.time_s) >= g.start_s);
      if (overlaps) continue;
      const len = g.end_s - g.start_s;
      out.push({
        kind: "logging-gap",
        severity: g.integrated ? "info" : "warning",
        time_s: g.start_s,
        end_s: g.end_s,
        line: g.line,
        value: len,
        limit: null,
        unit: "s",
        message: g.integrated
          ? `Nothing was logged for ${len.toFixed(1)} s inside a constant-current step; the charge over the gap was counted at that constant current.`
          : `Nothing was logged for ${len.toFixed(1)} s; charge that flowed during the gap is not counted in the totals.`,
        caution: "",
      });
    }
    return out;
  }
}
