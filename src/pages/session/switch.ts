// access: signed-in
import type { APIRoute } from "astro";
import { switchOrgSchema } from "../../lib/schemas/auth.ts";
import { switchOrganisation } from "../../server/services/auth-service.ts";

export const POST: APIRoute = async (context) => {
  const user = context.locals.user;
  if (!user) return context.redirect("/sign-in", 303);
  const form = await context.request.formData().catch(() => null);
  // A form sends the id as its digits; anything else stays text and the schema refuses it.
  const raw = form?.get("organisationId");
  const parsed = switchOrgSchema.safeParse({ organisationId: typeof raw === "string" && /^[1-9]\d{0,14}$/.test(raw) ? Number(raw) : raw });
  if (parsed.success) {
    try {
      await switchOrganisation(user.id, parsed.data.organisationId);
    } catch {
      // Not a member: stay where you are.
    }
  }
  return context.redirect("/", 303);
};
