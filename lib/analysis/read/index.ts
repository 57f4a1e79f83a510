/**
 * The log reader: streaming, detection, validation with located errors, and two
 * parsing paths (a byte-level fast path and a papaparse path) that produce
 * identical batches.
 */
export { readLog } from "./read-log";
export { previewLog, type LogPreview } from "./preview";
export type { ReadOptions, ReadSummary, ParserChoice } from "./options";
export type { ColumnMapInput } from "./plan";
export { classifyMode } from "./mode-words";
export { splitHeader, parseUnitToken, type UnitMarker } from "./units";
