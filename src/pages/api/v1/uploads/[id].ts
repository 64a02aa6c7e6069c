import { z } from "zod";
import { defineApi } from "../../../../server/http.ts";
import { uploadReadQuerySchema } from "../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { archiveUpload, getUploadContent } from "../../../../server/services/uploads-service.ts";
import { idParam } from "../../../../server/route-params.ts";

const NO_UPLOAD = "No file with that id in this organisation.";

/** The stored bytes, only to members of the file's organisation (another organisation's id answers 404). */
export const GET = defineApi({
  permission: "engine:read",
  input: uploadReadQuerySchema,
  handler: async ({ input, context, membership }) => {
    const content = await getUploadContent(membership.organisationId, idParam(context.params, "id", NO_UPLOAD), input.variant ?? "original");
    const disposition = input.download ? "attachment" : "inline";
    return new Response(new Uint8Array(content.body), {
      status: 200,
      headers: {
        "content-type": content.contentType,
        "content-length": String(content.body.length),
        "content-disposition": `${disposition}; filename="${content.name.replace(/[^A-Za-z0-9._ ()-]/g, "_")}"; filename*=UTF-8''${encodeURIComponent(content.name)}`,
        "cache-control": "private, max-age=300",
        "x-content-type-options": "nosniff",
      },
    });
  },
});

export const PATCH = defineApi({
  permission: "reading:create",
  input: z.strictObject({ archived: z.boolean({ error: "Say true or false." }) }),
  handler: async (args) => ({ upload: await archiveUpload(actorFrom(args), idParam(args.context.params, "id", NO_UPLOAD), args.input.archived) }),
});

export const DELETE = defineApi({
  permission: "reading:create",
  handler: async (args) => ({ upload: await archiveUpload(actorFrom(args), idParam(args.context.params, "id", NO_UPLOAD), true) }),
});
