import { db } from "../../db/client.ts";

// The open signals the Motors roster counts per engine: one grouped query for the page's engines.

export interface SignalCount {
  watch: number;
  act: number;
}

export async function countOpenSignals(organisationId: number, engineIds?: number[]): Promise<Record<number, SignalCount>> {
  if (engineIds && engineIds.length === 0) return {};
  const q = db()("signals")
    .where({ organisation_id: organisationId })
    .whereIn("state", ["open", "acknowledged"])
    .groupBy("engine_id", "severity")
    .select("engine_id", "severity")
    .count<{ engine_id: number; severity: "watch" | "act"; n: number }[]>({ n: "*" });
  if (engineIds) q.whereIn("engine_id", engineIds);
  const out: Record<number, SignalCount> = {};
  for (const r of await q) {
    const id = Number(r.engine_id);
    out[id] ??= { watch: 0, act: 0 };
    out[id][r.severity] = Number(r.n);
  }
  return out;
}
