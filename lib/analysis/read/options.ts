import type { Detection, Finding } from "../types";
import type { ColumnMapInput } from "./plan";

export type ParserChoice = "auto" | "fast" | "papaparse";

export interface ReadOptions {
  fileName?: string;
  /** Overrides detection field by field. A ColumnMap, or its JSON form with defaults left out. */
  columnMap?: ColumnMapInput;
  /** Rows per batch, default 65536. */
  batchSize?: number;
  /**
   * Which parsing path runs. "auto" (default) takes the fast path unless the
   * data rows quote a delimiter or a quote, or leave a quote open. The tests
   * force each path in turn.
   */
  parser?: ParserChoice;
}

export interface ReadSummary {
  detection: Detection;
  /** Data-quality findings: logging-gap, duplicate-timestamp, dropped-rows, skipped-rows. */
  findings: Finding[];
  /** Data rows delivered. */
  rows: number;
  bytes: number;
  /** Which parsing path ran. */
  path: "fast" | "papaparse";
}
