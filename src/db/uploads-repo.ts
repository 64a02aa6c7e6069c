import type { Knex } from "knex";
import type { Upload } from "../lib/motors/types.ts";
import { db } from "./client.ts";
import { toIso } from "./row-values.ts";

export interface UploadRow {
  id: number;
  organisation_id: number;
  engine_id: number | null;
  reading_set_id: number | null;
  cylinder_no: number | null;
  object_key: string;
  thumbnail_key: string | null;
  content_type: string;
  byte_size: number;
  original_name: string;
  caption: string | null;
  uploaded_by: string | null;
  archived_at: Date | null;
  created_at: Date;
  user_name?: string | null;
}

export function toUpload(r: UploadRow): Upload {
  const url = `/api/v1/uploads/${r.id}`;
  return {
    id: Number(r.id),
    engineId: r.engine_id === null ? null : Number(r.engine_id),
    readingSetId: r.reading_set_id === null ? null : Number(r.reading_set_id),
    cylinderNo: r.cylinder_no === null ? null : Number(r.cylinder_no),
    contentType: r.content_type,
    byteSize: Number(r.byte_size),
    originalName: r.original_name,
    caption: r.caption,
    url,
    thumbnailUrl: r.thumbnail_key ? `${url}?variant=thumbnail` : null,
    uploadedBy: r.uploaded_by ? { id: r.uploaded_by, name: r.user_name ?? "" } : null,
    createdAt: toIso(r.created_at) ?? "",
    archivedAt: toIso(r.archived_at),
  };
}

export async function findUploadRow(organisationId: number, id: number, k: Knex = db()): Promise<UploadRow | undefined> {
  return k("uploads as up")
    .leftJoin("users as u", "u.id", "up.uploaded_by")
    .where({ "up.organisation_id": organisationId, "up.id": id })
    .select("up.*", "u.name as user_name")
    .first();
}

export async function listUploadRows(
  organisationId: number,
  f: { engineId?: number; readingSetIds?: number[]; includeArchived?: boolean },
  k: Knex = db(),
): Promise<UploadRow[]> {
  const q = k("uploads as up")
    .leftJoin("users as u", "u.id", "up.uploaded_by")
    .where("up.organisation_id", organisationId)
    .select("up.*", "u.name as user_name")
    .orderBy("up.created_at", "desc")
    .orderBy("up.id", "desc");
  if (f.engineId !== undefined) q.where("up.engine_id", f.engineId);
  if (f.readingSetIds !== undefined) {
    if (f.readingSetIds.length === 0) return [];
    q.whereIn("up.reading_set_id", f.readingSetIds);
  }
  if (!f.includeArchived) q.whereNull("up.archived_at");
  return q;
}
