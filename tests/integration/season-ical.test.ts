import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { BASE_URL, signedIn, type ApiClient } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { createSeasonTeam, SEASON_PASSWORD, shiftDay, todayUtc, type SeasonTeam } from "../factories/season.ts";

// The secret calendar link: made by the person, readable without signing in, and dead once
// revoked or replaced.

let team: SeasonTeam;
let manager: ApiClient;
const today = todayUtc();

beforeAll(async () => {
  await clearSignInAttempts();
  team = await createSeasonTeam(testDb());
  manager = await signedIn(team.emails.manager, SEASON_PASSWORD);
  const ev = await manager.post("/api/v1/events", {
    name: "Frostbite Cup",
    venue: "Larkspur Pond",
    startsOn: shiftDay(today, 10),
    endsOn: shiftDay(today, 12),
    elevationM: 820,
    kind: "race",
    important: true,
    entries: [{ chassisId: team.chassis.c7, expectedUsage: 1.5 }, { chassisId: team.chassis.c11, expectedUsage: 1.5 }],
  });
  expect(ev.status).toBe(201);
  expect((await manager.post("/api/v1/plan", { accept: true })).status).toBe(200);
  expect((await manager.post("/api/v1/jobs", { engineId: team.engines.e3, kind: "inspection", startsOn: shiftDay(today, 4) })).status).toBe(201);
});

beforeEach(async () => {
  await clearSignInAttempts();
});

async function fetchFeed(url: string): Promise<Response> {
  return fetch(`${BASE_URL}${new URL(url).pathname}`);
}

describe("the calendar feed", () => {
  it("serves the events and jobs as text/calendar to anyone holding the link", async () => {
    const made = await manager.post("/api/v1/calendar-feed");
    expect(made.status).toBe(201);
    expect(made.body.url).toMatch(/\/ical\/[A-Za-z0-9_-]{40,}\.ics$/);
    const res = await fetchFeed(made.body.url);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/calendar/);
    const body = await res.text();
    expect(body).toMatch(/^BEGIN:VCALENDAR/);
    expect(body).toContain("SUMMARY:★ Frostbite Cup");
    expect(body).toContain(`DTSTART;VALUE=DATE:${shiftDay(today, 10).replaceAll("-", "")}`);
    // All-day events end the day after their last day.
    expect(body).toContain(`DTEND;VALUE=DATE:${shiftDay(today, 13).replaceAll("-", "")}`);
    expect(body).toContain("SUMMARY:Bench: E3 inspection (planned)");
    const status = await manager.get("/api/v1/calendar-feed");
    expect(status.body).toEqual({ active: true, createdAt: expect.any(String) });
    const stored = await testDb()("calendar_feeds").where({ organisation_id: team.orgId }).first();
    expect(stored.token_hash).not.toContain(new URL(made.body.url).pathname.slice(6, 20));
  });

  it("answers 404 once the link is revoked, and for a replaced link", async () => {
    const first = await manager.post("/api/v1/calendar-feed");
    const second = await manager.post("/api/v1/calendar-feed");
    expect((await fetchFeed(first.body.url)).status).toBe(404);
    expect((await fetchFeed(second.body.url)).status).toBe(200);
    const revoked = await manager.delete("/api/v1/calendar-feed");
    expect(revoked.status).toBe(200);
    expect(revoked.body.active).toBe(false);
    expect((await fetchFeed(second.body.url)).status).toBe(404);
    expect((await fetch(`${BASE_URL}/ical/not-a-real-token-at-all-0000000000.ics`)).status).toBe(404);
    expect((await manager.delete("/api/v1/calendar-feed")).status).toBe(404);
  });

  it("lets every role make its own link, and stops a link when its person leaves", async () => {
    const viewer = await signedIn(team.emails.viewer, SEASON_PASSWORD);
    const made = await viewer.post("/api/v1/calendar-feed");
    expect(made.status).toBe(201);
    expect((await fetchFeed(made.body.url)).status).toBe(200);
    const user = await testDb()("users").where({ email: team.emails.viewer }).first("id");
    await testDb()("memberships").where({ organisation_id: team.orgId, user_id: user.id }).delete();
    expect((await fetchFeed(made.body.url)).status).toBe(404);
  });
});
