import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ApiClient, DEMO, signedIn } from "../support/api.ts";
import { clearSignInAttempts, testDb } from "../support/db.ts";

// A person's units: their own per-quantity choices over their own system over the organisation's
// (Kestrel Hollow Racing is imperial in the demo seed).

let chief: ApiClient;

beforeAll(async () => {
  await clearSignInAttempts();
  chief = await signedIn(DEMO.chief);
  await chief.patch("/api/v1/me/preferences", { unitSystem: null, unitChoices: null });
});

afterAll(async () => {
  await chief.patch("/api/v1/me/preferences", { unitSystem: null, unitChoices: null });
});

async function storedRow(): Promise<{ unit_system: string | null; unit_choices: unknown }> {
  return testDb()("users").where({ email: DEMO.chief }).first("unit_system", "unit_choices");
}

describe("/api/v1/me/preferences", () => {
  it("follows the organisation until the person chooses", async () => {
    const res = await chief.get("/api/v1/me/preferences");
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ unitSystem: null, unitChoices: null, organisationUnitSystem: "imperial" });
    expect(res.body.units).toEqual({ length: "in", volume: "in3", pressure: "psi", elevation: "ft", temperature: "F" });
  });

  it("saves a system of the person's own", async () => {
    const res = await chief.patch("/api/v1/me/preferences", { unitSystem: "metric" });
    expect(res.status).toBe(200);
    expect(res.body.units).toEqual({ length: "mm", volume: "cc", pressure: "kPa", elevation: "m", temperature: "C" });
    expect((await storedRow()).unit_system).toBe("metric");
  });

  it("saves per-quantity choices over the system, in the JSON column", async () => {
    const res = await chief.patch("/api/v1/me/preferences", { unitChoices: { pressure: "bar", temperature: "F" } });
    expect(res.status).toBe(200);
    expect(res.body.unitSystem).toBe("metric");
    expect(res.body.unitChoices).toEqual({ pressure: "bar", temperature: "F" });
    expect(res.body.units).toEqual({ length: "mm", volume: "cc", pressure: "bar", elevation: "m", temperature: "F" });
    const row = await storedRow();
    const stored = typeof row.unit_choices === "string" ? JSON.parse(row.unit_choices) : row.unit_choices;
    expect(stored).toEqual({ pressure: "bar", temperature: "F" });
  });

  it("returns to the organisation's units when both are cleared", async () => {
    const res = await chief.patch("/api/v1/me/preferences", { unitSystem: null, unitChoices: null });
    expect(res.status).toBe(200);
    expect(res.body.units.length).toBe("in");
    const row = await storedRow();
    expect(row.unit_system).toBeNull();
    expect(row.unit_choices).toBeNull();
  });

  it.each([
    ["an unknown system", { unitSystem: "nautical" }, "unitSystem"],
    ["an unknown unit", { unitChoices: { length: "furlong" } }, "unitChoices.length"],
    ["an unknown quantity", { unitChoices: { mass: "kg" } }, "unitChoices"],
    ["nothing to change", {}, "body"],
  ])("answers 400 for %s", async (_what, body, field) => {
    const res = await chief.patch("/api/v1/me/preferences", body);
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toContain(field);
  });

  it("needs a session", async () => {
    const res = await new ApiClient().patch("/api/v1/me/preferences", { unitSystem: "metric" });
    expect(res.status).toBe(401);
  });
});
