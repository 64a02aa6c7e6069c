// access: public
import type { APIRoute } from "astro";
import { errorResponse } from "../../server/http.ts";
import { renderFeed } from "../../server/services/calendar-feed-service.ts";

/** The season plan as iCalendar for a crew phone; the secret token in the link is the key. */
export const GET: APIRoute = async ({ params }) => {
  try {
    const body = await renderFeed(params.token ?? "", new Date());
    if (body === null) return new Response("This calendar link is not valid any more.\n", { status: 404, headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" } });
    return new Response(body, {
      status: 200,
      headers: { "content-type": "text/calendar; charset=utf-8", "cache-control": "no-store", "content-disposition": 'inline; filename="ringland-season.ics"' },
    });
  } catch (err) {
    return errorResponse(err);
  }
};
