/**
 * `npm run db:backup [folder]`: a consistent dump of the database (one transaction, so rows
 * written during the dump are either all in or all out) and a copy of every uploaded file.
 * `npm run db:restore <folder>`: loads such a backup into the configured database and bucket.
 */
import { spawn } from "node:child_process";
import { createReadStream, createWriteStream, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import { env } from "../src/server/env.ts";
import { defaultStorage } from "../src/server/storage/default-storage.ts";

function client(name: string): string {
  for (const dir of ["/usr/bin", "/usr/local/bin"]) if (existsSync(join(dir, name))) return join(dir, name);
  throw new Error(`${name} not found: install Debian's mariadb-client`);
}

function connectionArgs(): string[] {
  return ["--no-defaults", `--host=${env.DB_HOST}`, `--port=${env.DB_PORT}`, `--user=${env.DB_USER}`, "--protocol=TCP"];
}

function run(cmd: string, args: string[], io: { stdin?: string; stdout?: string }): Promise<void> {
  return new Promise((res, rej) => {
    const child = spawn(cmd, args, {
      env: { ...process.env, MYSQL_PWD: env.DB_PASSWORD },
      stdio: [io.stdin ? "pipe" : "ignore", io.stdout ? "pipe" : "inherit", "pipe"],
    });
    let err = "";
    child.stderr!.on("data", (d: Buffer) => (err += d.toString()));
    if (io.stdin) createReadStream(io.stdin).pipe(child.stdin!);
    if (io.stdout) child.stdout!.pipe(createWriteStream(io.stdout));
    child.on("exit", (code) => (code === 0 ? res() : rej(new Error(`${cmd} exited ${code}: ${err.trim()}`))));
  });
}

export async function backup(folder: string): Promise<{ objects: number }> {
  mkdirSync(join(folder, "files"), { recursive: true });
  await run(
    client("mariadb-dump"),
    [...connectionArgs(), "--single-transaction", "--routines", "--triggers", "--hex-blob", "--default-character-set=utf8mb4", env.DB_NAME],
    { stdout: join(folder, "database.sql") },
  );
  const storage = defaultStorage();
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const page = await storage.client.send(new ListObjectsV2Command({ Bucket: env.S3_BUCKET, ContinuationToken: token }));
    for (const o of page.Contents ?? []) if (o.Key) keys.push(o.Key);
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  const manifest: { key: string; file: string; contentType?: string }[] = [];
  for (const [i, key] of keys.entries()) {
    const obj = await storage.getObject(key);
    if (!obj) continue;
    const file = `${String(i).padStart(6, "0")}.bin`;
    writeFileSync(join(folder, "files", file), obj.body);
    manifest.push({ key, file, contentType: obj.contentType });
  }
  writeFileSync(join(folder, "manifest.json"), JSON.stringify({ createdAt: new Date().toISOString(), database: env.DB_NAME, bucket: env.S3_BUCKET, objects: manifest }, null, 2));
  return { objects: manifest.length };
}

export async function restore(folder: string): Promise<{ objects: number }> {
  const manifestPath = join(folder, "manifest.json");
  if (!existsSync(manifestPath) || !existsSync(join(folder, "database.sql"))) throw new Error(`${folder} is not a Ringland backup`);
  await run(client("mariadb"), [...connectionArgs(), env.DB_NAME], { stdin: join(folder, "database.sql") });
  const manifest = JSON.parse(readFileSync(manifestPath, "utf8")) as { objects: { key: string; file: string; contentType?: string }[] };
  const storage = defaultStorage();
  await storage.ensureBucket();
  for (const o of manifest.objects) {
    await storage.putObject(o.key, readFileSync(join(folder, "files", o.file)), o.contentType ?? "application/octet-stream");
  }
  return { objects: manifest.objects.length };
}

async function main(): Promise<void> {
  const [command, target] = process.argv.slice(2);
  if (command === "backup") {
    const folder = resolve(target ?? join("backups", new Date().toISOString().replace(/[:.]/g, "-")));
    const r = await backup(folder);
    console.log(`backup written to ${folder} (database and ${r.objects} files)`);
  } else if (command === "restore") {
    if (!target) throw new Error("usage: npm run db:restore <backup folder>");
    const r = await restore(resolve(target));
    console.log(`restored ${resolve(target)} (database and ${r.objects} files)`);
  } else {
    throw new Error("usage: backup [folder] | restore <folder>");
  }
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  main().catch((err) => {
    console.error(`ringland: ${(err as Error).message}`);
    process.exit(1);
  });
}
