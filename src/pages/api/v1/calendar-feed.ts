import { defineApi, json } from "../../../server/http.ts";
import { createFeed, getFeedStatus, revokeFeed } from "../../../server/services/calendar-feed-service.ts";
import { actorFrom } from "../../../server/services/motors-common.ts";

/** Whether the signed-in person has a live calendar link (the link itself is shown only once). */
export const GET = defineApi({
  permission: "season:read",
  handler: async (args) => getFeedStatus(actorFrom(args)),
});

/** Creates a new secret link (revoking any older one) and answers with it. */
export const POST = defineApi({
  permission: "season:read",
  handler: async (args) => json(await createFeed(actorFrom(args)), 201),
});

export const DELETE = defineApi({
  permission: "season:read",
  handler: async (args) => revokeFeed(actorFrom(args)),
});
