import { beforeAll, beforeEach, describe, expect, it } from "vitest";
import { ApiClient } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";
import { addMember, createOrganisation, createUser, uniqueSuffix } from "../factories/people.ts";

// The roster reads a page of ids with only the joins it needs and, for a descending sort by an
// indexed counter, walks the counter index to the page's smallest value first. These tests hold
// every page to an order computed here from the rows themselves: counter value (no counter row
// counts as zero) descending, then name, then id; archived engines left out.

const PASSWORD = "a-long-roster-order-password";
const ENGINES = 90;
let api: ApiClient;
let orgId: number;

interface Expected {
  id: number;
  name: string;
  status: string;
  top: number;
  bottom: number;
}

beforeAll(async () => {
  const s = uniqueSuffix();
  orgId = await createOrganisation(testDb(), { name: `Roster order ${s}`, slug: `roster-order-${s}` });
  const email = `roster-order-${s}@test.example`;
  const userId = await createUser(testDb(), { email, name: `Owner ${s}`, password: PASSWORD });
  await addMember(testDb(), orgId, userId, "owner");
  await testDb()("users").where({ id: userId }).update({ last_org_id: orgId });
  const statuses = ["running", "bench", "spare"];
  // Names in reverse of id order, so a tie broken by id instead of name would show.
  await testDb()("engines").insert(
    Array.from({ length: ENGINES }, (_, i) => ({
      organisation_id: orgId,
      name: `R-${String(ENGINES - i).padStart(3, "0")}`,
      cylinders: 1,
      bore_mm: 72,
      stroke_mm: 73.8,
      status: statuses[i % 3],
      archived_at: i % 17 === 5 ? new Date() : null,
    })),
  );
  const ids: number[] = (await testDb()("engines").where({ organisation_id: orgId }).orderBy("id").pluck("id")).map(Number);
  // A top end for most engines (the counter row), usage in few distinct amounts (many ties), and
  // every ninth engine with neither (no counter row at all).
  await testDb()("services").insert(
    ids.filter((_, i) => i % 9 !== 0).map((id, i) => ({ organisation_id: orgId, engine_id: id, kind: i % 2 ? "top_end" : "bottom_end", done_on: "2026-01-10" })),
  );
  const usage = ids.flatMap((id, i) =>
    i % 9 === 0 ? [] : Array.from({ length: i % 4 }, (_, u) => ({ organisation_id: orgId, engine_id: id, occurred_on: u % 2 ? "2025-12-01" : "2026-02-01", amount: 1.5, source: "manual" })),
  );
  await testDb()("usage_entries").insert(usage);
  api = new ApiClient();
  await clearSignInAttempts();
  await api.signIn(email, PASSWORD);
});

beforeEach(async () => {
  await clearSignInAttempts();
});

async function expectedOrder(column: "since_top_end" | "since_bottom_end", status?: string): Promise<Expected[]> {
  const rows = await testDb()("engines as e")
    .leftJoin("engine_counters as ct", "ct.engine_id", "e.id")
    .where("e.organisation_id", orgId)
    .whereNull("e.archived_at")
    .select("e.id", "e.name", "e.status", "ct.since_top_end", "ct.since_bottom_end");
  const list: Expected[] = rows
    .map((r) => ({ id: Number(r.id), name: r.name, status: r.status, top: Number(r.since_top_end ?? 0), bottom: Number(r.since_bottom_end ?? 0) }))
    .filter((r) => !status || r.status === status);
  const value = (r: Expected): number => (column === "since_top_end" ? r.top : r.bottom);
  return list.sort((a, b) => value(b) - value(a) || (a.name < b.name ? -1 : a.name > b.name ? 1 : 0) || a.id - b.id);
}

async function readAllPages(query: string, perPage: number): Promise<number[]> {
  const out: number[] = [];
  for (let page = 1; page <= 40; page += 1) {
    const res = await api.get(`/api/v1/engines?${query}&perPage=${perPage}&page=${page}`);
    expect(res.status).toBe(200);
    const ids = (res.body.engines as { id: number }[]).map((e) => e.id);
    out.push(...ids);
    if (ids.length < perPage) break;
  }
  return out;
}

describe("roster order by a counter", () => {
  it("has ties and engines without a counter row to order (the data is not trivial)", async () => {
    const expected = await expectedOrder("since_top_end");
    const values = expected.map((r) => r.top);
    expect(new Set(values).size).toBeLessThan(values.length / 3);
    expect(values.filter((v) => v === 0).length).toBeGreaterThan(5);
    const withoutRow = await testDb()("engines as e")
      .leftJoin("engine_counters as ct", "ct.engine_id", "e.id")
      .where("e.organisation_id", orgId)
      .whereNull("e.archived_at")
      .whereNull("ct.engine_id")
      .count<{ n: number }[]>({ n: "*" })
      .first();
    expect(Number(withoutRow!.n)).toBeGreaterThan(3);
  });

  it.each([
    { query: "sort=-sinceTopEnd", column: "since_top_end", status: undefined, perPage: 7 },
    { query: "sort=-sinceTopEnd", column: "since_top_end", status: undefined, perPage: 50 },
    { query: "sort=-sinceBottomEnd", column: "since_bottom_end", status: undefined, perPage: 11 },
    { query: "sort=-sinceTopEnd&status=running", column: "since_top_end", status: "running", perPage: 4 },
  ] as const)("pages $query, $perPage per page, in the order computed from the rows", async ({ query, column, status, perPage }) => {
    const expected = (await expectedOrder(column, status)).map((r) => r.id);
    expect(await readAllPages(query, perPage)).toEqual(expected);
  });

  it("counts every live engine once, whatever the sort", async () => {
    const live = await testDb()("engines").where({ organisation_id: orgId }).whereNull("archived_at").count<{ n: number }[]>({ n: "*" }).first();
    for (const sort of ["name", "-sinceTopEnd", "chassis", "topEndShare"]) {
      const res = await api.get(`/api/v1/engines?sort=${sort}&perPage=5`);
      expect(res.status).toBe(200);
      expect(res.body.total).toBe(Number(live!.n));
    }
  });
});
