/**
 * One DC resistance figure per run for lists and the batch table. The engine reports every
 * measurement it found (lib/analysis/dcir.ts): IEC 61960-3 two-current sequences and step-edge
 * estimates. The IEC method is preferred when the log holds one; several are summarised by their
 * median, which one disturbed pulse cannot drag.
 */
import { median } from "simple-statistics";

export const iecMethod = "IEC 61960-3 DC";

export interface DcirSummary {
  method: string;
  medianMohm: number;
  count: number;
}

export function summariseDcir(results: readonly { method: string; resistance_mOhm: number | null }[]): DcirSummary | null {
  const of = (method: string) =>
    results.filter((r) => r.method === method && r.resistance_mOhm !== null && Number.isFinite(r.resistance_mOhm)).map((r) => r.resistance_mOhm as number);
  for (const method of [iecMethod, "step-edge"]) {
    const values = of(method);
    if (values.length > 0) return { method, medianMohm: median(values), count: values.length };
  }
  return null;
}
