import { analyzeLog, type CellLimits } from "@/lib/analysis";
import { capacityCheckCsv } from "../../support/bench-logs";

/** A 1000 mAh polymer pouch with the trade's usual limits (common practice, no source). */
export const pouchLimits: CellLimits = { ratedCapacity_mAh: 1000, nominalVoltage_V: 3.7, chargeVoltageLimit_V: 4.2, dischargeCutoff_V: 3.0, terminationC: 0.05 };

async function* bytes(text: string): AsyncIterable<Uint8Array> {
  yield new TextEncoder().encode(text);
}

/**
 * The simulator's capacity check (CC-CV charge, rest, discharge, rest) through the real engine,
 * then through JSON as the database stores it: the same report and series the pages read.
 */
export async function analysedCapacityCheck(seed = 1): Promise<{ csv: string; report: Record<string, unknown>; series: Record<string, unknown> }> {
  const csv = capacityCheckCsv(seed);
  const out = await analyzeLog(bytes(csv), { limits: pouchLimits });
  return { csv, report: JSON.parse(JSON.stringify(out.report)) as Record<string, unknown>, series: JSON.parse(JSON.stringify(out.series)) as Record<string, unknown> };
}
