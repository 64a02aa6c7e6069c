import { defineApi } from "../../../../server/http.ts";
import { jobMoveSchema, jobUpdateSchema } from "../../../../lib/schemas/season.ts";
import { idParam } from "../../../../server/route-params.ts";
import { getJob, NO_JOB, updateJob } from "../../../../server/services/jobs-service.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { moveJob } from "../../../../server/services/season-plan-service.ts";

export const GET = defineApi({
  permission: "season:read",
  handler: async ({ context, membership }) => ({ job: await getJob(membership.organisationId, idParam(context.params, "id", NO_JOB)) }),
});

/** Works the job: state (start, put back, finish, cancel), checklist, parts, labour, notes. */
export const PATCH = defineApi({
  permission: "job:work",
  input: jobUpdateSchema,
  handler: async (args) => updateJob(actorFrom(args), idParam(args.context.params, "id", NO_JOB), args.input),
});

/** Moves a planned job to another day ({"startsOn": "…"}): re-checked and re-planned, or refused with the reason (409). */
export const POST = defineApi({
  permission: "season:plan",
  input: jobMoveSchema,
  handler: async (args) => ({ accepted: true, diff: await moveJob(actorFrom(args), idParam(args.context.params, "id", NO_JOB), args.input.startsOn) }),
});
