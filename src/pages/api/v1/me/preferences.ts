import { preferencesPatchSchema } from "../../../../lib/schemas/preferences.ts";
import { defineApi } from "../../../../server/http.ts";
import { loadUnitPreferences, saveUnitPreferences } from "../../../../server/services/preferences-service.ts";

/** GET /api/v1/me/preferences: the signed-in person's units and where they come from. */
export const GET = defineApi({
  permission: "signed-in",
  handler: async ({ membership, userId }) => loadUnitPreferences(userId, membership?.organisationId ?? null),
});

/** PATCH /api/v1/me/preferences { unitSystem?, unitChoices? }: null returns to the default. */
export const PATCH = defineApi({
  permission: "signed-in",
  input: preferencesPatchSchema,
  handler: async ({ input, membership, userId }) => saveUnitPreferences(userId, membership?.organisationId ?? null, input),
});
