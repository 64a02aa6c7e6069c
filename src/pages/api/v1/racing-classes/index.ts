import { z } from "zod";
import { defineApi, json } from "../../../../server/http.ts";
import { racingClassCreateSchema } from "../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { createRacingClass, listRacingClasses } from "../../../../server/services/racing-classes-service.ts";

const listQuery = z.object({ includeArchived: z.enum(["true", "false"]).optional() });

export const GET = defineApi({
  permission: "engine:read",
  input: listQuery,
  handler: async ({ input, membership }) => ({ racingClasses: await listRacingClasses(membership.organisationId, input.includeArchived === "true") }),
});

export const POST = defineApi({
  permission: "engine:update",
  input: racingClassCreateSchema,
  handler: async (args) => json({ racingClass: await createRacingClass(actorFrom(args), args.input) }, 201),
});
