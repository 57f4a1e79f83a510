// Worker-thread bootstrap: load the TypeScript entry named in workerData through tsx's loader,
// scoped to this import, so the same source runs under `next start`, `next dev` and vitest.
import { workerData } from "node:worker_threads";
import { tsImport } from "tsx/esm/api";

await tsImport(workerData.entry, import.meta.url);
