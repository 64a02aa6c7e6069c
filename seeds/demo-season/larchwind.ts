import type { Knex } from "knex";
import { createPart, recordService } from "../../tests/factories/motors.ts";
import { Story, cylinder, eachDay, seededRandom } from "./story.ts";

// Larchwind Trail Tours (DEMO.md): four four-strokes in a tour fleet at 2,408 m, the June–October
// 2026 season logged from the hour meters, an inspection every 100 h, and B-2 losing compression
// over 300 h until a valve job.

const SHOP_M = 2408;
const TOURS = ["Ridge loop", "Lake tour", "Sunset ride", "Canyon day tour"];

interface Rider {
  name: string;
  chassis: string;
  /** Share of tour days this vehicle goes out. */
  share: number;
  seed: number;
  /** Cranking (psi) and leak-down (%) at each inspection, before the story bends them. */
  psi: number;
  leak: number;
}

const FLEET: Rider[] = [
  { name: "B-1", chassis: "11", share: 0.46, seed: 11, psi: 120, leak: 5 },
  { name: "B-2", chassis: "12", share: 0.62, seed: 12, psi: 118, leak: 6 },
  { name: "B-3", chassis: "13", share: 0.42, seed: 13, psi: 121, leak: 5 },
  { name: "B-4", chassis: "21", share: 0.52, seed: 14, psi: 132, leak: 4 },
];

/** B-2 (DEMO.md drift 3): cranking and exhaust-side leak-down at 100, 200 and 300 h. */
const B2_STEPS = [
  { psi: 115, leak: 7 },
  { psi: 108, leak: 10 },
  { psi: 99, leak: 15 },
];

function readingsOf(cylinders: number, psi: number, leak: number, notes?: string): ReturnType<typeof cylinder>[] {
  return Array.from({ length: cylinders }, (_, i) => cylinder(i + 1, { psi: psi - (i === 1 ? 2 : 0), leak: leak + (i === 2 ? 1 : 0), notes }));
}

export async function seedLarchwind(k: Knex, orgId: number, people: Record<string, string | null>): Promise<void> {
  const s = new Story(k, orgId, people);
  for (const [number, kind, meter] of [["11", "atv", 1184.2], ["12", "atv", 1402.7], ["13", "atv", 968.0], ["21", "utv", 734.5]] as const) {
    await s.addChassis({ number, kind, meterKind: "hours", meter, notes: kind === "atv" ? "Tour ATV" : "Tour UTV, six seats" });
  }
  const policy = { cycle: "four_stroke" as const, exhaustOpensDegAtdc: null, topEndLimit: null, bottomEndLimit: null, inspectionInterval: 100, status: "running" as const, buildFuelNote: "Regular unleaded", buildMinOctane: 87, notes: "Oil and filter every 50 h; valves, cranking and leak-down every 100 h." };
  for (const name of ["B-1", "B-2", "B-3"]) {
    await s.addEngine({ name, serial: `LW-9285-${name.slice(2)}`, cylinders: 1, boreMm: 92, strokeMm: 85, rodMm: 148, targetRatio: 10.3, ...policy });
  }
  await s.addEngine({ name: "B-4", serial: "LW-8066-4", cylinders: 3, boreMm: 80, strokeMm: 66.2, rodMm: 118, targetRatio: 11.0, ...policy });

  const carried: Record<string, number> = { "B-1": 1180.0, "B-2": 1398.5, "B-3": 960.0, "B-4": 730.0 };
  for (const r of FLEET) {
    const engine = s.engines.get(r.name)!;
    await createPart(k, orgId, { serial: `CR-${r.name.replace("-", "")}`, kind: "crank", engineId: engine.id, installedOn: "2023-04-01", description: "Crank and rod" });
    await createPart(k, orgId, { serial: `HD-${r.name.replace("-", "")}`, kind: "head", engineId: engine.id, installedOn: "2023-04-01", description: "Cylinder head with valves" });
    for (let c = 1; c <= engine.cylinders; c += 1) {
      await createPart(k, orgId, { serial: `P-${r.name.replace("-", "")}-${c}`, kind: "piston", engineId: engine.id, cylinderNo: c, installedOn: "2023-04-01", usageLimit: 1500 });
    }
    await s.carryOver(r.name, "2025-10-20", carried[r.name], "Hours up to the end of the 2025 season, from the paper logbook");
    await recordService(k, orgId, { engineId: engine.id, kind: "inspection", doneOn: "2026-05-18", notes: "Pre-season: valves, cranking, leak-down", by: people.mechanic });
    await s.read(r.name, "2026-05-19", { elevationM: SHOP_M, airTempC: 16, kind: "build", baseline: true, notes: "Cranking with the throttle open, same gauge every time." }, readingsOf(engine.cylinders, r.psi, r.leak));
    await s.install(r.name, r.chassis, "2026-05-20", true);
  }

  // The tour season, one vehicle at a time (each keeps its own counter since inspection).
  for (const r of FLEET) {
    const engine = s.engines.get(r.name)!;
    const random = seededRandom(r.seed);
    let sinceInspection = 0;
    let step = 0;
    let valveJobDone = r.name !== "B-2";
    let inShopUntil = "";
    for (const day of eachDay("2026-06-01", "2026-10-15")) {
      if (random() > r.share || day <= inShopUntil) continue;
      const hours = Math.round((4.5 + (random() - 0.5) * 1.4) * 10) / 10;
      await s.run(r.name, day, hours, "Tour", TOURS[Math.floor(random() * TOURS.length)], people.mechanic);
      sinceInspection = Math.round((sinceInspection + hours) * 100) / 100;
      if (sinceInspection < 100) continue;
      const isB2 = r.name === "B-2" && step < B2_STEPS.length;
      const values = isB2 ? B2_STEPS[step] : { psi: r.psi - (step % 2), leak: r.leak };
      const last = isB2 && step === B2_STEPS.length - 1;
      await s.read(r.name, day, { elevationM: SHOP_M, airTempC: 21, kind: last ? "teardown" : "between_events", notes: isB2 && step > 0 ? "Leak-down: air heard at the exhaust." : null }, readingsOf(engine.cylinders, values.psi, values.leak));
      await recordService(k, orgId, { engineId: engine.id, kind: "inspection", doneOn: day, notes: `${sinceInspection} h inspection`, by: people.mechanic });
      sinceInspection = 0;
      step += 1;
      if (last) {
        const next = new Date(Date.parse(`${day}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
        await recordService(k, orgId, { engineId: engine.id, kind: "top_end", doneOn: next, notes: "Valve job: exhaust valve seat leaking (cranking −16 %, leak-down 15 %)", by: people.builder });
        const after = new Date(Date.parse(`${day}T00:00:00Z`) + 2 * 86_400_000).toISOString().slice(0, 10);
        await s.read(r.name, after, { elevationM: SHOP_M, airTempC: 18, kind: "build", baseline: true, notes: "After the valve job." }, readingsOf(1, 119, 5));
        valveJobDone = true;
        inShopUntil = after;
      }
    }
    if (!valveJobDone) throw new Error("demo seed: B-2 did not reach 300 h in the season; adjust its share");
  }
}
