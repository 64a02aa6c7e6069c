import Papa from "papaparse";
import { db } from "../../db/client.ts";
import { findEngineRow } from "../../db/engines-repo.ts";
import { listReadingSetRows } from "../../db/reading-sets-repo.ts";
import { roundOrNull } from "../../db/row-values.ts";
import { filteredUsage, toUsageEntry, withUsageNames } from "../../db/usage-repo.ts";
import type { ExportQuery } from "../../lib/schemas/motors.ts";
import { notFound } from "../errors.ts";
import { loadOrgSettings } from "./motors-common.ts";
import { assembleReadingSets } from "./readings-service.ts";

// CSV out: usage and readings, per engine or for the whole organisation. Cells that a
// spreadsheet would run as a formula are escaped; numbers keep their units in the column names.

export interface CsvFile {
  filename: string;
  body: string;
}

function slug(value: string): string {
  return (
    value
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-|-$/g, "") || "export"
  );
}

async function scopeName(organisationId: number, q: ExportQuery): Promise<string> {
  if (q.engineId === undefined) {
    const org = await db()("organisations").where({ id: organisationId }).first("slug");
    return slug(org?.slug ?? "organisation");
  }
  const engine = await findEngineRow(organisationId, q.engineId);
  if (!engine) throw notFound("No engine with that id in this organisation.");
  return `engine-${slug(engine.name)}`;
}

function toCsv(rows: Record<string, unknown>[], columns: string[]): string {
  return Papa.unparse(
    { fields: columns, data: rows.map((r) => columns.map((c) => r[c] ?? "")) },
    { escapeFormulae: true, newline: "\r\n" },
  );
}

export async function exportUsageCsv(organisationId: number, q: ExportQuery): Promise<CsvFile> {
  const name = await scopeName(organisationId, q);
  const settings = await loadOrgSettings(organisationId);
  const rows = await withUsageNames(filteredUsage(organisationId, q)).orderBy("e.name").orderBy("ue.occurred_on").orderBy("ue.id");
  const unitColumn = `amount_${settings.usageUnit}`;
  const data = rows.map((r: Record<string, any>) => {
    const u = toUsageEntry(r, settings.usageUnit);
    return {
      engine: u.engineName,
      engine_serial: r.engine_serial ?? "",
      date: u.occurredOn,
      [unitColumn]: u.amount,
      source: u.source,
      event: u.eventLabel,
      session: u.sessionLabel,
      meter_reading: u.meterReading,
      notes: u.notes,
      logged_by: u.loggedBy?.name ?? "",
      logged_at: u.createdAt,
      archived_at: u.archivedAt,
    };
  });
  const columns = [
    "engine",
    "engine_serial",
    "date",
    unitColumn,
    "source",
    "event",
    "session",
    "meter_reading",
    "notes",
    "logged_by",
    "logged_at",
    "archived_at",
  ];
  return { filename: `ringland-usage-${name}.csv`, body: toCsv(data, columns) };
}

const READING_COLUMNS = [
  "engine",
  "reading_set_id",
  "taken_on",
  "set_kind",
  "baseline",
  "elevation_m",
  "air_temp_c",
  "taken_by",
  "cylinder",
  "chamber_readings_cc",
  "chamber_status",
  "chamber_cc",
  "flat_plate_cc",
  "chamber_offset_cc",
  "squish_a_mm",
  "squish_b_mm",
  "squish_mean_mm",
  "cranking_kpa",
  "cranking_at_reference_kpa",
  "leakdown_pct",
  "swept_cc",
  "geometric_ratio",
  "trapped_ratio",
  "class_compliant",
  "method_notes",
];

/** One row per cylinder per reading set, with the computed figures beside the readings as typed. */
export async function exportReadingsCsv(organisationId: number, q: ExportQuery): Promise<CsvFile> {
  const name = await scopeName(organisationId, q);
  const data: Record<string, unknown>[] = [];
  const pageSize = 500;
  for (let offset = 0; ; offset += pageSize) {
    const { rows } = await listReadingSetRows(organisationId, q, { limit: pageSize, offset, ascending: true });
    if (rows.length === 0) break;
    for (const set of await assembleReadingSets(organisationId, rows)) {
      for (const c of set.cylinders) {
        const f = set.figures.cylinders.find((x) => x.cylinderNo === c.cylinderNo);
        data.push({
          engine: set.engineName,
          reading_set_id: set.id,
          taken_on: set.takenOn,
          set_kind: set.setKind,
          baseline: set.isBaseline ? "yes" : "no",
          elevation_m: set.elevationM,
          air_temp_c: set.airTempC,
          taken_by: set.takenBy?.name ?? "",
          cylinder: c.cylinderNo,
          chamber_readings_cc: c.chamberReadingsCc.join("; "),
          chamber_status: f?.chamber.status ?? "",
          chamber_cc: roundOrNull(f?.chamber.valueCc, 2),
          flat_plate_cc: c.flatPlateCc,
          chamber_offset_cc: roundOrNull(f?.chamberOffsetCc, 2),
          squish_a_mm: c.squishAMm,
          squish_b_mm: c.squishBMm,
          squish_mean_mm: roundOrNull(f?.squishMeanMm, 3),
          cranking_kpa: c.crankingKpa,
          cranking_at_reference_kpa: roundOrNull(f?.crankingAtReferenceKpa, 1),
          leakdown_pct: c.leakdownPct,
          swept_cc: roundOrNull(set.figures.sweptCc, 2),
          geometric_ratio: roundOrNull(f?.geometricRatio, 2),
          trapped_ratio: roundOrNull(f?.trappedRatio, 2),
          class_compliant: set.figures.compliance ? String(set.figures.compliance.compliant ?? "not measured") : "",
          method_notes: set.methodNotes,
        });
      }
    }
    if (rows.length < pageSize) break;
  }
  return { filename: `ringland-readings-${name}.csv`, body: toCsv(data, READING_COLUMNS) };
}
