import { z } from "zod";
import { defineApi } from "../../../../server/http.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { archiveUsage, getUsage } from "../../../../server/services/usage-service.ts";
import { idParam } from "../../../../server/route-params.ts";

const NO_ENTRY = "No usage entry with that id in this organisation.";

export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => ({ entry: await getUsage(membership.organisationId, idParam(context.params, "id", NO_ENTRY)) }),
});

/** Only archiving (or restoring) is possible: usage is never edited or deleted. */
export const PATCH = defineApi({
  permission: "usage:log",
  input: z.strictObject({ archived: z.boolean({ error: "Say true or false." }) }),
  handler: async (args) => ({ entry: await archiveUsage(actorFrom(args), idParam(args.context.params, "id", NO_ENTRY), args.input.archived) }),
});

export const DELETE = defineApi({
  permission: "usage:log",
  handler: async (args) => ({ entry: await archiveUsage(actorFrom(args), idParam(args.context.params, "id", NO_ENTRY), true) }),
});
