import { describe, expect, it } from "vitest";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { backup, restore } from "../../scripts/backup.ts";
import { testDb } from "../support/db.ts";
import { defaultStorage } from "../../src/server/storage/default-storage.ts";
import { uniqueSuffix } from "../factories/people.ts";

async function checksums(): Promise<Record<string, string>> {
  const tables: string[] = (await testDb().raw("SHOW TABLES"))[0].map((r: Record<string, string>) => Object.values(r)[0]);
  const out: Record<string, string> = {};
  for (const t of tables.sort()) {
    const [rows] = await testDb().raw("CHECKSUM TABLE ??", [t]);
    out[t] = String(rows[0].Checksum);
  }
  return out;
}

describe("backup and restore", () => {
  it("brings back every table and every uploaded file exactly", async () => {
    const folder = mkdtempSync(join(tmpdir(), "ringland-backup-"));
    const storage = defaultStorage();
    await storage.ensureBucket();
    const key = `backup-test/${uniqueSuffix()}.bin`;
    const bytes = Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 31) % 256));
    await storage.putObject(key, bytes, "application/octet-stream");
    try {
      const before = await checksums();
      expect(Object.keys(before)).toContain("organisations");
      const made = await backup(folder);
      expect(made.objects).toBeGreaterThanOrEqual(1);

      // Damage: a new organisation, a renamed one, a deleted file.
      await testDb()("organisations").insert({ name: "After the backup", slug: `after-${uniqueSuffix()}` });
      await testDb()("organisations").where({ slug: "kestrel-hollow" }).update({ name: "Renamed" });
      await storage.deleteObject(key);
      expect(await checksums()).not.toEqual(before);

      await restore(folder);
      expect(await checksums()).toEqual(before);
      const back = await storage.getObject(key);
      expect(back?.body.equals(bytes)).toBe(true);
    } finally {
      await storage.deleteObject(key).catch(() => undefined);
      rmSync(folder, { recursive: true, force: true });
    }
  });
});
