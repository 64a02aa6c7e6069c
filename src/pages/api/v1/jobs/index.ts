import { defineApi, json } from "../../../../server/http.ts";
import { jobCreateSchema, jobListQuery } from "../../../../lib/schemas/season.ts";
import { listJobs } from "../../../../server/services/jobs-service.ts";
import { actorFrom } from "../../../../server/services/motors-common.ts";
import { addPinnedJob } from "../../../../server/services/season-plan-service.ts";

export const GET = defineApi({
  permission: "season:read",
  input: jobListQuery,
  handler: async ({ input, membership }) => ({
    jobs: await listJobs(membership.organisationId, { states: input.state ? [input.state] : undefined, engineId: input.engineId, from: input.from, to: input.to }),
  }),
});

/** A manager adds a job on a chosen day; it is held as a pin and the season is re-planned around it. */
export const POST = defineApi({
  permission: "season:plan",
  input: jobCreateSchema,
  handler: async (args) => json({ accepted: true, diff: await addPinnedJob(actorFrom(args), args.input) }, 201),
});
