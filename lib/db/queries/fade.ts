import "server-only";
import { cellFade, type CellFade } from "@/lib/health/fade";
import { cellMeasurements, resistanceRise, type CellMeasurements, type DangerFinding } from "@/lib/health/measurements";
import { loadCellRuns } from "./cell-measurements";
import { flagsOf, getLabSettings, type FlagListItem } from "./flags";
import { getCellBySerial, getCellType, type CellListItem } from "./registry";

export interface CellHealth {
  cell: CellListItem;
  ratedCapacityMah: number;
  eolThresholdPct: number;
  measurements: CellMeasurements;
  /** Null without capacity points. */
  fade: CellFade | null;
  resistanceRise: ReturnType<typeof resistanceRise>;
  dangers: DangerFinding[];
  flags: FlagListItem[];
}

/** Everything the cell health page shows: capacity per cycle, fade and its projection, knee, resistance, flags. */
export async function getCellHealth(serial: string): Promise<CellHealth | null> {
  const found = await getCellBySerial(serial);
  if (!found) return null;
  const [type, settings, runs, flags] = await Promise.all([getCellType(found.cellTypeId), getLabSettings(), loadCellRuns([found.id]), flagsOf({ cellId: found.id })]);
  const entry = runs.get(found.id);
  const measurements = cellMeasurements(entry?.runs ?? []);
  const rated = type?.ratedCapacityMah ?? NaN;
  return {
    cell: found,
    ratedCapacityMah: rated,
    eolThresholdPct: settings.eolThresholdPct,
    measurements,
    fade: cellFade(measurements.capacity, rated, settings.eolThresholdPct),
    resistanceRise: resistanceRise(measurements.resistance),
    dangers: entry?.dangers ?? [],
    flags,
  };
}
