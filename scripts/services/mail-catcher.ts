// Local SMTP catcher for development and tests: accepts every message on 127.0.0.1,
// stores it as JSON under MAIL_DIR, and serves a small inbox over HTTP.
// Run: node --import tsx scripts/services/mail-catcher.ts
import { randomBytes } from "node:crypto";
import { mkdir, readdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import http from "node:http";
import path from "node:path";
import { simpleParser } from "mailparser";
import type { AddressObject, ParsedMail } from "mailparser";
import { SMTPServer } from "smtp-server";

interface CaughtAttachment {
  filename: string | null;
  contentType: string;
  sizeBytes: number;
  contentId: string | null;
  checksum: string;
}

interface CaughtMessage {
  id: string;
  receivedAt: string;
  from: string;
  fromName: string | null;
  to: string[];
  envelope: { from: string | null; to: string[] };
  subject: string;
  text: string;
  html: string | null;
  headers: Record<string, string>;
  attachments: CaughtAttachment[];
}

const HOST = "127.0.0.1";
const smtpPort = readPort("SMTP_PORT", 2525);
const inboxPort = readPort("MAIL_INBOX_PORT", 8025);
const mailDir = path.resolve(process.env.MAIL_DIR || ".data/mail");
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;
// Headers worth asserting on in tests (unsubscribe links, threading, bulk markers); x-* are kept too.
const HEADERS_OF_INTEREST = new Set(["list-unsubscribe", "list-unsubscribe-post", "list-id", "message-id",
  "reply-to", "in-reply-to", "references", "auto-submitted", "precedence", "cc", "date"]);
const ID_PATTERN = /^[0-9A-Za-z-]{1,80}$/;

function readPort(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    throw new Error(`${name} must be a port number, got "${raw}"`);
  }
  return port;
}

function escapeHtml(value: string): string {
  return value
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

// Ids sort by arrival time as plain strings; the random tail keeps same-millisecond mails apart.
function createMessageId(now: Date): string {
  const stamp = now.toISOString().replace(/[-:.TZ]/g, "");
  return `${stamp}-${randomBytes(4).toString("hex")}`;
}

function listAddresses(field: AddressObject | AddressObject[] | undefined): string[] {
  if (!field) return [];
  const groups = Array.isArray(field) ? field : [field];
  const addresses: string[] = [];
  for (const group of groups) {
    for (const entry of group.value) {
      if (entry.address) addresses.push(entry.address);
      for (const member of entry.group ?? []) if (member.address) addresses.push(member.address);
    }
  }
  return addresses;
}

// Raw header lines keep values exactly as sent (mailparser restructures some, e.g. List-Unsubscribe).
function pickHeaders(parsed: ParsedMail): Record<string, string> {
  const picked: Record<string, string> = {};
  for (const { key, line } of parsed.headerLines) {
    const name = key.toLowerCase();
    if (!HEADERS_OF_INTEREST.has(name) && !name.startsWith("x-")) continue;
    const value = line.slice(line.indexOf(":") + 1).replace(/\r?\n[ \t]+/g, " ").trim();
    picked[name] = picked[name] === undefined ? value : `${picked[name]}, ${value}`;
  }
  return picked;
}

function buildMessage(parsed: ParsedMail, envelope: CaughtMessage["envelope"], now: Date): CaughtMessage {
  const headerTo = listAddresses(parsed.to);
  const sender = parsed.from?.value[0];
  return {
    id: createMessageId(now),
    receivedAt: now.toISOString(),
    from: sender?.address || envelope.from || "",
    fromName: sender?.name || null,
    to: headerTo.length > 0 ? headerTo : envelope.to,
    envelope,
    subject: parsed.subject ?? "",
    text: parsed.text ?? "",
    html: typeof parsed.html === "string" ? parsed.html : null,
    headers: pickHeaders(parsed),
    attachments: parsed.attachments.map((a) => ({
      filename: a.filename ?? null,
      contentType: a.contentType,
      sizeBytes: a.size,
      contentId: a.contentId ?? null,
      checksum: a.checksum,
    })),
  };
}

async function storeMessage(message: CaughtMessage): Promise<void> {
  // Write then rename so a reader polling the folder never sees half a file.
  const finalPath = path.join(mailDir, `${message.id}.json`);
  const tempPath = `${finalPath}.tmp`;
  await writeFile(tempPath, JSON.stringify(message, null, 2), "utf8");
  await rename(tempPath, finalPath);
}

async function loadMessages(): Promise<CaughtMessage[]> {
  const names = (await readdir(mailDir)).filter((n) => n.endsWith(".json"));
  const messages: CaughtMessage[] = [];
  for (const name of names) {
    try {
      messages.push(JSON.parse(await readFile(path.join(mailDir, name), "utf8")) as CaughtMessage);
    } catch {
      // A file removed by a concurrent clear is simply no longer in the inbox.
    }
  }
  return messages.sort((a, b) => (a.id < b.id ? 1 : a.id > b.id ? -1 : 0));
}

async function clearMessages(): Promise<number> {
  const names = (await readdir(mailDir)).filter((n) => n.endsWith(".json") || n.endsWith(".tmp"));
  await Promise.all(names.map((n) => rm(path.join(mailDir, n), { force: true })));
  return names.filter((n) => n.endsWith(".json")).length;
}

function matchesRecipient(message: CaughtMessage, address: string): boolean {
  const wanted = address.trim().toLowerCase();
  return [...message.to, ...message.envelope.to].some((a) => a.toLowerCase() === wanted);
}

function renderPage(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(title)}</title>
<style>body{font-family:system-ui,sans-serif;margin:1.5rem;color:#1a1a1a}table{border-collapse:collapse;width:100%}
td,th{text-align:left;padding:.35rem .6rem;border-bottom:1px solid #ddd}iframe{width:100%;height:60vh;border:1px solid #bbb}
pre{white-space:pre-wrap;background:#f6f6f6;padding:.75rem}dt{font-weight:600}</style></head><body>${body}</body></html>`;
}

function renderInbox(messages: CaughtMessage[]): string {
  const rows = messages
    .map(
      (m) =>
        `<tr><td><a href="/messages/${escapeHtml(m.id)}">${escapeHtml(m.subject || "(no subject)")}</a></td>` +
        `<td>${escapeHtml(m.to.join(", "))}</td><td><time datetime="${escapeHtml(m.receivedAt)}">${escapeHtml(m.receivedAt)}</time></td></tr>`,
    )
    .join("\n");
  const table = messages.length
    ? `<table><thead><tr><th>Subject</th><th>To</th><th>Received</th></tr></thead><tbody>${rows}</tbody></table>`
    : "<p>No messages yet.</p>";
  return renderPage("Ringland mail catcher", `<h1>Caught mail (${messages.length})</h1>${table}`);
}

function renderMessage(m: CaughtMessage): string {
  const headerRows = Object.entries(m.headers)
    .map(([name, value]) => `<dt>${escapeHtml(name)}</dt><dd>${escapeHtml(value)}</dd>`)
    .join("");
  const attachments = m.attachments
    .map((a) => `<li>${escapeHtml(a.filename ?? "(unnamed)")} (${escapeHtml(a.contentType)}, ${a.sizeBytes} bytes)</li>`)
    .join("");
  // An empty sandbox blocks scripts, forms and same-origin access inside the mail's HTML.
  const htmlPart = m.html !== null
    ? `<h2>HTML part</h2><iframe sandbox="" title="HTML part" srcdoc="${escapeHtml(m.html)}"></iframe>`
    : "<p>No HTML part.</p>";
  const body =
    `<p><a href="/">&larr; Inbox</a></p><h1>${escapeHtml(m.subject || "(no subject)")}</h1>` +
    `<dl><dt>From</dt><dd>${escapeHtml(m.fromName ? `${m.fromName} <${m.from}>` : m.from)}</dd><dt>To</dt><dd>${escapeHtml(m.to.join(", "))}</dd>` +
    `<dt>Received</dt><dd>${escapeHtml(m.receivedAt)}</dd>${headerRows}</dl>` +
    (attachments ? `<h2>Attachments</h2><ul>${attachments}</ul>` : "") +
    `${htmlPart}<h2>Text part</h2><pre>${escapeHtml(m.text)}</pre>`;
  return renderPage(m.subject || "(no subject)", body);
}

function send(res: http.ServerResponse, status: number, type: string, body: string): void {
  res.writeHead(status, {
    "content-type": type,
    "cache-control": "no-store",
    "x-content-type-options": "nosniff",
    "content-security-policy": "script-src 'none'; object-src 'none'; base-uri 'none'; form-action 'none'",
  });
  res.end(body);
}

function sendJson(res: http.ServerResponse, status: number, value: unknown): void {
  send(res, status, "application/json; charset=utf-8", JSON.stringify(value));
}

async function handleRequest(req: http.IncomingMessage, res: http.ServerResponse): Promise<void> {
  const url = new URL(req.url ?? "/", `http://${HOST}`);
  const method = req.method ?? "GET";
  const route = url.pathname;

  if (route === "/health" && method === "GET") return sendJson(res, 200, { ok: true });
  if (route === "/" && method === "GET") {
    return send(res, 200, "text/html; charset=utf-8", renderInbox(await loadMessages()));
  }
  if (route === "/api/messages" && method === "GET") {
    const to = url.searchParams.get("to");
    const messages = await loadMessages();
    return sendJson(res, 200, to ? messages.filter((m) => matchesRecipient(m, to)) : messages);
  }
  if (route === "/api/messages" && method === "DELETE") {
    return sendJson(res, 200, { deleted: await clearMessages() });
  }
  const single = /^\/(api\/)?messages\/([^/]+)$/.exec(route);
  if (single && method === "GET") {
    const id = decodeURIComponent(single[2]);
    const message = ID_PATTERN.test(id) ? (await loadMessages()).find((m) => m.id === id) : undefined;
    if (!message) return single[1] ? sendJson(res, 404, { error: "not found" }) : send(res, 404, "text/plain", "not found");
    return single[1] ? sendJson(res, 200, message) : send(res, 200, "text/html; charset=utf-8", renderMessage(message));
  }
  return sendJson(res, 404, { error: "not found" });
}

const smtpServer = new SMTPServer({
  authOptional: true,
  // Dev config may carry provider credentials; accept them over the plain local connection.
  allowInsecureAuth: true,
  secure: false,
  disabledCommands: ["STARTTLS"],
  size: MAX_MESSAGE_BYTES,
  logger: false,
  closeTimeout: 1000,
  // Any credentials pass: the catcher stands in for a provider that would check them.
  onAuth(_auth, _session, callback) {
    callback(null, { user: "catcher" });
  },
  onData(stream, session, callback) {
    const envelope = {
      from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
      to: session.envelope.rcptTo.map((r) => r.address),
    };
    simpleParser(stream)
      .then((parsed) => {
        if (stream.sizeExceeded) throw Object.assign(new Error("message too large"), { responseCode: 552 });
        return storeMessage(buildMessage(parsed, envelope, new Date()));
      })
      .then(() => callback(), (err: Error) => callback(err));
  },
});

const inboxServer = http.createServer((req, res) => {
  handleRequest(req, res).catch((err: unknown) => {
    process.stderr.write(`mail catcher: request failed: ${String(err)}\n`);
    if (!res.headersSent) sendJson(res, 500, { error: "internal error" });
    else res.end();
  });
});

function listenSmtp(): Promise<number> {
  return new Promise((resolve, reject) => {
    smtpServer.once("error", reject);
    smtpServer.listen(smtpPort, HOST, () => {
      smtpServer.off("error", reject);
      smtpServer.on("error", (err) => process.stderr.write(`mail catcher: smtp error: ${err.message}\n`));
      const address = smtpServer.server.address();
      resolve(typeof address === "object" && address ? address.port : smtpPort);
    });
  });
}

function listenInbox(): Promise<number> {
  return new Promise((resolve, reject) => {
    inboxServer.once("error", reject);
    inboxServer.listen(inboxPort, HOST, () => {
      inboxServer.off("error", reject);
      const address = inboxServer.address();
      resolve(typeof address === "object" && address ? address.port : inboxPort);
    });
  });
}

let stopping = false;
function stop(signal: string): void {
  if (stopping) return;
  stopping = true;
  // A stuck client must not keep the process alive past a short grace period.
  const force = setTimeout(() => process.exit(0), 3000);
  force.unref();
  inboxServer.closeAllConnections();
  Promise.all([
    new Promise<void>((resolve) => smtpServer.close(() => resolve())),
    new Promise<void>((resolve) => inboxServer.close(() => resolve())),
  ]).then(() => {
    process.stdout.write(`mail catcher: stopped (${signal})\n`);
    process.exit(0);
  });
}

async function main(): Promise<void> {
  await mkdir(mailDir, { recursive: true });
  const [boundSmtp, boundInbox] = await Promise.all([listenSmtp(), listenInbox()]);
  process.once("SIGTERM", () => stop("SIGTERM"));
  process.once("SIGINT", () => stop("SIGINT"));
  process.stdout.write(`mail catcher: smtp ${HOST}:${boundSmtp}, inbox http://${HOST}:${boundInbox}/\n`);
}

main().catch((err: unknown) => {
  process.stderr.write(`mail catcher: failed to start: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
