import { type StoredMessage } from "./message-store";

/** Everything from a message is shown as text: mail is untrusted input, even in a local catcher. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

const STYLE = `
  body { font: 15px/1.45 system-ui, sans-serif; margin: 0; color: #1d2a2f; background: #f4f6f5; }
  header { background: #23433d; color: #f4f6f5; padding: 0.8rem 1.5rem; }
  header h1 { font-size: 1.1rem; margin: 0; font-weight: 600; }
  main { max-width: 60rem; margin: 1.5rem auto; padding: 0 1rem; }
  table { width: 100%; border-collapse: collapse; background: #fff; }
  th, td { text-align: left; padding: 0.5rem 0.75rem; border-bottom: 1px solid #dde3e1; vertical-align: top; }
  th { font-size: 0.8rem; text-transform: uppercase; letter-spacing: 0.04em; color: #5a6b67; }
  a { color: #1f6f62; }
  pre { white-space: pre-wrap; word-break: break-word; background: #fff; padding: 1rem; border: 1px solid #dde3e1; }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.25rem 1rem; }
  dt { color: #5a6b67; }
  .empty { color: #5a6b67; }
`;

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title><style>${STYLE}</style></head>
<body><header><h1>Kneepoint local mail catcher</h1></header><main>${body}</main></body>
</html>`;
}

export function inboxPage(messages: StoredMessage[]): string {
  if (messages.length === 0) return page("Inbox", `<p class="empty">No mail yet. Anything the app sends over SMTP shows up here.</p>`);
  const rows = messages
    .map(
      (m) => `<tr>
  <td>${escapeHtml(new Date(m.receivedAt).toLocaleString("en-GB"))}</td>
  <td>${escapeHtml(m.from)}</td>
  <td>${escapeHtml(m.envelopeTo.join(", "))}</td>
  <td><a href="/messages/${encodeURIComponent(m.id)}">${escapeHtml(m.subject || "(no subject)")}</a></td>
</tr>`,
    )
    .join("\n");
  return page(
    `Inbox (${messages.length})`,
    `<table><thead><tr><th>Received</th><th>From</th><th>To</th><th>Subject</th></tr></thead><tbody>${rows}</tbody></table>`,
  );
}

export function messagePage(m: StoredMessage): string {
  const html = m.html === null ? "" : `<details><summary>HTML part (source, not rendered)</summary><pre>${escapeHtml(m.html)}</pre></details>`;
  return page(
    m.subject || "(no subject)",
    `<p><a href="/">&larr; Inbox</a></p>
<h2>${escapeHtml(m.subject || "(no subject)")}</h2>
<dl>
  <dt>From</dt><dd>${escapeHtml(m.from)}</dd>
  <dt>To</dt><dd>${escapeHtml(m.to.join(", "))}</dd>
  <dt>Envelope</dt><dd>${escapeHtml(m.envelopeTo.join(", "))}</dd>
  <dt>Date</dt><dd>${escapeHtml(m.date ?? "none")}</dd>
</dl>
<pre>${escapeHtml(m.text)}</pre>
${html}
<p><a href="/api/messages/${encodeURIComponent(m.id)}/raw">Raw source</a></p>`,
  );
}
