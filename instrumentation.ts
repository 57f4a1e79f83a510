/**
 * Runs once when a Next.js server starts (`next start`, `next dev`), before it serves requests:
 * see lib/ingest/server-start.ts. Node-only code is imported inside the runtime check, as the
 * file is compiled for the edge runtime too.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs" || process.env.NEXT_PHASE === "phase-production-build") return;
  const { onServerStart } = await import("@/lib/ingest/server-start");
  onServerStart();
}
