import { z } from "zod";
import { defineApi } from "../../../../server/http.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { archiveReadingSet, getReadingSet } from "../../../../server/services/readings-service.ts";
import { idParam } from "../../../../server/route-params.ts";

const NO_SET = "No reading set with that id in this organisation.";

export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => ({ readingSet: await getReadingSet(membership.organisationId, idParam(context.params, "id", NO_SET)) }),
});

/** Readings are never edited: a wrong set is archived (and can be restored), then entered again. */
export const PATCH = defineApi({
  permission: "reading:baseline",
  input: z.strictObject({ archived: z.boolean({ error: "Say true or false." }) }),
  handler: async (args) => ({ readingSet: await archiveReadingSet(actorFrom(args), idParam(args.context.params, "id", NO_SET), args.input.archived) }),
});

export const DELETE = defineApi({
  permission: "reading:baseline",
  handler: async (args) => ({ readingSet: await archiveReadingSet(actorFrom(args), idParam(args.context.params, "id", NO_SET), true) }),
});
