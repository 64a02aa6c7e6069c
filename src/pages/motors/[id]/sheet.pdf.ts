// access: engine:read
import type { APIRoute } from "astro";
import { requirePermission } from "../../../server/auth/guard.ts";
import { notFound } from "../../../server/errors.ts";
import { errorResponse } from "../../../server/http.ts";
import { renderBuildSheetPdf } from "../../../server/motors-ui-build-sheet-pdf.ts";
import { loadBuildSheet } from "../../../server/services/motors-ui-build-sheet-service.ts";
import { loadUnitPreferences } from "../../../server/services/preferences-service.ts";

/** The engine's build sheet as a PDF download; another organisation's engine answers 404. */
export const GET: APIRoute = async (context) => {
  try {
    const membership = requirePermission(context.locals, "engine:read");
    const raw = context.params.id ?? "";
    if (!/^[1-9]\d{0,14}$/.test(raw)) throw notFound("No engine with that id in this organisation.");
    const { units } = await loadUnitPreferences(context.locals.user!.id, membership.organisationId);
    const sheet = await loadBuildSheet(membership.organisationId, membership.organisationName, Number(raw), units, new Date());
    const pdf = await renderBuildSheetPdf(sheet, units);
    const name = `build-sheet-${sheet.engine.name}-${sheet.printedOn}.pdf`.replace(/[^A-Za-z0-9._-]/g, "_");
    return new Response(new Uint8Array(pdf), {
      status: 200,
      headers: {
        "content-type": "application/pdf",
        "content-length": String(pdf.length),
        "content-disposition": `attachment; filename="${name}"`,
        "cache-control": "private, no-store",
        "x-content-type-options": "nosniff",
      },
    });
  } catch (err) {
    return errorResponse(err);
  }
};
