import ical from "ical-generator";
import { db } from "../../db/client.ts";
import { can } from "../../lib/permissions.ts";
import { JOB_KIND_LABELS, JOB_STATE_LABELS } from "../../lib/season/types.ts";
import type { ActiveMembership } from "../auth/guard.ts";
import { appUrl } from "../env.ts";
import { notFound } from "../errors.ts";
import { hashToken, newToken } from "../tokens.ts";
import { writeAudit } from "./audit.ts";
import type { Actor } from "./motors-common.ts";
import { shiftDay } from "./season-input.ts";
import { loadDataFor } from "./season-plan-service.ts";
import { assemblePlanView, loadStoredPlan } from "./season-plan-view.ts";

// A secret, revocable iCalendar link per person and organisation, for crew phones: the events,
// the bench jobs and the projected due dates of the accepted plan. Only the link's hash is
// stored; a new link revokes the old one.

export interface FeedStatus {
  active: boolean;
  createdAt: string | null;
  /** The link itself, only in the answer that created it. */
  url?: string;
}


export async function getFeedStatus(actor: Actor): Promise<FeedStatus> {
  const row = await db()("calendar_feeds")
    .where({ user_id: actor.userId, organisation_id: actor.membership.organisationId })
    .whereNull("revoked_at")
    .orderBy("id", "desc")
    .first();
  return { active: Boolean(row), createdAt: row ? new Date(row.created_at).toISOString() : null };
}

export async function createFeed(actor: Actor): Promise<FeedStatus> {
  const organisationId = actor.membership.organisationId;
  const { token, tokenHash } = newToken();
  await db().transaction(async (trx) => {
    await trx("calendar_feeds").where({ user_id: actor.userId, organisation_id: organisationId }).whereNull("revoked_at").update({ revoked_at: actor.now, updated_at: trx.fn.now() });
    const [id] = await trx("calendar_feeds").insert({ token_hash: tokenHash, user_id: actor.userId, organisation_id: organisationId });
    await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "calendar_feed.created", entity: "calendar_feed", entityId: id });
  });
  return { active: true, createdAt: actor.now.toISOString(), url: `${appUrl()}/ical/${token}.ics` };
}

export async function revokeFeed(actor: Actor): Promise<FeedStatus> {
  const organisationId = actor.membership.organisationId;
  await db().transaction(async (trx) => {
    const n = await trx("calendar_feeds").where({ user_id: actor.userId, organisation_id: organisationId }).whereNull("revoked_at").update({ revoked_at: actor.now, updated_at: trx.fn.now() });
    if (n === 0) throw notFound("You have no calendar link to revoke.");
    await writeAudit(trx, { organisationId, actorUserId: actor.userId, action: "calendar_feed.revoked", entity: "calendar_feed", entityId: null });
  });
  return { active: false, createdAt: null };
}

function atDay(day: string): Date {
  return new Date(`${day}T00:00:00Z`);
}

/** The feed of a live link, or null (unknown, revoked, or the person left the organisation). */
export async function renderFeed(token: string, now: Date): Promise<string | null> {
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) return null;
  const row = await db()("calendar_feeds as f")
    .join("memberships as m", function () {
      this.on("m.user_id", "=", "f.user_id").andOn("m.organisation_id", "=", "f.organisation_id");
    })
    .join("organisations as o", "o.id", "f.organisation_id")
    .where("f.token_hash", hashToken(token))
    .whereNull("f.revoked_at")
    .first("f.organisation_id", "m.role", "o.name");
  if (!row || !can({ role: row.role } as Pick<ActiveMembership, "role">, "season:read")) return null;
  const organisationId = Number(row.organisation_id);
  const data = await loadDataFor(organisationId, now);
  const view = await assemblePlanView(data, await loadStoredPlan(organisationId), organisationId);
  const base = appUrl();
  const cal = ical({ name: `${row.name}: season plan`, prodId: { company: "Ringland", product: "season-plan", language: "EN" } });
  const stamp = now;
  for (const ev of view.events) {
    const entries = ev.entries.map((x) => `${x.chassisNumber}: ${x.engineName ?? "no engine yet"} (${x.expectedUsage} ${view.usageUnit})`);
    cal.createEvent({
      id: `ringland-event-${ev.id}@${new URL(base).host}`,
      allDay: true,
      start: atDay(ev.startsOn),
      end: atDay(shiftDay(ev.endsOn, 1)),
      stamp,
      summary: `${ev.important ? "★ " : ""}${ev.name}`,
      location: ev.venue ? `${ev.venue}, ${ev.elevationM} m` : `${ev.elevationM} m`,
      description: [`${ev.kind}, ${ev.elevationM} m above sea level`, ...entries].join("\n"),
      url: `${base}/season?event=${ev.id}`,
    });
  }
  for (const job of view.jobs.filter((j) => j.state !== "done")) {
    cal.createEvent({
      id: `ringland-job-${job.id}@${new URL(base).host}`,
      allDay: true,
      start: atDay(job.startsOn),
      end: atDay(shiftDay(job.endsOn, 1)),
      stamp,
      summary: `Bench: ${job.engineName} ${JOB_KIND_LABELS[job.kind].toLowerCase()} (${JOB_STATE_LABELS[job.state].toLowerCase()})`,
      description: [`${job.labourHoursPlanned} h of labour planned`, job.reason ?? ""].filter(Boolean).join("\n"),
      url: `${base}/bench?job=${job.id}`,
    });
  }
  for (const w of view.watchPoints) {
    cal.createEvent({
      id: `ringland-due-${w.engineId}-${w.kind}-${w.date}@${new URL(base).host}`,
      allDay: true,
      start: atDay(w.date),
      end: atDay(shiftDay(w.date, 1)),
      stamp,
      summary: `Due soon: ${w.engineName} ${w.counter}`,
      description: `Projected ${w.usageAfter} of ${w.limit} ${view.usageUnit} on the ${w.counter} after this day.`,
    });
  }
  return cal.toString();
}
