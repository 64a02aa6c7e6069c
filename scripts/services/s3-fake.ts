// Local S3-compatible store for development and tests, backed by a folder on disk.
// Run: node --import tsx scripts/services/s3-fake.ts
import { mkdir } from "node:fs/promises";
import http from "node:http";
import { createRequire } from "node:module";
import path from "node:path";

// s3rver ships no type declarations; this is the part of its surface the fake relies on.
interface FakeS3Server {
  configureBuckets(): Promise<unknown>;
  callback(): http.RequestListener;
  logger: { close(): void };
}
type FakeS3ServerConstructor = new (options: {
  address: string;
  port: number;
  directory: string;
  silent: boolean;
  configureBuckets: { name: string }[];
}) => FakeS3Server;

const require = createRequire(import.meta.url);
const S3rver = require("s3rver") as FakeS3ServerConstructor;

const HOST = "127.0.0.1";
const port = readPort("S3_PORT", 4569);
const directory = path.resolve(process.env.S3_DIR || ".data/s3");
const bucket = process.env.S3_BUCKET || "ringland-uploads";

function readPort(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 0 || value > 65535) {
    throw new Error(`${name} must be a port number, got "${raw}"`);
  }
  return value;
}

const fake = new S3rver({ address: HOST, port, directory, silent: true, configureBuckets: [{ name: bucket }] });
// Our own listener instead of s3rver.run(): run() leaves a bind failure as an unhandled
// 'error' event, and we want a one-line message and a non-zero exit instead.
const server = http.createServer(fake.callback());

function listen(): Promise<number> {
  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, HOST, () => {
      server.off("error", reject);
      const address = server.address();
      resolve(typeof address === "object" && address ? address.port : port);
    });
  });
}

let stopping = false;
function stop(signal: string): void {
  if (stopping) return;
  stopping = true;
  const force = setTimeout(() => process.exit(0), 3000);
  force.unref();
  server.closeAllConnections();
  server.close(() => {
    fake.logger.close();
    process.stdout.write(`s3 fake: stopped (${signal})\n`);
    process.exit(0);
  });
}

async function main(): Promise<void> {
  await mkdir(directory, { recursive: true });
  await fake.configureBuckets();
  const boundPort = await listen();
  process.once("SIGTERM", () => stop("SIGTERM"));
  process.once("SIGINT", () => stop("SIGINT"));
  process.stdout.write(`s3 fake: http://${HOST}:${boundPort} bucket ${bucket}\n`);
}

main().catch((err: unknown) => {
  process.stderr.write(`s3 fake: failed to start: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(1);
});
