import "server-only";
import nodemailer, { type Transporter } from "nodemailer";

/** A failed connection must not hold the sender for minutes: nodemailer's defaults are 2 min / 30 s / 10 min. */
const timeouts = { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 };

/**
 * An SMTP transport from an smtp:// or smtps:// URL (user and password, if any, percent-encoded
 * in the URL). smtps:// is TLS from the start (port 465 by default); smtp:// upgrades with
 * STARTTLS when the server offers it (587 by default).
 */
export function transportFromUrl(url: string): Transporter {
  const u = new URL(url);
  const secure = u.protocol === "smtps:";
  if (!secure && u.protocol !== "smtp:") throw new Error(`not an SMTP URL: ${u.protocol}`);
  return nodemailer.createTransport({
    host: u.hostname,
    port: u.port ? Number(u.port) : secure ? 465 : 587,
    secure,
    auth: u.username ? { user: decodeURIComponent(u.username), pass: decodeURIComponent(u.password) } : undefined,
    ...timeouts,
  });
}
