/** Serials may hold "/", "#" and "+", so a serial in a path is always encoded. */
export const cellHref = (serial: string) => `/cells/${encodeURIComponent(serial)}`;

export const batchHref = (batchId: string) => `/batches/${batchId}`;

export const cellReportHref = (serial: string) => `${cellHref(serial)}/report`;
export const batchReportHref = (batchId: string) => `${batchHref(batchId)}/report`;
/** The audit trail filtered to one cell or lot: its own events and those of its runs and flags. */
export const auditTrailHref = (text: string) => `/audit?q=${encodeURIComponent(text)}`;
