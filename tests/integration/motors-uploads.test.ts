import sharp from "sharp";
import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient, BASE_URL } from "../support/api.ts";
import { testDb } from "../support/db.ts";
import { createCrew, daysAgo, engineIn, listObjectKeys, testStorage, upload, type Crew } from "./motors-fixtures.ts";

let crew: Crew;
let other: Crew;
let jpeg: Buffer;
let png: Buffer;
let webp: Buffer;
const pdf = Buffer.from("%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n");

beforeAll(async () => {
  crew = await createCrew();
  other = await createCrew();
  const image = sharp({ create: { width: 1200, height: 800, channels: 3, background: { r: 180, g: 120, b: 60 } } });
  jpeg = await image.clone().jpeg().toBuffer();
  png = await image.clone().png().toBuffer();
  webp = await image.clone().webp().toBuffer();
});

async function uploadRows(orgId: number): Promise<number> {
  const row = await testDb()("uploads").where({ organisation_id: orgId }).count({ n: "*" }).first();
  return Number(row?.n);
}

async function getBytes(client: ApiClient, path: string): Promise<{ status: number; type: string | null; bytes: Buffer; disposition: string | null }> {
  const res = await fetch(BASE_URL + path, { headers: client.cookies.size ? { cookie: client.cookieHeader() } : {} });
  return { status: res.status, type: res.headers.get("content-type"), bytes: Buffer.from(await res.arrayBuffer()), disposition: res.headers.get("content-disposition") };
}

describe("uploads", () => {
  it("stores a photo with a 320 px JPEG thumbnail and serves both to the organisation", async () => {
    const engine = await engineIn(crew.orgId);
    const res = await upload(crew.mechanic, { engineId: String(engine), cylinderNo: "2", caption: "Crown, cylinder 2" }, { name: "crown.jpg", bytes: jpeg, type: "image/jpeg" });
    expect(res.status).toBe(201);
    const u = res.body.upload;
    expect(u).toMatchObject({ engineId: engine, cylinderNo: 2, contentType: "image/jpeg", byteSize: jpeg.length, originalName: "crown.jpg", caption: "Crown, cylinder 2" });
    expect(u.thumbnailUrl).toBe(`/api/v1/uploads/${u.id}?variant=thumbnail`);
    const original = await getBytes(crew.viewer, u.url);
    expect(original.status).toBe(200);
    expect(original.type).toBe("image/jpeg");
    expect(original.bytes.equals(jpeg)).toBe(true);
    const thumb = await getBytes(crew.viewer, u.thumbnailUrl);
    const meta = await sharp(thumb.bytes).metadata();
    expect(meta.format).toBe("jpeg");
    expect(Math.max(meta.width!, meta.height!)).toBe(320);
    const row = await testDb()("uploads").where({ id: u.id }).first();
    expect((await testStorage().getObject(row.object_key))?.body.length).toBe(jpeg.length);
    expect(await testDb()("audit_log").where({ action: "upload.created", entity_id: String(u.id) }).first()).toBeTruthy();
    expect((await crew.viewer.get(`/api/v1/uploads?engineId=${engine}`)).body.uploads.map((x: { id: number }) => x.id)).toEqual([u.id]);
  });

  it("accepts PNG, WebP and PDF by their content; a PDF gets no thumbnail", async () => {
    const engine = await engineIn(crew.orgId);
    for (const [bytes, type] of [[png, "image/png"], [webp, "image/webp"], [pdf, "application/pdf"]] as const) {
      const res = await upload(crew.mechanic, { engineId: String(engine) }, { name: "scan.bin", bytes, type: "application/octet-stream" });
      expect(res.status).toBe(201);
      expect(res.body.upload.contentType).toBe(type);
      expect(res.body.upload.originalName).toMatch(new RegExp(`^scan\\.${type.split("/")[1].replace("jpeg", "jpg")}$`));
      if (type === "application/pdf") expect(res.body.upload.thumbnailUrl).toBeNull();
    }
  });

  it("refuses a file named .jpg that is not a JPEG, leaving no row and no object", async () => {
    const engine = await engineIn(crew.orgId);
    const [rows, keys] = [await uploadRows(crew.orgId), await listObjectKeys(crew.orgId)];
    const res = await upload(crew.mechanic, { engineId: String(engine) }, { name: "crown.jpg", bytes: Buffer.from("just some text, not a photo"), type: "image/jpeg" });
    expect(res.status).toBe(415);
    expect(res.body.error.fields.file).toMatch(/JPEG/);
    expect(await uploadRows(crew.orgId)).toBe(rows);
    expect(await listObjectKeys(crew.orgId)).toEqual(keys);
  });

  it("refuses a file over 15 MB, leaving no row and no object", async () => {
    const engine = await engineIn(crew.orgId);
    const [rows, keys] = [await uploadRows(crew.orgId), await listObjectKeys(crew.orgId)];
    const big = Buffer.alloc(15 * 1024 * 1024 + 1, 0);
    jpeg.copy(big, 0, 0, 64);
    const res = await upload(crew.mechanic, { engineId: String(engine) }, { name: "huge.jpg", bytes: big, type: "image/jpeg" });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe("too_large");
    const huge = await upload(crew.mechanic, { engineId: String(engine) }, { name: "huger.jpg", bytes: Buffer.alloc(20 * 1024 * 1024, 1), type: "image/jpeg" });
    expect(huge.status).toBe(413);
    expect(await uploadRows(crew.orgId)).toBe(rows);
    expect(await listObjectKeys(crew.orgId)).toEqual(keys);
  });

  it("removes the stored original when the thumbnail cannot be made (a damaged JPEG): no orphans", async () => {
    const engine = await engineIn(crew.orgId);
    const [rows, keys] = [await uploadRows(crew.orgId), await listObjectKeys(crew.orgId)];
    const damaged = Buffer.concat([jpeg.subarray(0, 200), Buffer.alloc(50_000, 7)]);
    const res = await upload(crew.mechanic, { engineId: String(engine) }, { name: "damaged.jpg", bytes: damaged, type: "image/jpeg" });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.file).toBeTruthy();
    expect(await uploadRows(crew.orgId)).toBe(rows);
    expect(await listObjectKeys(crew.orgId)).toEqual(keys);
  });

  it("keeps only the last part of a name with path separators", async () => {
    const engine = await engineIn(crew.orgId);
    const res = await upload(crew.mechanic, { engineId: String(engine) }, { name: "../../etc/passwd.jpg", bytes: jpeg });
    expect(res.status).toBe(201);
    expect(res.body.upload.originalName).toBe("passwd.jpg");
    const win = await upload(crew.mechanic, { engineId: String(engine) }, { name: "..\\..\\boot\\.evil<script>.png", bytes: png });
    expect(win.body.upload.originalName).toBe("evil_script_.png");
    const row = await testDb()("uploads").where({ id: win.body.upload.id }).first();
    expect(row.object_key.startsWith(`org-${crew.orgId}/`)).toBe(true);
    expect(row.object_key).not.toContain("..");
  });

  it("attaches photos to a reading set, when uploaded before or after the set is saved", async () => {
    const engine = await engineIn(crew.orgId);
    const before = (await upload(crew.mechanic, { engineId: String(engine), cylinderNo: "1" }, { name: "bore.jpg", bytes: jpeg })).body.upload;
    const set = await crew.mechanic.post("/api/v1/reading-sets", {
      engineId: engine,
      takenOn: daysAgo(1),
      setKind: "teardown",
      cylinders: [{ cylinderNo: 1, squishAMm: 1.2, squishBMm: 1.2 }],
      uploadIds: [before.id],
    });
    expect(set.status).toBe(201);
    const after = await upload(crew.mechanic, { readingSetId: String(set.body.readingSet.id) }, { name: "plate.png", bytes: png });
    expect(after.body.upload.engineId).toBe(engine);
    const read = await crew.viewer.get(`/api/v1/reading-sets/${set.body.readingSet.id}`);
    expect(read.body.readingSet.uploads.map((u: { id: number }) => u.id).sort()).toEqual([before.id, after.body.upload.id].sort());
    const otherEngine = await engineIn(crew.orgId);
    const stray = await crew.mechanic.post("/api/v1/reading-sets", { engineId: otherEngine, takenOn: daysAgo(1), setKind: "teardown", cylinders: [{ cylinderNo: 1, leakdownPct: 5 }], uploadIds: [before.id] });
    expect(stray.status).toBe(400);
    expect(await testDb()("reading_sets").where({ engine_id: otherEngine }).first()).toBeUndefined();
  });

  it("serves files only inside their organisation and takes uploads only from the crew", async () => {
    const engine = await engineIn(crew.orgId);
    const u = (await upload(crew.mechanic, { engineId: String(engine) }, { name: "a.jpg", bytes: jpeg })).body.upload;
    expect((await getBytes(other.viewer, u.url)).status).toBe(404);
    expect((await getBytes(other.owner, u.thumbnailUrl)).status).toBe(404);
    expect((await getBytes(new ApiClient(), u.url)).status).toBe(401);
    const rows = await uploadRows(crew.orgId);
    const byViewer = await upload(crew.viewer, { engineId: String(engine) }, { name: "b.jpg", bytes: jpeg });
    expect(byViewer.status).toBe(403);
    expect(byViewer.body.error.code).toBe("forbidden");
    expect((await upload(new ApiClient(), { engineId: String(engine) }, { name: "c.jpg", bytes: jpeg })).status).toBe(401);
    const intoTheirs = await upload(other.owner, { engineId: String(engine) }, { name: "d.jpg", bytes: jpeg });
    expect(intoTheirs.status).toBe(400);
    expect(await uploadRows(crew.orgId)).toBe(rows);
    expect((await crew.viewer.delete(`/api/v1/uploads/${u.id}`)).status).toBe(403);
    expect((await other.owner.delete(`/api/v1/uploads/${u.id}`)).status).toBe(404);
    expect((await crew.mechanic.delete(`/api/v1/uploads/${u.id}`)).body.upload.archivedAt).not.toBeNull();
    expect((await crew.viewer.get(`/api/v1/uploads?engineId=${engine}`)).body.uploads).toHaveLength(0);
  });

  it("asks for multipart/form-data and a file", async () => {
    const engine = await engineIn(crew.orgId);
    expect((await crew.mechanic.post("/api/v1/uploads", { engineId: engine })).status).toBe(415);
    const noFile = await upload(crew.mechanic, { engineId: String(engine) }, null);
    expect(noFile.status).toBe(400);
    expect(noFile.body.error.fields.file).toBeTruthy();
    const noTarget = await upload(crew.mechanic, {}, { name: "x.jpg", bytes: jpeg });
    expect(noTarget.status).toBe(400);
    expect(noTarget.body.error.fields.engineId).toBeTruthy();
  });
});
