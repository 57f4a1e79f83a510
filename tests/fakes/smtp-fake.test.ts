import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import nodemailer from "nodemailer";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { type StoredMessage } from "@/fakes/smtp/message-store";
import { type SmtpFake, startSmtpFake } from "@/fakes/smtp/server";

let dataDir: string;
let fake: SmtpFake;

function transport(port = fake.smtpPort, auth?: { user: string; pass: string }) {
  // Plain SMTP, as the app uses against the local catcher; nodemailer would otherwise try STARTTLS.
  return nodemailer.createTransport({ host: "127.0.0.1", port, secure: false, ignoreTLS: true, auth });
}

async function getJson<T>(pathname: string): Promise<{ status: number; body: T }> {
  const response = await fetch(`${fake.httpUrl}${pathname}`);
  return { status: response.status, body: (await response.json()) as T };
}

const listMessages = async (query = "") => (await getJson<StoredMessage[]>(`/api/messages${query}`)).body;

beforeAll(async () => {
  dataDir = await mkdtemp(path.join(os.tmpdir(), "kneepoint-smtp-fake-"));
  fake = await startSmtpFake({ dataDir, log: () => undefined });
});

beforeEach(async () => {
  const cleared = await fetch(`${fake.httpUrl}/api/messages`, { method: "DELETE" });
  expect(cleared.status).toBe(200);
});

afterAll(async () => {
  await fake.close();
  await rm(dataDir, { recursive: true, force: true });
});

describe("SMTP fake", () => {
  it("stores a sent message with its recipients, subject and text", async () => {
    const info = await transport().sendMail({
      from: "Kneepoint <lab@kneepoint.test>",
      to: "ana@lab.test",
      cc: "ben@lab.test",
      bcc: "audit@lab.test",
      subject: "Capacity check finished for cell 7",
      text: "Measured 1987 mAh at 0.2C.\nSee the run page for details.",
    });
    expect(info.rejected).toEqual([]);

    const [message, ...others] = await listMessages();
    expect(others).toEqual([]);
    expect(message).toMatchObject({
      from: '"Kneepoint" <lab@kneepoint.test>',
      to: ["ana@lab.test"],
      cc: ["ben@lab.test"],
      envelopeFrom: "lab@kneepoint.test",
      subject: "Capacity check finished for cell 7",
      text: "Measured 1987 mAh at 0.2C.\nSee the run page for details.\n",
      html: null,
    });
    // Bcc never appears in the headers, only in the envelope (RFC 5322 §3.6.3).
    expect([...(message?.envelopeTo ?? [])].sort()).toEqual(["ana@lab.test", "audit@lab.test", "ben@lab.test"]);

    const one = await getJson<StoredMessage>(`/api/messages/${message?.id ?? ""}`);
    expect(one.body).toEqual(message);
    const raw = await fetch(`${fake.httpUrl}/api/messages/${message?.id ?? ""}/raw`);
    expect(raw.headers.get("content-type")).toBe("message/rfc822");
    expect(await raw.text()).toContain("Subject: Capacity check finished for cell 7");
  });

  it("lists newest first and filters by any recipient, ignoring case", async () => {
    const mail = transport();
    await mail.sendMail({ from: "lab@kneepoint.test", to: "ana@lab.test", subject: "first", text: "1" });
    await mail.sendMail({ from: "lab@kneepoint.test", to: "ben@lab.test", subject: "second", text: "2" });
    await mail.sendMail({ from: "lab@kneepoint.test", to: "carl@lab.test", bcc: "ana@lab.test", subject: "third", text: "3" });

    expect((await listMessages()).map((m) => m.subject)).toEqual(["third", "second", "first"]);
    expect((await listMessages("?to=ANA%40lab.test")).map((m) => m.subject)).toEqual(["third", "first"]);
    expect(await listMessages("?to=nobody%40lab.test")).toEqual([]);
  });

  it("decodes encoded subjects and keeps the HTML part (RFC 2047 encoded-words, written by nodemailer)", async () => {
    await transport().sendMail({
      from: "lab@kneepoint.test",
      to: "ana@lab.test",
      subject: "Zellprüfung – Ladeschluss 4,2 V",
      text: "Grüße",
      html: "<p>Ladeschluss <b>4,2 V</b></p>",
    });
    const [message] = await listMessages();
    expect(message?.subject).toBe("Zellprüfung – Ladeschluss 4,2 V");
    expect(message?.text.trim()).toBe("Grüße");
    expect(message?.html).toBe("<p>Ladeschluss <b>4,2 V</b></p>");
  });

  it("accepts any login over plain SMTP", async () => {
    await transport(fake.smtpPort, { user: "mailer", pass: "local-only" }).sendMail({
      from: "lab@kneepoint.test",
      to: "ana@lab.test",
      subject: "with login",
      text: "ok",
    });
    expect((await listMessages()).map((m) => m.subject)).toEqual(["with login"]);
  });

  it("escapes message content in the HTML inbox and message page", async () => {
    const hostile = `<script>alert("x")</script> & <img src=x onerror=alert(1)>`;
    await transport().sendMail({
      from: `"<b>Mallory</b>" <mallory@evil.test>`,
      to: "ana@lab.test",
      subject: hostile,
      text: `body ${hostile}`,
      html: `<div onclick="steal()">${hostile}</div>`,
    });
    const inbox = await fetch(`${fake.httpUrl}/`);
    expect(inbox.headers.get("content-type")).toBe("text/html; charset=utf-8");
    const inboxHtml = await inbox.text();
    expect(inboxHtml).toContain("&#60;script&#62;alert(&#34;x&#34;)&#60;/script&#62; &#38; &#60;img src=x onerror=alert(1)&#62;");
    expect(inboxHtml).not.toContain("<script>");
    expect(inboxHtml).not.toContain("<img");
    expect(inboxHtml).not.toContain("<b>Mallory");

    const [message] = await listMessages();
    const pageHtml = await (await fetch(`${fake.httpUrl}/messages/${message?.id ?? ""}`)).text();
    expect(pageHtml).toContain("&#60;div onclick=&#34;steal()&#34;&#62;");
    expect(pageHtml).not.toContain("<script>");
    expect(pageHtml).not.toContain("<div onclick");
    expect(pageHtml).not.toContain("<img");
  });

  it("keeps the inbox across a restart", async () => {
    await transport().sendMail({ from: "lab@kneepoint.test", to: "ana@lab.test", subject: "survives restart", text: "kept" });
    const before = await listMessages();
    await fake.close();
    fake = await startSmtpFake({ dataDir, log: () => undefined });
    expect(await listMessages()).toEqual(before);
    const raw = await fetch(`${fake.httpUrl}/api/messages/${before[0]?.id ?? ""}/raw`);
    expect(await raw.text()).toContain("kept");
  });

  it("refuses connections while unavailable and accepts mail again afterwards", async () => {
    const mail = transport();
    await fake.setAvailable(false);
    await expect(mail.sendMail({ from: "lab@kneepoint.test", to: "ana@lab.test", subject: "lost", text: "x" })).rejects.toMatchObject({
      code: "ESOCKET",
    });
    await fake.setAvailable(true);
    await mail.sendMail({ from: "lab@kneepoint.test", to: "ana@lab.test", subject: "back", text: "y" });
    expect((await listMessages()).map((m) => m.subject)).toEqual(["back"]);
  });

  it("rejects a message over the size limit with 552 (RFC 1870 SIZE)", async () => {
    const small = await startSmtpFake({ dataDir: path.join(dataDir, "small"), maxMessageBytes: 2000, log: () => undefined });
    try {
      await expect(
        transport(small.smtpPort).sendMail({ from: "lab@kneepoint.test", to: "ana@lab.test", subject: "big", text: "x".repeat(10_000) }),
      ).rejects.toMatchObject({ responseCode: 552 });
      const listed = (await (await fetch(`${small.httpUrl}/api/messages`)).json()) as unknown[];
      expect(listed).toEqual([]);
    } finally {
      await small.close();
    }
  });

  it("answers unknown messages and paths with JSON errors", async () => {
    expect(await getJson("/api/messages/zzzzzzzzzz-00000000")).toEqual({ status: 404, body: { error: "No such message" } });
    expect((await getJson("/api/messages/../../etc/passwd")).status).toBe(404);
    const nowhere = await getJson<{ error: string }>("/nope");
    expect(nowhere.status).toBe(404);
    expect(nowhere.body.error).toMatch(/Nothing at GET/);
  });
});
