import { requestSignalCheck } from "../signals/request.ts";
import { createHash } from "node:crypto";
import Papa from "papaparse";
import { db } from "../../db/client.ts";
import { listEngineKeys } from "../../db/engines-repo.ts";
import { roundTo } from "../../db/row-values.ts";
import { findExistingImportKeys } from "../../db/usage-repo.ts";
import {
  EVENT_LABEL_MAX,
  IMPORT_ROWS_MAX,
  SESSION_LABEL_MAX,
  SHORT_NOTE_MAX,
  USAGE_AMOUNT_MAX,
  type UsageImportInput,
} from "../../lib/schemas/motors.ts";
import { guessMapping, normaliseLabel, parseAmountCell, parseDateCell, type ImportMapping } from "../../lib/motors/usage-import-parse.ts";
import { badRequest } from "../errors.ts";
import { writeAudit } from "./audit.ts";
import { dayIn, loadOrgSettings, roundUsage, type Actor } from "./motors-common.ts";

// CSV import in two steps. Preview parses and checks every row and says what would be written;
// commit does the same work again and writes in one transaction. Each row's import key is the
// SHA-256 of its normalised content and of how many identical rows came before it in the file,
// so the same file imported twice writes nothing the second time, while two genuinely identical
// sessions in one file both count (docs/decisions/041-usage-import-keys.md).

export interface ImportRow {
  line: number;
  engineId: number;
  engineName: string;
  occurredOn: string;
  amount: number;
  sessionLabel: string | null;
  eventLabel: string | null;
  notes: string | null;
  importKey: string;
  /** Already written by an earlier import: committing skips it. */
  duplicate: boolean;
}

export interface ImportError {
  line: number;
  field: "engine" | "date" | "amount" | "session" | "event" | "notes" | "row";
  reason: string;
  value: string | null;
}

export type { ImportMapping };

export interface ImportPreview {
  columns: string[];
  mapping: ImportMapping | null;
  dateFormat: "iso" | "mdy" | "dmy";
  rows: ImportRow[];
  errors: ImportError[];
  summary: { rowsRead: number; toWrite: number; duplicates: number; bad: number; amountToWrite: number };
}

async function analyse(organisationId: number, input: UsageImportInput, now: Date): Promise<ImportPreview> {
  const settings = await loadOrgSettings(organisationId);
  const parsed = Papa.parse<Record<string, string>>(input.csv.replace(/^\uFEFF/, ""), {
    header: true,
    skipEmptyLines: "greedy",
    transformHeader: (h) => h.trim(),
  });
  const columns = (parsed.meta.fields ?? []).filter((c) => c !== "");
  const dateFormat = input.dateFormat ?? "iso";
  if (parsed.data.length > IMPORT_ROWS_MAX) {
    throw badRequest(`At most ${IMPORT_ROWS_MAX} rows per import.`, {
      csv: `The file has ${parsed.data.length} rows: split it into parts of ${IMPORT_ROWS_MAX}.`,
    });
  }
  const mapping = input.mapping ?? guessMapping(columns);
  const empty: ImportPreview = {
    columns,
    mapping,
    dateFormat,
    rows: [],
    errors: [],
    summary: { rowsRead: parsed.data.length, toWrite: 0, duplicates: 0, bad: 0, amountToWrite: 0 },
  };
  if (!mapping) return empty;
  const missing: Record<string, string> = {};
  for (const [role, column] of Object.entries(mapping)) {
    if (column && !columns.includes(column)) missing[`mapping.${role}`] = `The file has no column "${column}".`;
  }
  if (Object.keys(missing).length) throw badRequest("The column mapping does not fit this file.", missing);

  const engines = await listEngineKeys(organisationId);
  const byName = new Map(engines.map((e) => [e.name.trim().toLowerCase(), e]));
  const today = dayIn(now, settings.timeZone);
  const rows: ImportRow[] = [];
  const errors: ImportError[] = [];
  const seen = new Map<string, number>();
  const rowErrors = new Map<number, string>();
  for (const e of parsed.errors) if (typeof e.row === "number") rowErrors.set(e.row, e.message);

  parsed.data.forEach((record, index) => {
    const line = index + 2;
    const cell = (column: string | null | undefined): string | null => (column ? (record[column] ?? "").trim() || null : null);
    const bad = (field: ImportError["field"], reason: string, value: string | null): void => {
      errors.push({ line, field, reason, value });
    };
    const before = errors.length;
    if (rowErrors.has(index)) bad("row", `The row does not fit the header: ${rowErrors.get(index)}`, null);
    const engineCell = cell(mapping.engine);
    const serialMatches = engineCell
      ? engines.filter((e) => e.serial !== null && e.serial.trim().toLowerCase() === engineCell.toLowerCase())
      : [];
    const engine = engineCell
      ? (byName.get(engineCell.toLowerCase()) ?? (serialMatches.length === 1 ? serialMatches[0] : undefined))
      : undefined;
    if (!engineCell) bad("engine", "No engine named.", null);
    else if (!engine)
      bad(
        "engine",
        serialMatches.length > 1 ? "Several engines share this serial: use the name." : "No engine with this name or serial.",
        engineCell,
      );
    else if (engine.archived || engine.status === "retired") bad("engine", "This engine is retired or archived.", engineCell);
    const dateCell = cell(mapping.date);
    const occurredOn = dateCell ? parseDateCell(dateCell, dateFormat) : null;
    if (!dateCell) bad("date", "No date.", null);
    else if (!occurredOn)
      bad(
        "date",
        `Not a date in the ${dateFormat === "iso" ? "YYYY-MM-DD" : dateFormat === "mdy" ? "M/D/YYYY" : "D/M/YYYY"} format.`,
        dateCell,
      );
    else if (occurredOn > today) bad("date", "This date lies in the future.", dateCell);
    const amountCell = cell(mapping.amount);
    const amount = amountCell ? parseAmountCell(amountCell) : null;
    if (!amountCell) bad("amount", "No usage.", null);
    else if (amount === null) bad("amount", "Not a number.", amountCell);
    else if (amount <= 0 || amount > USAGE_AMOUNT_MAX) bad("amount", `Usage must be above 0 and at most ${USAGE_AMOUNT_MAX}.`, amountCell);
    const session = cell(mapping.session);
    const event = cell(mapping.event);
    const notes = cell(mapping.notes);
    if (session && session.length > SESSION_LABEL_MAX) bad("session", `At most ${SESSION_LABEL_MAX} characters.`, session);
    if (event && event.length > EVENT_LABEL_MAX) bad("event", `At most ${EVENT_LABEL_MAX} characters.`, event);
    if (notes && notes.length > SHORT_NOTE_MAX) bad("notes", `At most ${SHORT_NOTE_MAX} characters.`, notes);
    if (errors.length > before || !engine || !occurredOn || amount === null) return;

    const value = roundTo(amount, 2);
    const normal = [engine.id, occurredOn, value.toFixed(2), normaliseLabel(session), normaliseLabel(event)].join("|");
    const occurrence = (seen.get(normal) ?? 0) + 1;
    seen.set(normal, occurrence);
    const importKey = createHash("sha256").update(`${normal}#${occurrence}`).digest("hex");
    rows.push({
      line,
      engineId: engine.id,
      engineName: engine.name,
      occurredOn,
      amount: value,
      sessionLabel: session,
      eventLabel: event,
      notes,
      importKey,
      duplicate: false,
    });
  });

  const existing = await findExistingImportKeys(
    organisationId,
    rows.map((r) => r.importKey),
  );
  for (const r of rows) r.duplicate = existing.has(r.importKey);
  const fresh = rows.filter((r) => !r.duplicate);
  return {
    columns,
    mapping,
    dateFormat,
    rows,
    errors,
    summary: {
      rowsRead: parsed.data.length,
      toWrite: fresh.length,
      duplicates: rows.length - fresh.length,
      bad: new Set(errors.map((e) => e.line)).size,
      amountToWrite: roundUsage(fresh.reduce((s, r) => s + r.amount, 0)),
    },
  };
}

export async function previewImport(organisationId: number, input: UsageImportInput, now: Date): Promise<ImportPreview> {
  return analyse(organisationId, input, now);
}

export interface ImportResult {
  written: number;
  duplicates: number;
  skippedBad: number;
  amountWritten: number;
}

/** Writes the preview's rows in one transaction; a row whose key exists already is skipped, never doubled. */
export async function commitImport(actor: Actor, input: UsageImportInput): Promise<ImportResult> {
  const organisationId = actor.membership.organisationId;
  const preview = await analyse(organisationId, input, actor.now);
  if (!preview.mapping) {
    throw badRequest("Say which columns hold the engine, the date and the usage.", { mapping: "Map the engine, date and usage columns." });
  }
  if (preview.errors.length && !input.skipBadRows) {
    throw badRequest(`${preview.summary.bad} rows are not valid: fix them, or import the others with skipBadRows.`, {
      csv: `${preview.summary.bad} rows are not valid (first: line ${preview.errors[0].line}, ${preview.errors[0].reason}).`,
    });
  }
  const fresh = preview.rows.filter((r) => !r.duplicate);
  return withDeadlockRetry(() => writeRows(actor, organisationId, preview, fresh));
}

/**
 * Two imports of the same rows at once lock the same gap of the import-key index and InnoDB
 * picks one as a deadlock victim; running it again then finds the rows written and skips them.
 */
async function withDeadlockRetry<T>(run: () => Promise<T>, attempts = 4): Promise<T> {
  for (let i = 1; ; i += 1) {
    try {
      return await run();
    } catch (err) {
      const code = (err as { code?: string } | null)?.code;
      if (i >= attempts || (code !== "ER_LOCK_DEADLOCK" && code !== "ER_LOCK_WAIT_TIMEOUT")) throw err;
      await new Promise((r) => setTimeout(r, 20 * i + Math.random() * 30));
    }
  }
}

async function writeRows(actor: Actor, organisationId: number, preview: ImportPreview, fresh: ImportRow[]): Promise<ImportResult> {
  return db().transaction(async (trx) => {
    // First, before the inserts take a shared lock on the organisation row (src/server/signals/request.ts).
    await requestSignalCheck(trx, organisationId, actor.now);
    let written = 0;
    let amountWritten = 0;
    for (let i = 0; i < fresh.length; i += 500) {
      const chunk = fresh.slice(i, i + 500);
      // Locking the keys (next-key locks on the unique index) makes a second import of the same
      // rows wait for this one, then find them written.
      const taken = new Set<string>(
        (
          await trx("usage_entries")
            .where({ organisation_id: organisationId })
            .whereIn(
              "import_key",
              chunk.map((r) => r.importKey),
            )
            .forUpdate()
            .select("import_key")
        ).map((r: { import_key: string }) => r.import_key),
      );
      const toWrite = chunk.filter((r) => !taken.has(r.importKey));
      if (toWrite.length === 0) continue;
      const native = trx("usage_entries")
        .insert(
          toWrite.map((r) => ({
            organisation_id: organisationId,
            engine_id: r.engineId,
            occurred_on: r.occurredOn,
            session_label: r.sessionLabel,
            event_label: r.eventLabel,
            amount: r.amount,
            source: "import",
            import_key: r.importKey,
            logged_by: actor.userId,
            notes: r.notes,
          })),
        )
        .onConflict(["organisation_id", "import_key"])
        .ignore()
        .toSQL()
        .toNative();
      const [header] = (await trx.raw(native.sql, native.bindings as any)) as [{ affectedRows: number }];
      written += header.affectedRows;
      amountWritten += toWrite.reduce((s, r) => s + r.amount, 0);
    }
    const result: ImportResult = {
      written,
      duplicates: preview.rows.length - written,
      skippedBad: preview.summary.bad,
      amountWritten: roundUsage(amountWritten),
    };
    await writeAudit(trx, {
      organisationId,
      actorUserId: actor.userId,
      action: "usage.imported",
      entity: "usage_entry",
      entityId: null,
      details: { ...result },
    });
    return result;
  });
}
