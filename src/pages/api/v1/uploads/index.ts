import type { APIRoute } from "astro";
import { defineApi, errorResponse, fieldsFromZod, json, readBoundedBody } from "../../../../server/http.ts";
import { requirePermission, requireUser } from "../../../../server/auth/guard.ts";
import { HttpError, badRequest } from "../../../../server/errors.ts";
import { UPLOAD_BYTES_MAX, uploadFieldsSchema, uploadListQuerySchema } from "../../../../lib/schemas/motors.ts";
import { createUpload, listUploads } from "../../../../server/services/uploads-service.ts";

/** Room for the form's boundaries and text fields around a file of the largest allowed size. */
const MULTIPART_MAX_BYTES = UPLOAD_BYTES_MAX + 256 * 1024;

function tooLarge(): HttpError {
  return new HttpError(413, "too_large", "Files may be at most 15 MB.", { file: "Files may be at most 15 MB." });
}

export const GET = defineApi({
  permission: "engine:read",
  input: uploadListQuerySchema,
  handler: async ({ input, membership }) => ({ uploads: await listUploads(membership.organisationId, input) }),
});

/**
 * multipart/form-data with a `file` and `engineId` or `readingSetId` (optional `cylinderNo`,
 * `caption`). Not JSON, so not defineApi: the same permission check and error shape by hand.
 */
export const POST: APIRoute = async (context) => {
  try {
    const user = requireUser(context.locals);
    const membership = requirePermission(context.locals, "reading:create");
    const type = context.request.headers.get("content-type") ?? "";
    if (!/^multipart\/form-data\b/i.test(type)) {
      throw new HttpError(415, "unsupported_media_type", "Send the file as multipart/form-data.");
    }
    const raw = await readBoundedBody(context.request, { maxBytes: MULTIPART_MAX_BYTES, tooLarge });
    let form: FormData;
    try {
      form = await new Request(context.url, { method: "POST", headers: { "content-type": type }, body: raw }).formData();
    } catch {
      throw badRequest("The form could not be read.", { file: "The form could not be read." });
    }
    const file = form.get("file");
    if (!(file instanceof File)) throw badRequest("Choose a file.", { file: "Choose a file." });
    const text: Record<string, string> = {};
    for (const [key, value] of form.entries()) if (key !== "file" && typeof value === "string") text[key] = value;
    const fields = uploadFieldsSchema.safeParse(text);
    if (!fields.success) throw badRequest("Some fields are not valid.", fieldsFromZod(fields.error));
    const upload = await createUpload(
      { membership, userId: user.id, now: new Date() },
      fields.data,
      { name: file.name, bytes: Buffer.from(await file.arrayBuffer()) },
    );
    return json({ upload }, 201);
  } catch (err) {
    return errorResponse(err);
  }
};
