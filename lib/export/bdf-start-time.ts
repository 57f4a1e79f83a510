import { previewLog, type ColumnMapInput } from "@/lib/analysis/read";
import { parseTimestampText } from "@/lib/analysis/read/text-values";

// Only a timestamp that names its zone (Z or ±hh[:mm]) fixes an instant; a bare civil time could
// be any zone, so it yields no Unix time rather than a guessed one.
const explicitZone = /(?:Z|[+-]\d{2}(?::?\d{2})?)$/i;

/**
 * Seconds since 1970-01-01 UTC of a log's first data row, read from the head of the file, or null
 * when the log keeps elapsed time only or its timestamps carry no zone.
 */
export function logStartUnixS(head: Uint8Array, columnMap?: ColumnMapInput): number | null {
  const preview = previewLog(head, { columnMap, maxRows: 1 });
  const detection = preview.detection;
  if (!detection || detection.timeFormat !== "timestamp") return null;
  const index = detection.columns.time?.index;
  const text = index === undefined ? undefined : preview.rows[0]?.[index]?.trim();
  if (!text || !explicitZone.test(text)) return null;
  const parts = parseTimestampText(text);
  return parts === null ? null : parts.whole + parts.frac;
}
