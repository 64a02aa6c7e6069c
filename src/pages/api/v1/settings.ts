import { defineApi } from "../../../server/http.ts";
import { settingsPatchSchema } from "../../../lib/schemas/settings.ts";
import { loadSettings, updateSettings } from "../../../server/services/settings-service.ts";

export const GET = defineApi({
  permission: "org:read",
  handler: async ({ membership }) => ({ settings: await loadSettings(membership.organisationId) }),
});

export const PATCH = defineApi({
  permission: "settings:manage",
  input: settingsPatchSchema,
  handler: async ({ input, membership, userId }) => ({ settings: await updateSettings(membership.organisationId, userId, input) }),
});
