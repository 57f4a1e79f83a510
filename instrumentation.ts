/**
 * Runs once when a Next.js server starts (`next start`, `next dev`), before it serves requests:
 * the upload settings are checked (a missing service URL would silently target the hosted
 * service, so the server stops instead), and runs a crash or restart left unfinished are
 * resumed or failed.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs" || process.env.NEXT_PHASE === "phase-production-build") return;
  const { uploadEnvProblems, UploadServiceNotConfigured } = await import("@/lib/uploads/env");
  const problems = uploadEnvProblems();
  if (problems.length > 0) {
    console.error(new UploadServiceNotConfigured(problems).message);
    process.exit(1);
  }
  const { recoverRuns } = await import("@/lib/ingest/runner");
  recoverRuns().catch((error: unknown) => console.error("Resuming interrupted analyses failed", error));
}
