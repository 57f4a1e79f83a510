import "server-only";
import type { Transporter } from "nodemailer";
import { claimDueMessages, markAttemptFailed, markSent, nextDueAt } from "@/lib/db/queries/outbox";
import { serverEnv } from "@/lib/env";
import { defaultRetryPolicy, nextAttemptAt, type RetryPolicy } from "./backoff";
import { digestDue, queueDailyDigest } from "./digest";
import { transportFromUrl } from "./transport";

export interface SenderOptions {
  /** The mail server; default SMTP_URL from the environment. Without one, mail waits in the outbox. */
  smtpUrl?: string | null;
  from?: string;
  /** Links in mail point here; default BETTER_AUTH_URL. */
  baseUrl?: string;
  now?: () => Date;
  retry?: RetryPolicy;
  /** How long a claimed message is reserved for one send. */
  leaseMs?: number;
  batchSize?: number;
  /** Longest sleep between looks at the outbox (digest schedule, messages from other processes). */
  pollMs?: number;
  /** Whether the sender queues the daily digest when it falls due. */
  digest?: boolean;
}

export interface SendReport {
  sent: number;
  retrying: number;
  failed: number;
  digestQueued: number;
}

function errorText(error: unknown): string {
  const e = error as { message?: unknown; code?: unknown; responseCode?: unknown };
  const parts = [typeof e?.code === "string" ? e.code : null, typeof e?.responseCode === "number" ? String(e.responseCode) : null].filter(Boolean);
  const message = typeof e?.message === "string" ? e.message : String(error);
  return (parts.length ? `${parts.join(" ")}: ${message}` : message).slice(0, 1000);
}

/**
 * Sends the outbox's due messages with retries and exponential backoff, and queues the daily
 * digest when it is due. `runOnce` is one pass (tests drive it with their own clock); `start`
 * runs passes in the background of the server process, waking on `kick` and on a timer.
 */
export class OutboxSender {
  private readonly smtpUrl: string | null;
  private readonly from: string;
  private readonly baseUrl: string;
  private readonly now: () => Date;
  private readonly retry: RetryPolicy;
  private readonly leaseMs: number;
  private readonly batchSize: number;
  private readonly pollMs: number;
  private readonly digest: boolean;
  private transport: Transporter | null = null;
  private running: Promise<SendReport> | null = null;
  private again = false;
  private timer: NodeJS.Timeout | null = null;
  private started = false;
  private warnedNoSmtp = false;

  constructor(options: SenderOptions = {}) {
    const env = serverEnv();
    this.smtpUrl = options.smtpUrl === undefined ? (env.SMTP_URL ?? null) : options.smtpUrl;
    this.from = options.from ?? env.KNEEPOINT_MAIL_FROM;
    this.baseUrl = options.baseUrl ?? env.BETTER_AUTH_URL;
    this.now = options.now ?? (() => new Date());
    this.retry = options.retry ?? defaultRetryPolicy;
    this.leaseMs = options.leaseMs ?? 120_000;
    this.batchSize = options.batchSize ?? 20;
    this.pollMs = options.pollMs ?? 60_000;
    this.digest = options.digest ?? true;
  }

  get configured(): boolean {
    return this.smtpUrl !== null;
  }

  /** One pass: queue the digest if due, then send every message due now. Concurrent calls share one pass. */
  runOnce(): Promise<SendReport> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    this.running = this.pass().finally(() => {
      this.running = null;
    });
    return this.running;
  }

  private async pass(): Promise<SendReport> {
    const report: SendReport = { sent: 0, retrying: 0, failed: 0, digestQueued: 0 };
    if (this.digest && (await digestDue(this.now()))) report.digestQueued = await queueDailyDigest(this.now(), this.baseUrl);
    if (!this.smtpUrl) {
      if (!this.warnedNoSmtp) console.warn("SMTP_URL is not set: alert mail waits in the outbox until a mail server is configured.");
      this.warnedNoSmtp = true;
      return report;
    }
    this.transport ??= transportFromUrl(this.smtpUrl);
    for (;;) {
      const now = this.now();
      const batch = await claimDueMessages(now, new Date(now.getTime() + this.leaseMs), this.batchSize);
      if (batch.length === 0) break;
      for (const message of batch) {
        try {
          await this.transport.sendMail({ from: this.from, to: message.toAddress, subject: message.subject, text: message.textBody, html: message.htmlBody ?? undefined });
          await markSent(message.id, this.now());
          report.sent++;
        } catch (error) {
          const retryAt = nextAttemptAt(this.now(), message.attempts, this.retry);
          await markAttemptFailed(message.id, errorText(error), retryAt);
          if (retryAt) report.retrying++;
          else report.failed++;
        }
      }
    }
    return report;
  }

  /** Runs passes in the background until `stop`. */
  start(): void {
    if (this.started) return;
    this.started = true;
    this.schedule(0);
  }

  /** Asks for a pass soon (after something was queued). */
  kick(): void {
    if (!this.started) this.start();
    else this.schedule(0);
  }

  private schedule(delayMs: number): void {
    if (!this.started) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => void this.tick(), Math.max(0, delayMs));
    // Never keeps a CLI or test process alive on its own.
    this.timer.unref();
  }

  private async tick(): Promise<void> {
    this.timer = null;
    try {
      do {
        this.again = false;
        await this.runOnce();
      } while (this.again && this.started);
      const due = this.smtpUrl ? await nextDueAt() : null;
      const wait = due ? due.getTime() - this.now().getTime() : this.pollMs;
      this.schedule(Math.min(this.pollMs, Math.max(wait, 1_000)));
    } catch (error) {
      console.error("The mail outbox pass failed; trying again later.", error);
      this.schedule(this.pollMs);
    }
  }

  /** Stops the background passes and waits for the one under way. */
  async stop(): Promise<void> {
    this.started = false;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    await this.running?.catch(() => undefined);
    this.transport?.close();
    this.transport = null;
  }

  /** Resolves when no pass is under way. */
  async idle(): Promise<void> {
    while (this.running) await this.running.catch(() => undefined);
  }
}

// Route handlers, actions and pages are separate module instances: one sender per process.
const senderKey = Symbol.for("kneepoint.outbox-sender");
const store = ((globalThis as Record<symbol, unknown>)[senderKey] ??= {}) as { sender?: OutboxSender };

/**
 * The background sender belongs to the web server (Next.js sets NEXT_RUNTIME there). Command-line
 * processes (the demo seed in `npm start`, scripts) and tests leave mail in the outbox: a loop in
 * them could outlive their database handle, and the server sends the mail on its first use.
 */
function isWebServer(): boolean {
  return Boolean(process.env.NEXT_RUNTIME);
}

/** The web server's sender, started on first use; null in other processes. */
export function ensureOutboxSender(): OutboxSender | null {
  if (!isWebServer()) return null;
  if (!store.sender) {
    store.sender = new OutboxSender();
    store.sender.start();
  }
  return store.sender;
}

/** Wakes the web server's sender (starting it if needed) after mail was queued. */
export function kickOutbox(): void {
  ensureOutboxSender()?.kick();
}

/** Stops the process's sender (tests and shutdown); the next use starts a fresh one. */
export async function stopOutboxSender(): Promise<void> {
  const sender = store.sender;
  store.sender = undefined;
  await sender?.stop();
}
