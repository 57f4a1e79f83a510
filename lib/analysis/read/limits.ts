/** Bounds that keep the reader's memory flat and its messages useful. */

/** The head (read before anything else) is at least this long, for detection. */
export const headMinBytes = 64 * 1024;
/** ...and holds at least this many lines, unless it reaches headMaxBytes first. */
export const headMinLines = 40;
export const headMaxBytes = 1024 * 1024;

/** A line longer than this is not a log line (and would make the carry buffer unbounded). */
export const maxLineBytes = 64 * 1024;
export const maxColumns = 1000;

export const defaultBatchSize = 65_536;

/** Rows held back at the start for the plausibility check and the typical logging interval. */
export const probeRows = 4096;
/** Rows held back at most while the current sign is decided from the voltage response. */
export const signMaxRows = 1 << 17;

/** An interval this many times the surrounding intervals is a logging gap. */
export const gapFactor = 10;
/** Gap findings listed one by one before the rest are summarised. */
export const maxListedGaps = 20;
/** Line numbers named in a non-numeric message per column. */
export const listedBadLines = 3;
