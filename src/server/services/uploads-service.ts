import { randomUUID } from "node:crypto";
import { fileTypeFromBuffer } from "file-type";
import sharp from "sharp";
import { db } from "../../db/client.ts";
import { findEngineRow } from "../../db/engines-repo.ts";
import { findReadingSetRow } from "../../db/reading-sets-repo.ts";
import { findUploadRow, listUploadRows, toUpload } from "../../db/uploads-repo.ts";
import type { Upload } from "../../lib/motors/types.ts";
import { UPLOAD_BYTES_MAX, UPLOAD_TYPES, type UploadFields } from "../../lib/schemas/motors.ts";
import { HttpError, badRequest, notFound } from "../errors.ts";
import type { ObjectStorage } from "../storage/s3.ts";
import { defaultStorage } from "../storage/default-storage.ts";
import { writeAudit } from "./audit.ts";
import type { Actor } from "./motors-common.ts";

// Photos and PDFs. The type is read from the bytes, never from the name. The original and the
// thumbnail go to object storage first, then the row is written; if anything fails, whatever
// was stored is deleted again, so a failed upload leaves neither a row nor an object behind.

export const THUMBNAIL_PX = 320;
const NO_UPLOAD = "No file with that id in this organisation.";
const EXTENSIONS: Record<(typeof UPLOAD_TYPES)[number], string> = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "application/pdf": "pdf",
};

/** The uploads bucket, configured from the environment once. */
export function uploadStorage(): ObjectStorage {
  return defaultStorage();
}

/** The last path segment, printable, without leading dots, with the extension of the real type. */
export function sanitizeFileName(name: string, contentType: (typeof UPLOAD_TYPES)[number]): string {
  const base = name.split(/[\\/]/).pop() ?? "";
  const cleaned = base
    .normalize("NFC")
    .replace(/[\p{Cc}\p{Cf}]/gu, "")
    .replace(/[^\p{L}\p{N}._ ()-]/gu, "_")
    .replace(/\s+/g, " ")
    .replace(/^[.\s]+/, "")
    .trim();
  const ext = EXTENSIONS[contentType];
  const stem = (cleaned.replace(/\.[^.]*$/, "") || "upload").slice(0, 100);
  return `${stem}.${ext}`;
}

export class UploadRejected extends HttpError {}

async function makeThumbnail(bytes: Buffer): Promise<Buffer> {
  try {
    return await sharp(bytes, { failOn: "error" })
      .rotate()
      .resize(THUMBNAIL_PX, THUMBNAIL_PX, { fit: "inside", withoutEnlargement: true })
      .jpeg({ quality: 80, mozjpeg: true })
      .toBuffer();
  } catch {
    throw new UploadRejected(400, "invalid_input", "The image could not be read: it may be damaged.", {
      file: "The image could not be read.",
    });
  }
}

async function resolveTarget(
  organisationId: number,
  fields: UploadFields,
): Promise<{ engineId: number; readingSetId: number | null; cylinderNo: number | null }> {
  let engineId = fields.engineId ?? null;
  let readingSetId: number | null = null;
  if (fields.readingSetId !== undefined) {
    const set = await findReadingSetRow(organisationId, fields.readingSetId);
    if (!set) throw badRequest("No reading set with that id in this organisation.", { readingSetId: "No such reading set." });
    if (engineId !== null && Number(set.engine_id) !== engineId)
      throw badRequest("That set belongs to another engine.", { engineId: "The set belongs to another engine." });
    engineId = Number(set.engine_id);
    readingSetId = Number(set.id);
  }
  const engine = await findEngineRow(organisationId, engineId as number);
  if (!engine) throw badRequest("No engine with that id in this organisation.", { engineId: "No such engine." });
  if (fields.cylinderNo !== undefined && fields.cylinderNo > Number(engine.cylinders)) {
    throw badRequest("That cylinder does not exist on this engine.", { cylinderNo: `${engine.name} has ${engine.cylinders} cylinders.` });
  }
  return { engineId: Number(engine.id), readingSetId, cylinderNo: fields.cylinderNo ?? null };
}

export async function createUpload(actor: Actor, fields: UploadFields, file: { name: string; bytes: Buffer }): Promise<Upload> {
  const organisationId = actor.membership.organisationId;
  if (file.bytes.length === 0) throw badRequest("The file is empty.", { file: "The file is empty." });
  if (file.bytes.length > UPLOAD_BYTES_MAX) {
    throw new UploadRejected(413, "too_large", "Files may be at most 15 MB.", { file: "Files may be at most 15 MB." });
  }
  const sniffed = await fileTypeFromBuffer(file.bytes);
  const contentType = sniffed?.mime as (typeof UPLOAD_TYPES)[number] | undefined;
  if (!contentType || !(UPLOAD_TYPES as readonly string[]).includes(contentType)) {
    throw new UploadRejected(415, "unsupported_media_type", "Only JPEG, PNG and WebP photos and PDF files can be uploaded.", {
      file: "Not a JPEG, PNG, WebP or PDF file (judged by its content, not its name).",
    });
  }
  const target = await resolveTarget(organisationId, fields);
  const originalName = sanitizeFileName(file.name, contentType);
  const stem = `org-${organisationId}/${actor.now.toISOString().slice(0, 7)}/${randomUUID()}`;
  const objectKey = `${stem}.${EXTENSIONS[contentType]}`;
  const isImage = contentType !== "application/pdf";
  const thumbnailKey = isImage ? `${stem}-thumb.jpg` : null;
  const stored: string[] = [];
  const store = uploadStorage();
  const put = async (key: string, body: Buffer, type: string): Promise<void> => {
    // Counted before the call: a put that fails half-way may still have left an object.
    stored.push(key);
    await store.putObject(key, body, type);
  };
  try {
    // The original travels to storage while the thumbnail is made; a damaged image fails the
    // thumbnail after the original may already be stored, and the catch below removes it.
    // Both are awaited to the end, so the cleanup never races a put still in flight.
    const [original, thumbnail] = await Promise.allSettled([
      put(objectKey, file.bytes, contentType),
      isImage ? makeThumbnail(file.bytes) : Promise.resolve(null),
    ]);
    if (original.status === "rejected") throw original.reason;
    if (thumbnail.status === "rejected") throw thumbnail.reason;
    if (thumbnail.value && thumbnailKey) await put(thumbnailKey, thumbnail.value, "image/jpeg");
    const id = await db().transaction(async (trx) => {
      const [newId] = await trx("uploads").insert({
        organisation_id: organisationId,
        engine_id: target.engineId,
        reading_set_id: target.readingSetId,
        cylinder_no: target.cylinderNo,
        object_key: objectKey,
        thumbnail_key: thumbnailKey,
        content_type: contentType,
        byte_size: file.bytes.length,
        original_name: originalName,
        caption: fields.caption ?? null,
        uploaded_by: actor.userId,
      });
      await writeAudit(trx, {
        organisationId,
        actorUserId: actor.userId,
        action: "upload.created",
        entity: "upload",
        entityId: newId,
        details: {
          engineId: target.engineId,
          readingSetId: target.readingSetId,
          contentType,
          byteSize: file.bytes.length,
          name: originalName,
        },
      });
      return Number(newId);
    });
    return toUpload((await findUploadRow(organisationId, id))!);
  } catch (err) {
    await Promise.allSettled(stored.map((key) => store.deleteObject(key)));
    throw err;
  }
}

export async function listUploads(
  organisationId: number,
  q: { engineId?: number; readingSetId?: number; includeArchived?: boolean },
): Promise<Upload[]> {
  const rows = await listUploadRows(organisationId, {
    engineId: q.engineId,
    readingSetIds: q.readingSetId !== undefined ? [q.readingSetId] : undefined,
    includeArchived: q.includeArchived,
  });
  return rows.map(toUpload);
}

export async function getUploadContent(
  organisationId: number,
  id: number,
  variant: "original" | "thumbnail",
): Promise<{ body: Buffer; contentType: string; name: string }> {
  const row = await findUploadRow(organisationId, id);
  if (!row) throw notFound(NO_UPLOAD);
  const key = variant === "thumbnail" ? row.thumbnail_key : row.object_key;
  if (!key) throw notFound("This file has no thumbnail.");
  const object = await uploadStorage().getObject(key);
  if (!object) throw notFound("The stored file is missing.");
  return {
    body: object.body,
    contentType: variant === "thumbnail" ? "image/jpeg" : row.content_type,
    name: variant === "thumbnail" ? row.original_name.replace(/\.[^.]*$/, "-thumbnail.jpg") : row.original_name,
  };
}

/** Photos of readings are kept: archiving hides one from lists, the object stays. */
export async function archiveUpload(actor: Actor, id: number, archived: boolean): Promise<Upload> {
  const organisationId = actor.membership.organisationId;
  await db().transaction(async (trx) => {
    const row = await trx("uploads").where({ organisation_id: organisationId, id }).forUpdate().first();
    if (!row) throw notFound(NO_UPLOAD);
    if ((row.archived_at !== null) === archived) return;
    await trx("uploads")
      .where({ id })
      .update({ archived_at: archived ? actor.now : null, updated_at: trx.fn.now() });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: archived ? "upload.archived" : "upload.restored",
      entity: "upload",
      entityId: id,
    });
  });
  return toUpload((await findUploadRow(organisationId, id))!);
}
