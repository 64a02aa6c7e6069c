import type { Knex } from "knex";
import {
  createChassis,
  createEngine,
  createPart,
  createReadingSet,
  installEngine,
  logUsage,
  movePart,
  psiToKpaRounded,
  recordService,
  removeEngine,
  type ChassisAttrs,
  type CylinderAttrs,
  type EngineAttrs,
} from "../../tests/factories/motors.ts";

// A small vocabulary for writing a demo season as a story, in date order: engines go into
// chassis, run sessions, get torn down, rebuilt and measured. Everything is invented.

interface EngineState {
  id: number;
  cylinders: number;
  topEndLimit: number | null;
  bottomEndLimit: number | null;
  pistons: number[];
  crank: number | null;
}

interface ChassisState {
  id: number;
  meter: number | null;
}

interface Fitted {
  installationId: number;
  chassis: string;
  /** Usage in this installation is logged as meter readings rather than durations. */
  byMeter: boolean;
}

export class Story {
  readonly engines = new Map<string, EngineState>();
  readonly chassis = new Map<string, ChassisState>();
  private readonly fitted = new Map<string, Fitted>();

  constructor(
    readonly k: Knex,
    readonly orgId: number,
    readonly people: Record<string, string | null>,
  ) {}

  engineId(name: string): number {
    return this.engine(name).id;
  }

  private engine(name: string): EngineState {
    const e = this.engines.get(name);
    if (!e) throw new Error(`demo story: no engine ${name}`);
    return e;
  }

  async addChassis(a: ChassisAttrs & { meter?: number }): Promise<void> {
    const id = await createChassis(this.k, this.orgId, a);
    this.chassis.set(a.number, { id, meter: a.meterKind && a.meterKind !== "none" ? (a.meter ?? 0) : null });
  }

  async addEngine(a: EngineAttrs): Promise<void> {
    const id = await createEngine(this.k, this.orgId, a);
    this.engines.set(a.name, {
      id,
      cylinders: a.cylinders ?? 2,
      topEndLimit: a.topEndLimit ?? null,
      bottomEndLimit: a.bottomEndLimit ?? null,
      pistons: [],
      crank: null,
    });
  }

  private serialStem(name: string, day: string): string {
    return `${name.replace("-", "")}-${day.slice(2, 4)}${day.slice(5, 7)}${day.slice(8, 10)}`;
  }

  /** Fits new pistons (one per cylinder); the old ones go to the shelf, scrapped. */
  async fitPistons(name: string, day: string, by: string | null): Promise<number[]> {
    const e = this.engine(name);
    for (const old of e.pistons) await movePart(this.k, this.orgId, old, { toEngineId: null, movedOn: day, archive: true, notes: "Scrapped at top end", by });
    e.pistons = [];
    for (let c = 1; c <= e.cylinders; c += 1) {
      e.pistons.push(
        await createPart(this.k, this.orgId, {
          serial: `P-${this.serialStem(name, day)}-${c}`,
          kind: "piston",
          description: "Piston with rings and pin",
          engineId: e.id,
          cylinderNo: c,
          installedOn: day,
          usageLimit: e.topEndLimit,
          by,
        }),
      );
    }
    return e.pistons;
  }

  async fitCrank(name: string, day: string, by: string | null): Promise<void> {
    const e = this.engine(name);
    if (e.crank) await movePart(this.k, this.orgId, e.crank, { toEngineId: null, movedOn: day, archive: true, notes: "Sent out for rebuild", by });
    e.crank = await createPart(this.k, this.orgId, {
      serial: `CR-${this.serialStem(name, day)}`,
      kind: "crank",
      description: "Crank assembly with rods and main bearings",
      engineId: e.id,
      installedOn: day,
      usageLimit: e.bottomEndLimit,
      by,
    });
  }

  async topEnd(name: string, day: string, notes: string | null = null, by = this.people.builder): Promise<void> {
    await recordService(this.k, this.orgId, { engineId: this.engineId(name), kind: "top_end", doneOn: day, notes, by });
    await this.fitPistons(name, day, by);
  }

  async bottomEnd(name: string, day: string, notes: string | null = null, by = this.people.builder): Promise<void> {
    await recordService(this.k, this.orgId, { engineId: this.engineId(name), kind: "bottom_end", doneOn: day, notes, by });
    await this.fitCrank(name, day, by);
  }

  async install(name: string, chassisNo: string, day: string, byMeter = false): Promise<void> {
    const c = this.chassis.get(chassisNo)!;
    const installationId = await installEngine(this.k, this.orgId, {
      engineId: this.engineId(name),
      chassisId: c.id,
      installedAt: day,
      meterAtInstall: c.meter,
      by: this.people.builder,
    });
    this.fitted.set(name, { installationId, chassis: chassisNo, byMeter: byMeter && c.meter !== null });
  }

  async remove(name: string, day: string): Promise<void> {
    const f = this.fitted.get(name);
    if (!f) throw new Error(`demo story: ${name} is not installed`);
    await removeEngine(this.k, f.installationId, { removedAt: day, meterAtRemoval: this.chassis.get(f.chassis)!.meter, by: this.people.builder });
    this.fitted.delete(name);
  }

  /** One session of running. The chassis meter (if any) turns either way; it is logged as a reading only in meter installations. */
  async run(name: string, day: string, hours: number, session: string | null, event: string | null, by = this.people.mechanic): Promise<void> {
    const f = this.fitted.get(name);
    const c = f ? this.chassis.get(f.chassis)! : undefined;
    if (c && c.meter !== null) c.meter = Math.round((c.meter + hours) * 100) / 100;
    const metered = f?.byMeter && c?.meter !== null;
    await logUsage(this.k, this.orgId, {
      engineId: this.engineId(name),
      occurredOn: day,
      amount: hours,
      sessionLabel: session,
      eventLabel: event,
      source: metered ? "meter" : "manual",
      installationId: metered ? f!.installationId : null,
      meterReading: metered ? c!.meter : null,
      by,
    });
  }

  async carryOver(name: string, day: string, hours: number, note: string): Promise<void> {
    await logUsage(this.k, this.orgId, { engineId: this.engineId(name), occurredOn: day, amount: hours, sessionLabel: "Carried over", notes: note, by: this.people.builder });
  }

  async read(
    name: string,
    day: string,
    a: { elevationM: number; airTempC: number; kind: "teardown" | "between_events" | "build"; baseline?: boolean; notes?: string | null; by?: string | null },
    cylinders: CylinderAttrs[],
  ): Promise<number> {
    return createReadingSet(this.k, this.orgId, {
      engineId: this.engineId(name),
      takenOn: day,
      elevationM: a.elevationM,
      airTempC: a.airTempC,
      setKind: a.kind,
      isBaseline: a.baseline ?? false,
      methodNotes: a.notes ?? null,
      by: a.by ?? (a.baseline ? this.people.chief : this.people.mechanic),
      cylinders,
    });
  }
}

/** Repeated burette readings whose agreeing pair is `cc` (the extra reading sits a tenth away). */
export function burette(cc: number, pattern: 0 | 1 | 2 = 0): number[] {
  const up = Math.round((cc + 0.1) * 10) / 10;
  if (pattern === 1) return [up, cc, cc];
  if (pattern === 2) return [cc, cc];
  return [cc, up, cc];
}

export interface CylinderValues {
  cc?: number;
  flat?: number;
  squish?: [number, number];
  psi?: number;
  leak?: number;
  notes?: string;
}

/** One cylinder's readings as typed, from values in cc, mm, psi and %. */
export function cylinder(no: number, v: CylinderValues, pattern: 0 | 1 | 2 = 0): CylinderAttrs {
  return {
    cylinderNo: no,
    chamberReadingsCc: v.cc === undefined ? [] : burette(v.cc, pattern),
    flatPlateCc: v.flat ?? null,
    squishAMm: v.squish?.[0] ?? null,
    squishBMm: v.squish?.[1] ?? null,
    crankingKpa: v.psi === undefined ? null : psiToKpaRounded(v.psi),
    leakdownPct: v.leak ?? null,
    notes: v.notes ?? null,
  };
}

/** A small, repeatable pseudo-random sequence (mulberry32), so the demo is the same on every machine. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Days between two YYYY-MM-DD dates, both included. */
export function eachDay(from: string, to: string): string[] {
  const out: string[] = [];
  for (let t = Date.parse(`${from}T00:00:00Z`); t <= Date.parse(`${to}T00:00:00Z`); t += 86_400_000) {
    out.push(new Date(t).toISOString().slice(0, 10));
  }
  return out;
}
