import "server-only";
import { auditEventsForExport, type AuditEventView } from "@/lib/db/queries/audit";
import { AppError } from "@/lib/http/errors";
import type { AuditExportQuery } from "@/lib/validations/audit";
import { csvResponse, toCsv, type CsvColumn } from "./csv";
import { maxExportRows } from "./registry-csv";

/** Recorded values as JSON text: exact and machine-readable, where a spreadsheet cell cannot nest. */
const json = (value: unknown): string | null => (value === null || value === undefined ? null : JSON.stringify(value));

const auditColumns: CsvColumn<AuditEventView>[] = [
  { header: "Event number", value: (e) => e.id },
  { header: "Time (UTC, ISO 8601)", value: (e) => new Date(e.at) },
  { header: "Who", value: (e) => e.actorName ?? "system" },
  { header: "User id", value: (e) => e.actorId },
  { header: "Action", value: (e) => e.action },
  { header: "Kind of record", value: (e) => e.entity },
  { header: "Record id", value: (e) => e.entityId },
  { header: "Record", value: (e) => e.entityLabel },
  { header: "Before (JSON)", value: (e) => json(e.before) },
  { header: "After (JSON)", value: (e) => json(e.after) },
];

export async function auditCsv(filters: AuditExportQuery): Promise<Response> {
  const events = await auditEventsForExport(filters, maxExportRows);
  if (!events) throw new AppError("payload-too-large", `These filters select more than ${maxExportRows} events; an export holds at most ${maxExportRows}. Narrow the filters or the dates.`);
  return csvResponse(toCsv(auditColumns, events), `kneepoint-audit-trail-${new Date().toISOString().slice(0, 10)}.csv`);
}
