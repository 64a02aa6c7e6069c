import { defineApi } from "../../../../server/http.ts";
import { chassisUpdateSchema } from "../../../../lib/schemas/motors.ts";
import { getChassis, updateChassis } from "../../../../server/services/chassis-service.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { idParam } from "../../../../server/route-params.ts";

const NO_CHASSIS = "No chassis with that id in this organisation.";

export const GET = defineApi({
  permission: "engine:read",
  handler: async ({ context, membership }) => getChassis(membership.organisationId, idParam(context.params, "id", NO_CHASSIS)),
});

export const PATCH = defineApi({
  permission: "chassis:update",
  input: chassisUpdateSchema,
  handler: async (args) => ({ chassis: await updateChassis(actorFrom(args), idParam(args.context.params, "id", NO_CHASSIS), args.input) }),
});

export const DELETE = defineApi({
  permission: "chassis:update",
  handler: async (args) => ({ chassis: await updateChassis(actorFrom(args), idParam(args.context.params, "id", NO_CHASSIS), { archived: true }) }),
});
