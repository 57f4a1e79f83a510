import { batchHref, cellHref } from "@/lib/registry/links";

export const flagHref = (flagId: string) => `/flags/${flagId}`;
export const cellHealthHref = (serial: string) => `${cellHref(serial)}/health`;
export const batchQualityHref = (batchId: string) => `${batchHref(batchId)}/quality`;
export const batchCompareHref = (batchIds: readonly string[]) => `/batches/compare?${batchIds.map((id) => `batch=${encodeURIComponent(id)}`).join("&")}`;
export const runHref = (runId: string) => `/runs/${runId}`;
