import { defineApi } from "../../../../server/http.ts";
import { racingClassUpdateSchema } from "../../../../lib/schemas/motors.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { getRacingClass, updateRacingClass } from "../../../../server/services/racing-classes-service.ts";
import { idParam } from "../../../../server/route-params.ts";

const NO_CLASS = "No racing class with that id in this organisation.";

export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => ({ racingClass: await getRacingClass(membership.organisationId, idParam(context.params, "id", NO_CLASS)) }),
});

export const PATCH = defineApi({
  permission: "engine:update",
  input: racingClassUpdateSchema,
  handler: async (args) => ({ racingClass: await updateRacingClass(actorFrom(args), idParam(args.context.params, "id", NO_CLASS), args.input) }),
});

/** Archives the class; engines keep their reference but no longer show compliance against it. */
export const DELETE = defineApi({
  permission: "engine:update",
  handler: async (args) => ({ racingClass: await updateRacingClass(actorFrom(args), idParam(args.context.params, "id", NO_CLASS), { archived: true }) }),
});
