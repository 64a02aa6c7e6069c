import { db } from "../../db/client.ts";
import type { ReadingSet, TimelineItem, Upload } from "../../lib/motors/types.ts";
import type { UsageUnit } from "../../lib/motors/types.ts";
import { listChassis } from "./chassis-service.ts";
import { getEngineTimeline } from "./engine-timeline-service.ts";
import { getEngineFile, type EngineFile } from "./engines-service.ts";
import { dayIn, loadOrgSettings, meterMatchesUnit, type OrgMotorSettings } from "./motors-common.ts";
import { loadEngineThresholds, type EngineThresholdsView } from "./motors-ui-thresholds-service.ts";
import { listReadingSets } from "./readings-service.ts";
import { listSignals, type SignalRow } from "./signals-service.ts";
import { listUploads } from "./uploads-service.ts";

// What the Motors pages load before their first render, gathered from the motors services.

/** The largest roster the engine pickers list; a team runs tens of engines, a rental fleet hundreds. */
export const ENGINE_CHOICES_MAX = 1000;
const READING_SETS_SHOWN = 200;
export const TIMELINE_PAGE = 25;

export interface EngineChoice {
  id: number;
  name: string;
  status: string;
  cylinders: number;
  chassis: { id: number; number: string; meterKind: string; lastMeterReading: number | null; meterCounts: boolean } | null;
}

/** Engines that can log usage or take parts (not retired, not archived), running first. */
export async function listEngineChoices(organisationId: number, unit: UsageUnit, opts: { includeRetired?: boolean } = {}): Promise<EngineChoice[]> {
  const q = db()("engines").where({ organisation_id: organisationId }).whereNull("archived_at");
  if (!opts.includeRetired) q.whereNot("status", "retired");
  const rows: { id: number; name: string; status: string; cylinders: number }[] = await q
    .orderByRaw("FIELD(status, 'running', 'bench', 'spare', 'retired')")
    .orderByRaw("LENGTH(name), name")
    .limit(ENGINE_CHOICES_MAX)
    .select("id", "name", "status", "cylinders");
  const byEngine = new Map<number, EngineChoice["chassis"]>();
  for (const c of await listChassis(organisationId, {})) {
    if (!c.current) continue;
    byEngine.set(c.current.engineId, {
      id: c.id,
      number: c.number,
      meterKind: c.meterKind,
      lastMeterReading: c.lastMeterReading,
      meterCounts: meterMatchesUnit(c.meterKind, unit) && c.current.meterAtInstall !== null,
    });
  }
  return rows.map((r) => ({ id: Number(r.id), name: r.name, status: r.status, cylinders: Number(r.cylinders), chassis: byEngine.get(Number(r.id)) ?? null }));
}

export interface EngineFilePage {
  file: EngineFile;
  settings: OrgMotorSettings;
  today: string;
  /** Newest first. */
  readingSets: ReadingSet[];
  readingSetTotal: number;
  uploads: Upload[];
  thresholds: EngineThresholdsView;
  timeline: { items: TimelineItem[]; page: number; limit: number; total: number };
  /** Open and acknowledged signals; null when the viewer may not read signals. */
  signals: SignalRow[] | null;
  choice: EngineChoice;
}

/** Everything the engine file shows. Throws the services' 404 for another organisation's engine. */
export async function loadEngineFilePage(organisationId: number, engineId: number, opts: { withSignals: boolean; now: Date }): Promise<EngineFilePage> {
  const file = await getEngineFile(organisationId, engineId);
  const settings = await loadOrgSettings(organisationId);
  const sets = await listReadingSets(organisationId, { engineId, perPage: READING_SETS_SHOWN, page: 1, includeArchived: false, baselineOnly: false });
  const uploads = await listUploads(organisationId, { engineId });
  const thresholds = await loadEngineThresholds(organisationId, engineId);
  const timeline = await getEngineTimeline(organisationId, engineId, { page: 1, limit: TIMELINE_PAGE });
  const signals = opts.withSignals ? (await listSignals(organisationId, { engineId, state: "active", perPage: 100 })).signals : null;
  const inst = file.installation;
  let chassis: EngineChoice["chassis"] = null;
  if (inst) {
    const c = (await listChassis(organisationId, {})).find((x) => x.id === inst.chassisId);
    if (c) {
      chassis = {
        id: c.id,
        number: c.number,
        meterKind: c.meterKind,
        lastMeterReading: c.lastMeterReading,
        meterCounts: meterMatchesUnit(c.meterKind, settings.usageUnit) && inst.meterAtInstall !== null,
      };
    }
  }
  return {
    file,
    settings,
    today: dayIn(opts.now, settings.timeZone),
    readingSets: sets.readingSets,
    readingSetTotal: sets.total,
    uploads,
    thresholds,
    timeline,
    signals,
    choice: { id: file.engine.id, name: file.engine.name, status: file.engine.status, cylinders: file.engine.cylinders, chassis },
  };
}
