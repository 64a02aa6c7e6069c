import { listInstallations, toInstallation } from "../../db/chassis-repo.ts";
import { db } from "../../db/client.ts";
import { listPartEvents, listPartMoves } from "../../db/parts-repo.ts";
import { listReadingSetRows } from "../../db/reading-sets-repo.ts";
import { listServiceRecords } from "../../db/service-records-repo.ts";
import { filteredUsage, toUsageEntry, withUsageNames } from "../../db/usage-repo.ts";
import type { TimelineItem } from "../../lib/motors/types.ts";
import { requireEngineRow } from "./engines-service.ts";
import { dayIn, loadOrgSettings } from "./motors-common.ts";

const SERVICE_LABEL = { top_end: "Top end", bottom_end: "Bottom end", inspection: "Inspection" } as const;
const SET_LABEL = { teardown: "Teardown readings", between_events: "Readings between events", build: "Build readings" } as const;
/** Within a day: installs, then usage, then removals and teardown, then rebuilds, then the new build. */
const ORDER: Record<TimelineItem["kind"], number> = {
  installed: 0,
  usage: 1,
  removed: 2,
  part_out: 3,
  part_in: 4,
  part_cut: 5,
  part_oversize: 6,
  service: 7,
  reading_set: 8,
};

/** Everything that happened to one engine, newest first, paged. */
export async function getEngineTimeline(
  organisationId: number,
  engineId: number,
  q: { page?: number; limit?: number },
): Promise<{ items: TimelineItem[]; page: number; limit: number; total: number }> {
  await requireEngineRow(organisationId, engineId);
  const settings = await loadOrgSettings(organisationId);
  const unit = settings.usageUnit;
  const items: TimelineItem[] = [];

  for (const i of (await listInstallations(organisationId, { engineId })).map(toInstallation)) {
    items.push({
      kind: "installed",
      on: dayIn(new Date(i.installedAt), settings.timeZone),
      at: i.installedAt,
      id: i.id,
      summary: `Into chassis ${i.chassisNumber}`,
      details: { chassisId: i.chassisId, chassisNumber: i.chassisNumber, meter: i.meterAtInstall },
    });
    if (i.removedAt) {
      items.push({
        kind: "removed",
        on: dayIn(new Date(i.removedAt), settings.timeZone),
        at: i.removedAt,
        id: i.id,
        summary: `Out of chassis ${i.chassisNumber}`,
        details: { chassisId: i.chassisId, chassisNumber: i.chassisNumber, meter: i.meterAtRemoval },
      });
    }
  }
  const usage = await withUsageNames(filteredUsage(organisationId, { engineId }, db()));
  for (const u of usage.map((r: Record<string, any>) => toUsageEntry(r, unit))) {
    const label = [u.eventLabel, u.sessionLabel].filter(Boolean).join(" · ");
    items.push({
      kind: "usage",
      on: u.occurredOn,
      at: null,
      id: u.id,
      summary: `${u.amount} ${unit}${label ? ` — ${label}` : ""}`,
      details: {
        amount: u.amount,
        unit,
        source: u.source,
        eventLabel: u.eventLabel,
        sessionLabel: u.sessionLabel,
        meterReading: u.meterReading,
      },
    });
  }
  for (const s of await listServiceRecords(organisationId, engineId)) {
    items.push({
      kind: "service",
      on: s.doneOn,
      at: null,
      id: s.id,
      summary: SERVICE_LABEL[s.kind],
      details: { kind: s.kind, notes: s.notes, jobId: s.jobId },
    });
  }
  const sets = await listReadingSetRows(organisationId, { engineId }, { limit: 10_000, offset: 0 });
  for (const r of sets.rows) {
    items.push({
      kind: "reading_set",
      on: r.taken_on,
      at: null,
      id: Number(r.id),
      summary: `${SET_LABEL[r.set_kind]}${r.is_baseline ? " (baseline)" : ""}`,
      details: { setKind: r.set_kind, isBaseline: Boolean(r.is_baseline), elevationM: Number(r.elevation_m) },
    });
  }
  for (const m of await listPartMoves(organisationId, { engineId })) {
    const into = m.toEngineId === engineId;
    items.push({
      kind: into ? "part_in" : "part_out",
      on: m.movedOn,
      at: null,
      id: m.id,
      summary: into
        ? `${m.partKind} ${m.serial} fitted${m.fromEngineName ? ` from ${m.fromEngineName}` : ""}`
        : `${m.partKind} ${m.serial} taken out${m.toEngineName ? ` to ${m.toEngineName}` : ""}`,
      details: {
        partId: m.partId,
        serial: m.serial,
        partKind: m.partKind,
        fromEngineId: m.fromEngineId,
        toEngineId: m.toEngineId,
        cylinderNo: m.toCylinderNo,
      },
    });
  }
  for (const e of await listPartEvents(organisationId, { engineId })) {
    items.push({
      kind: e.kind === "cut" ? "part_cut" : "part_oversize",
      on: e.doneOn,
      at: null,
      id: e.id,
      summary:
        e.kind === "cut"
          ? `${e.partKind} ${e.serial} cut ${e.amountMm} mm (total ${e.totalAfterMm} mm)`
          : `${e.partKind} ${e.serial} to +${e.totalAfterMm} mm oversize`,
      details: { partId: e.partId, serial: e.serial, amountMm: e.amountMm, totalAfterMm: e.totalAfterMm },
    });
  }

  items.sort((a, b) =>
    a.on !== b.on ? (a.on < b.on ? 1 : -1) : ORDER[b.kind] - ORDER[a.kind] || (b.at ?? "").localeCompare(a.at ?? "") || b.id - a.id,
  );
  const limit = q.limit ?? 100;
  const page = q.page ?? 1;
  return { items: items.slice((page - 1) * limit, page * limit), page, limit, total: items.length };
}
