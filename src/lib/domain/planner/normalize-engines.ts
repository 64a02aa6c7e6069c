import { DomainInputError } from "../errors";
import { requireFinite, requireNonNegative, requirePositive } from "../input-guards";
import { parseDayNumber } from "./day-math";
import { requireId, requireKind, requireLabour } from "./planner-guards";
import { ENGINE_STATUSES, JOB_KINDS, type JobKind, type PlannerEngine, type PlannerInput } from "./types";

// Engines and the parts fitted to them, checked field by field and flattened into counters.

/** One limit on an engine: its own top end, bottom end, inspection, or a fitted part. */
export interface Counter {
  kind: JobKind;
  limit: number;
  used: number;
  label: string;
}

export interface NormEngine {
  index: number;
  id: string;
  name: string;
  retired: boolean;
  chassisId: string | null;
  counters: Counter[];
  labourCenti: Record<JobKind, number>;
  availableFromDay: number;
  minElevationM: number | null;
  planFraction: number;
  family: string | null;
}

const COUNTER_LABELS: Record<JobKind, string> = {
  topEnd: "top end",
  bottomEnd: "bottom end",
  inspection: "inspection",
};


export function normalizeEngine(input: PlannerInput, engine: PlannerEngine, index: number): NormEngine {
  const f = `engines[${index}]`;
  const id = requireId(`${f}.id`, engine.id);
  if (!ENGINE_STATUSES.includes(engine.status)) {
    throw new DomainInputError(`${f}.status`, `${f}.status must be one of ${ENGINE_STATUSES.join(", ")}`);
  }
  const p = engine.policy;
  const counters: Counter[] = [
    {
      kind: "topEnd",
      limit: requirePositive(`${f}.policy.topEndLimit`, p?.topEndLimit),
      used: requireNonNegative(`${f}.counters.sinceTopEnd`, engine.counters?.sinceTopEnd),
      label: COUNTER_LABELS.topEnd,
    },
  ];
  if (p.bottomEndLimit !== undefined) {
    counters.push({
      kind: "bottomEnd",
      limit: requirePositive(`${f}.policy.bottomEndLimit`, p.bottomEndLimit),
      used: requireNonNegative(`${f}.counters.sinceBottomEnd`, engine.counters.sinceBottomEnd),
      label: COUNTER_LABELS.bottomEnd,
    });
  }
  if (p.inspectionInterval !== undefined) {
    counters.push({
      kind: "inspection",
      limit: requirePositive(`${f}.policy.inspectionInterval`, p.inspectionInterval),
      used: requireNonNegative(`${f}.counters.sinceInspection`, engine.counters.sinceInspection),
      label: COUNTER_LABELS.inspection,
    });
  }
  const planFraction = requirePositive(`${f}.policy.planFraction`, p.planFraction);
  if (planFraction > 1) {
    throw new DomainInputError(`${f}.policy.planFraction`, `${f}.policy.planFraction must not exceed 1`);
  }
  const familyLabour = engine.family ? input.shop.labourHoursByFamily?.[engine.family] : undefined;
  const labourCenti = {} as Record<JobKind, number>;
  for (const kind of JOB_KINDS) {
    const own = engine.labourHours?.[kind];
    const fam = familyLabour?.[kind];
    if (own !== undefined) labourCenti[kind] = requireLabour(`${f}.labourHours.${kind}`, own);
    else if (fam !== undefined) {
      labourCenti[kind] = requireLabour(`shop.labourHoursByFamily.${engine.family}.${kind}`, fam);
    } else labourCenti[kind] = requireLabour(`shop.labourHours.${kind}`, input.shop.labourHours?.[kind]);
  }
  return {
    index,
    id,
    name: typeof engine.name === "string" && engine.name !== "" ? engine.name : id,
    retired: engine.status === "retired",
    chassisId: engine.chassisId === null ? null : requireId(`${f}.chassisId`, engine.chassisId),
    counters,
    labourCenti,
    availableFromDay:
      engine.availableFrom === undefined
        ? Number.MIN_SAFE_INTEGER
        : parseDayNumber(`${f}.availableFrom`, engine.availableFrom),
    minElevationM:
      engine.builtForMinElevationM === undefined
        ? null
        : requireFinite(`${f}.builtForMinElevationM`, engine.builtForMinElevationM),
    planFraction,
    family: engine.family === undefined ? null : requireId(`${f}.family`, engine.family),
  };
}


export function attachParts(input: PlannerInput, engines: NormEngine[], engineIndexById: Map<string, number>): void {
  // Parts join their engine's counters in id order, so the input's order never shows.
  const parts = (input.parts ?? []).map((part, i) => ({ part, i }));
  parts.sort((a, b) => (String(a.part.id) < String(b.part.id) ? -1 : String(a.part.id) > String(b.part.id) ? 1 : a.i - b.i));
  const partIds = new Set<string>();
  parts.forEach(({ part, i }) => {
    const f = `parts[${i}]`;
    const partId = requireId(`${f}.id`, part.id);
    if (partIds.has(partId)) throw new DomainInputError(`${f}.id`, `part id ${partId} appears twice`);
    partIds.add(partId);
    const owner = engineIndexById.get(requireId(`${f}.engineId`, part.engineId));
    if (owner === undefined) throw new DomainInputError(`${f}.engineId`, `part ${part.id} names an unknown engine`);
    engines[owner].counters.push({
      kind: requireKind(`${f}.renewedBy`, part.renewedBy),
      limit: requirePositive(`${f}.limit`, part.limit),
      used: requireNonNegative(`${f}.usage`, part.usage),
      label: `${typeof part.name === "string" && part.name !== "" ? part.name : part.id} (part)`,
    });
  });
}
