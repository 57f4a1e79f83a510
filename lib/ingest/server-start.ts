import "server-only";
import { uploadEnvProblems, UploadServiceNotConfigured } from "@/lib/uploads/env";
import { ensureOutboxSender } from "@/lib/mail/sender";
import { recoverRuns } from "./runner";

/**
 * What a starting Next.js server does before serving (called from instrumentation.ts): stop when
 * the upload settings are incomplete, then resume or fail the runs a crash or restart left behind,
 * and start sending the mail outbox (alerts queued while the server was down, the demo's among them).
 */
export function onServerStart(): void {
  const problems = uploadEnvProblems();
  if (problems.length > 0) {
    console.error(new UploadServiceNotConfigured(problems).message);
    process.exit(1);
  }
  recoverRuns().catch((error: unknown) => console.error("Resuming interrupted analyses failed", error));
  ensureOutboxSender();
}
