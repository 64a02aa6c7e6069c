// access: public
import type { APIRoute } from "astro";
import { db } from "../../db/client.ts";
import { json } from "../../server/http.ts";

/** Ready when the database answers and no migration is pending. */
export const GET: APIRoute = async () => {
  try {
    await db().raw("select 1");
    const [, pending] = (await db().migrate.list()) as [unknown[], unknown[]];
    if (pending.length > 0) return json({ ok: false, reason: `${pending.length} migration(s) pending` }, 503);
    return json({ ok: true });
  } catch {
    return json({ ok: false, reason: "database unreachable" }, 503);
  }
};
