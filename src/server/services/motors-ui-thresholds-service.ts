import { db } from "../../db/client.ts";
import { DomainInputError } from "../../lib/domain/errors.ts";
import { mergeThresholds } from "../../lib/domain/signal-rules/thresholds.ts";
import type { SignalThresholdOverrides, SignalThresholds } from "../../lib/domain/signal-rules/types.ts";
import { badRequest, conflict, notFound } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import type { Actor } from "./motors-common.ts";

// A crew chief's own signal thresholds for one engine, laid over the organisation's the same
// way the signal check lays them (group by group), so the engine file shows what the check uses.

const NO_ENGINE = "No engine with that id in this organisation.";

export interface EngineThresholdsView {
  engineId: number;
  /** What the signal check applies to this engine. */
  effective: SignalThresholds;
  /** The organisation's thresholds (its overrides over the defaults). */
  organisation: SignalThresholds;
  /** This engine's own values; null when it follows the organisation. */
  overrides: Record<string, Record<string, number>> | null;
}

function parseJson<T>(value: unknown): T | null {
  if (value === null || value === undefined) return null;
  if (typeof value !== "string") return value as T;
  try {
    return JSON.parse(value) as T;
  } catch {
    return null;
  }
}

/** Engine groups replace the organisation's field by field, never a whole group at once. */
function layer(org: SignalThresholdOverrides | null, engine: Record<string, Record<string, number>> | null): SignalThresholdOverrides {
  const out: Record<string, unknown> = { ...(org ?? {}) };
  for (const [group, fields] of Object.entries(engine ?? {})) {
    out[group] = { ...((org as Record<string, object> | null)?.[group] ?? {}), ...fields };
  }
  return out as SignalThresholdOverrides;
}

async function loadRows(organisationId: number, engineId: number): Promise<{ org: SignalThresholdOverrides | null; engine: Record<string, Record<string, number>> | null }> {
  const engine = await db()("engines").where({ organisation_id: organisationId, id: engineId }).first("signal_thresholds");
  if (!engine) throw notFound(NO_ENGINE);
  const org = await db()("organisations").where({ id: organisationId }).first("signal_thresholds");
  return { org: parseJson<SignalThresholdOverrides>(org?.signal_thresholds), engine: parseJson(engine.signal_thresholds) };
}

export async function loadEngineThresholds(organisationId: number, engineId: number): Promise<EngineThresholdsView> {
  const { org, engine } = await loadRows(organisationId, engineId);
  const organisation = mergeThresholds(org);
  let effective: SignalThresholds;
  try {
    effective = mergeThresholds(layer(org, engine));
  } catch (err) {
    // Organisation values changed under an engine's own ones so they no longer fit: the check
    // skips such an engine, and the page shows the organisation's until a chief fixes them.
    if (!(err instanceof DomainInputError)) throw err;
    effective = organisation;
  }
  return { engineId, effective, organisation, overrides: engine && Object.keys(engine).length ? engine : null };
}

/** Keeps only the values that differ from the organisation's, so later organisation changes still reach this engine. */
function keepDifferences(organisation: SignalThresholds, wanted: Record<string, Record<string, number>>): Record<string, Record<string, number>> {
  const out: Record<string, Record<string, number>> = {};
  for (const [group, fields] of Object.entries(wanted)) {
    const base = (organisation as unknown as Record<string, Record<string, number> | string>)[group];
    for (const [name, value] of Object.entries(fields)) {
      if (typeof base === "object" && base !== null && base[name] === value) continue;
      (out[group] ??= {})[name] = value;
    }
  }
  return out;
}

export async function saveEngineThresholds(
  actor: Actor,
  engineId: number,
  wanted: Record<string, Record<string, number>> | null,
): Promise<EngineThresholdsView> {
  const organisationId = actor.membership.organisationId;
  const { org } = await loadRows(organisationId, engineId);
  const organisation = mergeThresholds(org);
  const overrides = wanted === null ? null : keepDifferences(organisation, wanted);
  if (overrides && "provenance" in overrides) throw badRequest("The provenance label is the organisation's.", { "thresholds.provenance": "not editable per engine" });
  try {
    if (overrides) mergeThresholds(layer(org, overrides));
  } catch (err) {
    if (err instanceof DomainInputError) throw badRequest(err.message, { [err.field]: err.message });
    throw err;
  }
  const stored = overrides && Object.keys(overrides).length ? overrides : null;
  await db().transaction(async (trx) => {
    const row = await trx("engines").where({ organisation_id: organisationId, id: engineId }).forUpdate().first("id", "archived_at");
    if (!row) throw notFound(NO_ENGINE);
    if (row.archived_at) throw conflict("This engine is archived.");
    await trx("engines")
      .where({ id: engineId })
      .update({ signal_thresholds: stored ? JSON.stringify(stored) : null, updated_at: trx.fn.now() });
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: stored ? "engine.thresholds_set" : "engine.thresholds_cleared",
      entity: "engine",
      entityId: engineId,
      details: { thresholds: stored },
    });
  });
  return loadEngineThresholds(organisationId, engineId);
}
