import { spawn } from "node:child_process";
import type { ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { mkdtemp, readdir, rm } from "node:fs/promises";
import net from "node:net";
import { Readable } from "node:stream";
import { PutObjectCommand } from "@aws-sdk/client-s3";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createMailTransport, sendMail } from "../../src/server/mail/transport.ts";
import type { MailTransport } from "../../src/server/mail/transport.ts";
import { createStorage } from "../../src/server/storage/s3.ts";
import { clearMessages, listMessages, waitForMessages } from "../support/mail-catcher-client.ts";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const MAIL_FROM = "Ringland <signals@ringland.example>";

interface RunningService {
  child: ChildProcess;
  output: () => string;
}

function findFreePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.once("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const address = probe.address();
      const port = typeof address === "object" && address ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

// Resolves once the service prints its ready line; rejects with its output if it dies first.
function startService(file: string, env: Record<string, string>, readyPattern: RegExp): Promise<RunningService> {
  const child = spawn(process.execPath, ["--import", "tsx", path.join(root, file)], {
    cwd: root,
    // vitest sets NODE_ENV=test; the services are meant to run as in development.
    env: { ...process.env, NODE_ENV: "development", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  const service: RunningService = { child, output: () => output };
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${file} not ready after 20 s:\n${output}`)), 20_000);
    const onData = (chunk: Buffer): void => {
      output += chunk.toString("utf8");
      if (readyPattern.test(output)) {
        clearTimeout(timer);
        resolve(service);
      }
    };
    child.stdout?.on("data", onData);
    child.stderr?.on("data", (chunk: Buffer) => {
      output += chunk.toString("utf8");
    });
    child.once("exit", (code, signal) => {
      clearTimeout(timer);
      reject(new Error(`${file} exited early (code ${code}, signal ${signal}):\n${output}`));
    });
  });
}

function stopService(service: RunningService): Promise<{ code: number | null; signal: NodeJS.Signals | null }> {
  return new Promise((resolve, reject) => {
    const { child } = service;
    if (child.exitCode !== null || child.signalCode !== null) {
      resolve({ code: child.exitCode, signal: child.signalCode });
      return;
    }
    const timer = setTimeout(() => reject(new Error(`no exit within 10 s of SIGTERM:\n${service.output()}`)), 10_000);
    child.once("exit", (code, signal) => {
      clearTimeout(timer);
      resolve({ code, signal });
    });
    child.kill("SIGTERM");
  });
}

describe("local service fakes", () => {
  let workDir = "";
  let smtpPort = 0;
  let inboxUrl = "";
  let s3Endpoint = "";
  let catcher: RunningService | undefined;
  let s3: RunningService | undefined;
  let transport: MailTransport | undefined;

  beforeAll(async () => {
    workDir = await mkdtemp(path.join(os.tmpdir(), "ringland-fakes-"));
    const [smtp, inbox, s3Port] = [await findFreePort(), await findFreePort(), await findFreePort()];
    smtpPort = smtp;
    inboxUrl = `http://127.0.0.1:${inbox}/`;
    s3Endpoint = `http://127.0.0.1:${s3Port}`;
    [catcher, s3] = await Promise.all([
      startService(
        "scripts/services/mail-catcher.ts",
        { SMTP_PORT: String(smtp), MAIL_INBOX_PORT: String(inbox), MAIL_DIR: path.join(workDir, "mail") },
        /mail catcher: smtp 127\.0\.0\.1:\d+, inbox http:\/\/127\.0\.0\.1:\d+\//,
      ),
      startService(
        "scripts/services/s3-fake.ts",
        { S3_PORT: String(s3Port), S3_DIR: path.join(workDir, "s3"), S3_BUCKET: "ringland-uploads" },
        /s3 fake: http:\/\/127\.0\.0\.1:\d+ bucket ringland-uploads/,
      ),
    ]);
    transport = createMailTransport({ host: "127.0.0.1", port: smtpPort });
  }, 40_000);

  afterAll(async () => {
    transport?.close();
    for (const service of [catcher, s3]) if (service) await stopService(service).catch(() => undefined);
    if (workDir) await rm(workDir, { recursive: true, force: true });
  }, 20_000);

  it("prints the ready lines with the ports it was given", () => {
    expect(catcher?.output()).toContain(`mail catcher: smtp 127.0.0.1:${smtpPort}, inbox ${inboxUrl}`);
    expect(s3?.output()).toContain(`s3 fake: ${s3Endpoint} bucket ringland-uploads`);
  });

  it("answers the health check", async () => {
    const res = await fetch(new URL("health", inboxUrl));
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ok: true });
  });

  it("catches a sent mail and serves it back over the JSON API", async () => {
    await clearMessages(inboxUrl);
    const sent = await sendMail(
      transport!,
      {
        to: "crew.chief@team.example",
        subject: "Top end due: engine 7",
        text: "Engine 7 has 9.5 hours left before its top end.",
        html: "<p>Engine 7 has <strong>9.5 hours</strong> left.</p>",
        headers: { "List-Unsubscribe": "<https://ringland.example/unsubscribe/abc>" },
      },
      MAIL_FROM,
    );
    expect(sent.messageId).toMatch(/^<.+@.+>$/);

    const [message] = await waitForMessages(inboxUrl, (m) => m.subject === "Top end due: engine 7", 5000);
    expect(message.to).toEqual(["crew.chief@team.example"]);
    expect(message.from).toBe("signals@ringland.example");
    expect(message.fromName).toBe("Ringland");
    expect(message.envelope).toEqual({ from: "signals@ringland.example", to: ["crew.chief@team.example"] });
    expect(message.text.trim()).toBe("Engine 7 has 9.5 hours left before its top end.");
    expect(message.html).toContain("<strong>9.5 hours</strong>");
    expect(message.headers["list-unsubscribe"]).toBe("<https://ringland.example/unsubscribe/abc>");
    expect(message.headers["message-id"]).toBe(sent.messageId);
    expect(Number.isNaN(Date.parse(message.receivedAt))).toBe(false);

    // The catcher stores one JSON file per message in the folder it was given.
    expect(await readdir(path.join(workDir, "mail"))).toEqual([`${message.id}.json`]);
  });

  it("filters by recipient, lists newest first, and clears", async () => {
    await clearMessages(inboxUrl);
    await sendMail(transport!, { to: "a@team.example", subject: "first", text: "1" }, MAIL_FROM);
    await sendMail(transport!, { to: "b@team.example", subject: "second", text: "2" }, MAIL_FROM);

    expect((await listMessages(inboxUrl)).map((m) => m.subject)).toEqual(["second", "first"]);
    expect((await listMessages(inboxUrl, { to: "A@team.example" })).map((m) => m.subject)).toEqual(["first"]);
    expect(await listMessages(inboxUrl, { to: "nobody@team.example" })).toEqual([]);

    expect(await clearMessages(inboxUrl)).toBe(2);
    expect(await listMessages(inboxUrl)).toEqual([]);
  });

  it("accepts credentials over the plain local connection", async () => {
    await clearMessages(inboxUrl);
    const authed = createMailTransport({ host: "127.0.0.1", port: smtpPort, user: "dev", pass: "dev-password" });
    try {
      await sendMail(authed, { to: "auth@team.example", subject: "with login", text: "ok" }, MAIL_FROM);
    } finally {
      authed.close();
    }
    expect((await listMessages(inboxUrl, { to: "auth@team.example" })).map((m) => m.subject)).toEqual(["with login"]);
  });

  it("escapes the subject in the HTML inbox and sandboxes the HTML part", async () => {
    await clearMessages(inboxUrl);
    const subject = `Leak-down <b>12%</b> & "rising"`;
    await sendMail(
      transport!,
      { to: "shop@team.example", subject, text: "plain part", html: `<p onclick="x()">html <b>part</b></p>` },
      MAIL_FROM,
    );
    const [message] = await waitForMessages(inboxUrl, (m) => m.subject === subject, 5000);

    const inbox = await (await fetch(inboxUrl)).text();
    expect(inbox).toContain("Leak-down &lt;b&gt;12%&lt;/b&gt; &amp; &quot;rising&quot;");
    expect(inbox).not.toContain("<b>12%</b>");
    expect(inbox).toContain(`href="/messages/${message.id}"`);
    expect(inbox).toContain("shop@team.example");

    const page = await (await fetch(new URL(`messages/${message.id}`, inboxUrl))).text();
    expect(page).toContain(`<iframe sandbox="" title="HTML part" srcdoc="&lt;p onclick=&quot;x()&quot;&gt;`);
    expect(page).not.toContain(`<p onclick=`);
    expect(page).toContain("plain part");

    expect((await fetch(new URL("messages/not-a-real-id", inboxUrl))).status).toBe(404);
  });

  it("round-trips binary bytes exactly through the S3 fake", async () => {
    const storage = createStorage({
      endpoint: s3Endpoint,
      region: "us-east-1",
      bucket: "ringland-uploads",
      accessKeyId: "S3RVER",
      secretAccessKey: "S3RVER",
      forcePathStyle: true,
    });
    await storage.ensureBucket();
    // Every byte value plus random noise: chunk framing or text decoding would show as a difference.
    const allBytes = Buffer.from(Array.from({ length: 256 }, (_, i) => i));
    const body = Buffer.concat([allBytes, randomBytes(200_000), allBytes]);
    await storage.putObject("engines/7/teardown.bin", body, "application/octet-stream");

    const stored = await storage.getObject("engines/7/teardown.bin");
    expect(stored).not.toBeNull();
    expect(stored!.body.length).toBe(body.length);
    expect(stored!.body.equals(body)).toBe(true);
    expect(stored!.contentType).toBe("application/octet-stream");

    expect(await storage.getObject("engines/7/missing.bin")).toBeNull();

    // A streamed body is where the SDK's default checksums would add aws-chunked framing
    // (the stored object grows by the chunk headers); the storage client must not.
    await storage.client.send(
      new PutObjectCommand({
        Bucket: storage.bucket,
        Key: "engines/7/streamed.bin",
        Body: Readable.from([body.subarray(0, 70_000), body.subarray(70_000)]),
        ContentLength: body.length,
      }),
    );
    const streamed = await storage.getObject("engines/7/streamed.bin");
    expect(streamed?.body.length).toBe(body.length);
    expect(streamed?.body.equals(body)).toBe(true);

    await storage.deleteObject("engines/7/teardown.bin");
    expect(await storage.getObject("engines/7/teardown.bin")).toBeNull();
    storage.client.destroy();
  });

  it("creates a bucket that does not exist yet", async () => {
    const storage = createStorage({
      endpoint: s3Endpoint,
      region: "us-east-1",
      bucket: "ringland-scratch",
      accessKeyId: "S3RVER",
      secretAccessKey: "S3RVER",
      forcePathStyle: true,
    });
    await expect(storage.getObject("x")).rejects.toThrow();
    await storage.ensureBucket();
    await storage.ensureBucket();
    await storage.putObject("note.txt", Buffer.from("squish 1.0 mm"), "text/plain");
    expect((await storage.getObject("note.txt"))?.body.toString("utf8")).toBe("squish 1.0 mm");
    storage.client.destroy();
  });

  it("stops both services on SIGTERM, after which sending mail fails fast", async () => {
    const mailExit = await stopService(catcher!);
    const s3Exit = await stopService(s3!);
    expect(mailExit).toEqual({ code: 0, signal: null });
    expect(s3Exit).toEqual({ code: 0, signal: null });
    expect(catcher!.output()).toContain("mail catcher: stopped (SIGTERM)");
    expect(s3!.output()).toContain("s3 fake: stopped (SIGTERM)");

    const started = Date.now();
    await expect(
      sendMail(transport!, { to: "a@team.example", subject: "down", text: "x" }, MAIL_FROM),
    ).rejects.toThrow(/ECONNREFUSED|connect/i);
    expect(Date.now() - started).toBeLessThan(5000);
  }, 20_000);
});
