import path from "node:path";
import { envPort, runUntilSignal } from "../shared/cli";
import { startSmtpFake } from "./server";

/**
 * CLI: `tsx fakes/smtp/main.ts`. Env: FAKE_SMTP_PORT (default 2525), FAKE_SMTP_HTTP_PORT
 * (default 8025), FAKE_SMTP_DIR (default data/fake-mail), FAKE_SMTP_HOST (default 127.0.0.1).
 */
runUntilSignal(
  "smtp fake",
  () =>
    startSmtpFake({
      smtpPort: envPort("FAKE_SMTP_PORT", 2525),
      httpPort: envPort("FAKE_SMTP_HTTP_PORT", 8025),
      host: process.env.FAKE_SMTP_HOST || undefined,
      dataDir: path.resolve(process.env.FAKE_SMTP_DIR ?? "data/fake-mail"),
    }),
  (fake) => `smtp fake listening on smtp port ${fake.smtpPort}, inbox at ${fake.httpUrl}`,
);
