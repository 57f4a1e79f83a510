import "server-only";
import type { BatchCellRow } from "@/lib/notebook/batch-rows";
import { csvResponse, toCsv, type CsvColumn } from "./csv";

const columns: CsvColumn<BatchCellRow>[] = [
  { header: "Serial", value: (r) => r.serial },
  { header: "Status", value: (r) => r.status },
  { header: "Runs (count)", value: (r) => r.runs },
  { header: "Last tested at (UTC, ISO 8601)", value: (r) => (r.lastTestedAt ? new Date(r.lastTestedAt) : null) },
  { header: "Delivered capacity (mAh)", value: (r) => r.deliveredMah },
  { header: "SOH against rated capacity (%)", value: (r) => r.sohPercent },
  { header: "DC resistance (mOhm)", value: (r) => r.dcirMohm },
  { header: "DC resistance method", value: (r) => r.dcirMethod },
  { header: "Coulombic efficiency (%)", value: (r) => (r.coulombicEfficiency === null ? null : r.coulombicEfficiency * 100) },
  { header: "Findings in the latest run (count)", value: (r) => r.findings },
  { header: "Safety findings in the latest run (count)", value: (r) => r.safetyFindings },
  { header: "Open flags (count)", value: (r) => r.openFlags },
];

export function batchCellsCsv(lotCode: string, rows: readonly BatchCellRow[]): Response {
  return csvResponse(toCsv(columns, rows), `kneepoint-batch-${lotCode}-cells-${new Date().toISOString().slice(0, 10)}.csv`);
}
