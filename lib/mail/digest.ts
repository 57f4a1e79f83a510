import "server-only";
import { getDb, type Executor } from "@/lib/db/client";
import { claimDigestDay, flagStepsSince, getLabSettings, unclosedFlagsForDigest } from "@/lib/db/queries/flags";
import { activeEngineers, enqueueMessages } from "@/lib/db/queries/outbox";
import { kindTitle } from "@/lib/flags/vocabulary";
import { cellHref } from "@/lib/registry/links";
import { flagHref } from "@/lib/flags/links";

/** The server clock's calendar date, YYYY-MM-DD: the digest goes out once per local day. */
export function localDate(now: Date): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

const DAY_MS = 86_400_000;

/**
 * The daily digest: how many flags opened and closed in the last 24 hours, and every flag not yet
 * closed, open ones first. Null when there is nothing to tell (no unclosed flag and no step).
 */
export async function buildDailyDigest(exec: Executor, now: Date, baseUrl: string): Promise<{ subject: string; text: string } | null> {
  const base = baseUrl.replace(/\/+$/, "");
  const [unclosed, steps] = await Promise.all([unclosedFlagsForDigest(exec), flagStepsSince(exec, new Date(now.getTime() - DAY_MS))]);
  if (unclosed.length === 0 && steps.opened === 0 && steps.closed === 0) return null;
  const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? "" : "s"}`;
  const lines = [
    `Kneepoint daily digest for ${localDate(now)}`,
    "",
    `In the last 24 hours: ${plural(steps.opened, "flag")} opened, ${steps.closed} closed.`,
    unclosed.length ? `Flags not yet closed: ${unclosed.length}` : "No flag is waiting.",
  ];
  for (const f of unclosed) {
    const where = f.lotCode ? `${f.serial} (batch ${f.lotCode})` : f.serial;
    lines.push(
      "",
      `[${f.state}] ${where}: ${kindTitle(f.kind)}, since ${f.createdAt.toISOString().slice(0, 10)}`,
      `  ${f.summary}`,
      `  Flag: ${base}${flagHref(f.id)}   Cell: ${base}${cellHref(f.serial)}`,
    );
  }
  lines.push("", "The digest is a lab setting on the flag rules page.");
  return { subject: `Kneepoint digest ${localDate(now)}: ${plural(unclosed.length, "flag")} not yet closed`, text: lines.join("\n") };
}

/** Whether today's digest is due by the settings: enabled, past the hour, not sent today. */
export async function digestDue(now: Date): Promise<boolean> {
  const settings = await getLabSettings();
  return settings.digestEnabled && now.getHours() >= settings.digestHour && settings.lastDigestOn !== localDate(now);
}

/** Claims today's digest and queues it to every active engineer, in one transaction. Returns the messages queued. */
export async function queueDailyDigest(now: Date, baseUrl: string): Promise<number> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    if (!(await claimDigestDay(tx, localDate(now)))) return 0;
    const digest = await buildDailyDigest(tx, now, baseUrl);
    if (!digest) return 0;
    const engineers = await activeEngineers(tx);
    return enqueueMessages(
      tx,
      engineers.map((e) => ({ kind: "daily digest", toAddress: e.email, subject: digest.subject, textBody: digest.text })),
    );
  });
}
