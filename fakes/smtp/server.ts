import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from "smtp-server";
import { advertisedHost, closeServer, HttpError, listen, sendError, sendJson } from "../shared/http";
import { inboxPage, messagePage } from "./inbox-page";
import { MessageStore } from "./message-store";

export interface SmtpFakeOptions {
  /** 0 (the default) picks a free port. */
  smtpPort?: number;
  httpPort?: number;
  host?: string;
  dataDir: string;
  /** Largest message accepted, in bytes (RFC 1870 SIZE). */
  maxMessageBytes?: number;
  log?: (line: string) => void;
}

export interface SmtpFake {
  smtpPort: number;
  httpUrl: string;
  /** false stops listening for SMTP, so senders get "connection refused" as when a mail server is down. */
  setAvailable(available: boolean): Promise<void>;
  close(): Promise<void>;
}

function smtpError(message: string, responseCode: number): Error {
  return Object.assign(new Error(message), { responseCode });
}

function sendHtml(res: ServerResponse, html: string): void {
  res.writeHead(200, {
    "content-type": "text/html; charset=utf-8",
    // Message content is escaped already; this stops anything that slipped through from running.
    "content-security-policy": "default-src 'none'; style-src 'unsafe-inline'",
    "cache-control": "no-store",
  });
  res.end(html);
}

async function route(req: IncomingMessage, res: ServerResponse, store: MessageStore): Promise<void> {
  const url = new URL(req.url ?? "/", "http://placeholder.invalid");
  const method = req.method ?? "GET";
  const parts = url.pathname.split("/").filter(Boolean);
  if (method === "GET" && url.pathname === "/") return sendHtml(res, inboxPage(store.list()));
  if (method === "GET" && parts[0] === "messages" && parts[1] && parts.length === 2) {
    const message = store.get(parts[1]);
    if (!message) throw new HttpError(404, "No such message");
    return sendHtml(res, messagePage(message));
  }
  if (parts[0] === "api" && parts[1] === "messages") {
    if (parts.length === 2 && method === "GET") {
      return sendJson(res, 200, store.list({ to: url.searchParams.get("to") ?? undefined }));
    }
    if (parts.length === 2 && method === "DELETE") return sendJson(res, 200, { deleted: await store.clear() });
    const id = parts[2];
    if (id && parts.length === 3 && method === "GET") {
      const message = store.get(id);
      if (!message) throw new HttpError(404, "No such message");
      return sendJson(res, 200, message);
    }
    if (id && parts.length === 4 && parts[3] === "raw" && method === "GET") {
      const raw = await store.raw(id);
      if (!raw) throw new HttpError(404, "No such message");
      res.writeHead(200, { "content-type": "message/rfc822", "content-length": String(raw.length) });
      res.end(raw);
      return;
    }
  }
  throw new HttpError(404, `Nothing at ${method} ${url.pathname}`);
}

/** A local mail catcher: accepts any SMTP mail (no TLS, any login) and shows it over HTTP. */
export async function startSmtpFake(options: SmtpFakeOptions): Promise<SmtpFake> {
  const log = options.log ?? ((line: string) => console.error(`[smtp-fake] ${line}`));
  const host = options.host ?? "127.0.0.1";
  const store = await MessageStore.open(options.dataDir, log);

  const onData = (stream: SMTPServerDataStream, session: SMTPServerSession, callback: (error?: Error | null) => void) => {
    const chunks: Buffer[] = [];
    stream.on("data", (chunk: Buffer) => chunks.push(chunk));
    stream.on("end", () => {
      if (stream.sizeExceeded) {
        callback(smtpError("Message exceeds the fixed maximum message size", 552));
        return;
      }
      const envelope = {
        from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
        to: session.envelope.rcptTo.map((rcpt) => rcpt.address),
      };
      store.add(Buffer.concat(chunks), envelope).then(
        () => callback(),
        (error: unknown) => {
          log(`could not store a message: ${error instanceof Error ? error.message : String(error)}`);
          callback(smtpError("Could not store the message, try again later", 451));
        },
      );
    });
  };

  const smtp = new SMTPServer({
    banner: "Kneepoint local mail catcher",
    authOptional: true,
    // Plain SMTP only: a local catcher has no certificate, and logins are accepted as given.
    disabledCommands: ["STARTTLS"],
    allowInsecureAuth: true,
    size: options.maxMessageBytes ?? 25 * 1024 * 1024,
    logger: false,
    closeTimeout: 1000,
    onAuth: (auth, _session, callback) => callback(null, { user: auth.username ?? "anonymous" }),
    onData,
  });
  smtp.on("error", (error: Error) => log(`smtp error: ${error.message}`));

  let smtpPort = await listen(smtp.server, options.smtpPort ?? 0, host);
  let available = true;

  const http = createServer((req, res) => {
    route(req, res, store).catch((error: unknown) => sendError(res, error, log));
  });
  const httpPort = await listen(http, options.httpPort ?? 0, host);

  return {
    get smtpPort() {
      return smtpPort;
    },
    httpUrl: `http://${advertisedHost(host)}:${httpPort}`,
    async setAvailable(next) {
      if (next === available) return;
      available = next;
      if (next) {
        smtpPort = await listen(smtp.server, smtpPort, host);
      } else {
        // Stop accepting at once; sessions already open may finish their message.
        smtp.server.close();
      }
    },
    async close() {
      await Promise.all([
        closeServer(http),
        new Promise<void>((resolve) => (available ? smtp.close(() => resolve()) : resolve())),
      ]);
    },
  };
}
