import { defineApi, json } from "../../../../server/http.ts";
import { can } from "../../../../lib/permissions.ts";
import { readingSetCreateSchema, readingSetListQuerySchema } from "../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { createReadingSet, listReadingSets } from "../../../../server/services/readings-service.ts";

export const GET = defineApi({
  permission: "engine:read",
  input: readingSetListQuerySchema,
  handler: async ({ input, membership }) => listReadingSets(membership.organisationId, input),
});

/** A whole set with every cylinder, in one transaction. Marking it baseline needs reading:baseline. */
export const POST = defineApi({
  permission: "reading:create",
  input: readingSetCreateSchema,
  handler: async (args) => json({ readingSet: await createReadingSet(actorFrom(args), args.input, can(args.membership, "reading:baseline")) }, 201),
});
