/** Serials may hold "/", "#" and "+", so a serial in a path is always encoded. */
export const cellHref = (serial: string) => `/cells/${encodeURIComponent(serial)}`;

export const batchHref = (batchId: string) => `/batches/${batchId}`;
