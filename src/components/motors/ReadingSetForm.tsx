import { useEffect, useMemo, useRef, useState, type SubmitEvent, type JSX } from "react";
import { COMPRESSION_CAUTIONS, MEASURING_CAUTIONS } from "../../lib/domain/cautions.ts";
import { DomainInputError } from "../../lib/domain/errors.ts";
import { computeSweptCc } from "../../lib/domain/compression.ts";
import { convertToSi, formatQuantity, getUnitLabel, type UnitChoice } from "../../lib/domain/units.ts";
import { computeSetFigures, type ClassRules, type FigureEngine, type SetFigures } from "../../lib/motors/reading-figures.ts";
import CautionList from "../workbench/CautionList.tsx";
import { parseTypedNumber } from "../workbench/workbench-state.ts";
import NumberField from "../workbench/NumberField.tsx";
import UnitBar from "../workbench/UnitBar.tsx";
import CylinderBlock from "./CylinderBlock.tsx";
import { ApiError, requestJson } from "./motors-api.ts";
import PhotoPicker, { type Photo } from "./PhotoPicker.tsx";
import {
  buildRequest,
  changeDraftUnits,
  createDraft,
  hasCylinderInput,
  isDraftChanged,
  mapServerFields,
  readCylinder,
  type FormErrors,
  type ReadingDraft,
  type SetKind,
} from "./reading-form-state.ts";
import { ComplianceList } from "./ReadingSetTable.tsx";

// A new reading set, phone first: one block per cylinder, every figure worked out while it is
// typed, photos from the camera, and one save that writes the whole set or nothing.

interface Props {
  engine: FigureEngine & { id: number; name: string };
  rules: ClassRules | null;
  toleranceCc: number;
  shopElevationM: number | null;
  savedUnits: UnitChoice;
  today: string;
  canBaseline: boolean;
  baseline: boolean;
}

const KIND_LABEL: Record<SetKind, string> = { teardown: "Teardown", between_events: "Between events", build: "After a build or rebuild" };

async function saveUnits(units: UnitChoice): Promise<boolean> {
  try {
    await requestJson("PATCH", "/api/v1/me/preferences", { unitChoices: units });
    return true;
  } catch {
    return false;
  }
}

function computeLive(draft: ReadingDraft, units: UnitChoice, p: Props): { figures: SetFigures | null; problem: string } {
  const scratch: FormErrors = {};
  const cylinders = draft.cylinders.filter(hasCylinderInput).map((c) => readCylinder(c, units, scratch));
  if (cylinders.length === 0) return { figures: null, problem: "" };
  const typed = parseTypedNumber(draft.elevation);
  const elevationM = typed === undefined || !Number.isFinite(typed) ? (p.shopElevationM ?? 0) : convertToSi("elevation", typed, units);
  try {
    const figures = computeSetFigures(p.engine, cylinders, { toleranceCc: p.toleranceCc, elevationM, referenceElevationM: p.shopElevationM, rules: p.rules });
    return { figures, problem: "" };
  } catch (err) {
    if (err instanceof DomainInputError) return { figures: null, problem: err.message };
    throw err;
  }
}

export default function ReadingSetForm(props: Props): JSX.Element {
  const { engine } = props;
  const [units, setUnits] = useState<UnitChoice>(props.savedUnits);
  const [first] = useState(() => createDraft({ cylinders: engine.cylinders, today: props.today, shopElevationM: props.shopElevationM, units: props.savedUnits, baseline: props.baseline && props.canBaseline }));
  const [draft, setDraft] = useState<ReadingDraft>(first);
  const [photos, setPhotos] = useState<Photo[]>([]);
  const [errors, setErrors] = useState<FormErrors>({});
  const [message, setMessage] = useState("");
  const [unitStatus, setUnitStatus] = useState("");
  const [saving, setSaving] = useState(false);
  const saved = useRef(false);
  const summary = useRef<HTMLDivElement>(null);
  const live = useMemo(() => computeLive(draft, units, props), [draft, units, props]);
  const dirty = isDraftChanged(draft, first) || photos.length > 0;
  const uploading = photos.some((p) => p.status === "uploading");
  const timed = engine.cycle === "two_stroke" && engine.rodMm !== null && engine.exhaustOpensDegAtdc !== null;

  useEffect(() => {
    const warn = (e: BeforeUnloadEvent): void => {
      if (!dirty || saved.current) return;
      e.preventDefault();
      // Older browsers ask only when returnValue is set.
      e.returnValue = "";
    };
    window.addEventListener("beforeunload", warn);
    return () => window.removeEventListener("beforeunload", warn);
  }, [dirty]);

  function changeUnits(next: UnitChoice): void {
    setDraft((d) => changeDraftUnits(d, units, next));
    setUnits(next);
    setUnitStatus("Saving your units…");
    void saveUnits(next).then((ok) => setUnitStatus(ok ? "Saved: these units open next time." : "Not saved: these units apply on this page only."));
  }

  const setField = (patch: Partial<ReadingDraft>): void => setDraft((d) => ({ ...d, ...patch }));

  async function submit(e: SubmitEvent<HTMLFormElement>): Promise<void> {
    e.preventDefault();
    if (saving) return;
    if (uploading) {
      setMessage("Wait for the photos to finish uploading, then save.");
      return;
    }
    const uploadIds = photos.filter((p) => p.status === "done" && p.uploadId !== null).map((p) => p.uploadId as number);
    const { request, errors: found } = buildRequest(draft, units, engine.id, uploadIds);
    if (!request) {
      setErrors(found);
      setMessage(found.form ?? "Some readings need another look: each is marked below.");
      summary.current?.focus();
      return;
    }
    setSaving(true);
    setErrors({});
    setMessage("");
    try {
      const res = await requestJson<{ readingSet: { id: number } }>("POST", "/api/v1/reading-sets", request.body);
      saved.current = true;
      window.location.assign(`/motors/${engine.id}?saved=${res.readingSet.id}#set-${res.readingSet.id}`);
    } catch (err) {
      const mapped = err instanceof ApiError ? mapServerFields(err.fields, request.sentCylinders) : {};
      setErrors(mapped);
      setMessage(`Nothing was saved. ${(err as Error).message}${mapped.form && mapped.form !== (err as Error).message ? ` ${mapped.form}` : ""}`);
      setSaving(false);
      summary.current?.focus();
    }
  }

  const figuresOf = (n: number) => live.figures?.cylinders.find((c) => c.cylinderNo === n);
  const f = live.figures;
  const unconfirmed = (f?.cylinders ?? []).filter((c) => c.chamber.status === "unconfirmed").map((c) => c.cylinderNo);

  return (
    <form id="reading-set-form" onSubmit={(e) => void submit(e)} noValidate className="space-y-6 pb-28 sm:pb-0" data-testid="reading-set-form">
      <CautionList title="Before you measure" cautions={MEASURING_CAUTIONS} tone="notice" testId="measuring-reminders" />
      <div ref={summary} tabIndex={-1} aria-live="assertive" className="outline-none">
        {message ? <p className="rl-caution !text-base font-semibold" role="alert" data-testid="form-message">{message}</p> : null}
      </div>
      <UnitBar units={units} onChange={(u) => changeUnits(u)} status={unitStatus} />

      <section aria-labelledby="set-h" className="grid grid-cols-2 gap-4 lg:grid-cols-4">
        <h2 id="set-h" className="sr-only">The set</h2>
        <div>
          <label className="rl-label" htmlFor="takenOn">Taken on</label>
          <input id="takenOn" className="rl-field rl-num" type="date" max={props.today} value={draft.takenOn} onChange={(e) => setField({ takenOn: e.target.value })} aria-invalid={errors.takenOn ? true : undefined} />
          {errors.takenOn ? <p className="rl-error" role="alert">{errors.takenOn}</p> : null}
        </div>
        <div>
          <label className="rl-label" htmlFor="setKind">Why this set</label>
          <select id="setKind" className="rl-field" value={draft.setKind} onChange={(e) => setField({ setKind: e.target.value as SetKind })}>
            {(Object.keys(KIND_LABEL) as SetKind[]).map((k) => <option key={k} value={k}>{KIND_LABEL[k]}</option>)}
          </select>
        </div>
        <NumberField id="elevation" label="Elevation where taken" value={draft.elevation} unit={getUnitLabel("elevation", units)} error={errors.elevation} signed
          hint={props.shopElevationM !== null ? "Starts at the shop's elevation." : undefined} onChange={(t) => setField({ elevation: t })} />
        <NumberField id="airTemp" label="Air temperature" value={draft.airTemp} unit={getUnitLabel("temperature", units)} error={errors.airTemp} signed onChange={(t) => setField({ airTemp: t })} />
        <div className="col-span-2 lg:col-span-4">
          <label className="rl-label" htmlFor="methodNotes">Method notes</label>
          <textarea id="methodNotes" className="rl-field" rows={2} maxLength={4000} value={draft.methodNotes} onChange={(e) => setField({ methodNotes: e.target.value })}
            placeholder="Liquid used, piston sealed with grease, solder size, gauge…" />
        </div>
        {props.canBaseline ? (
          <label className="col-span-2 flex items-start gap-3 lg:col-span-4">
            <input type="checkbox" className="mt-1 h-5 w-5" checked={draft.isBaseline} onChange={(e) => setField({ isBaseline: e.target.checked })} data-testid="baseline-box" />
            <span>
              <span className="font-semibold">Mark as the engine's baseline</span>
              <span className="block text-sm text-pencil">Drift is measured from here: normally the first set after a rebuild.</span>
            </span>
          </label>
        ) : null}
      </section>

      {draft.cylinders.map((c, i) => (
        <CylinderBlock
          key={c.cylinderNo}
          draft={c}
          figures={figuresOf(c.cylinderNo)}
          units={units}
          toleranceCc={props.toleranceCc}
          errors={errors}
          timed={timed}
          engineId={engine.id}
          photos={photos}
          onPhotos={setPhotos}
          onChange={(next) => setDraft((d) => ({ ...d, cylinders: d.cylinders.map((x, j) => (j === i ? next : x)) }))}
        />
      ))}

      <section aria-labelledby="whole-h" className="space-y-3 border-t-2 border-ink pt-3">
        <h2 id="whole-h">The whole engine</h2>
        <dl className="grid gap-x-6 text-sm sm:grid-cols-2" data-testid="set-figures">
          <div className="flex justify-between border-b-hair border-rule py-1"><dt className="text-pencil">Swept volume per cylinder</dt><dd className="rl-num font-semibold">{formatQuantity("volume", computeSweptCc(engine.boreMm, engine.strokeMm), units)}</dd></div>
          <div className="flex justify-between border-b-hair border-rule py-1"><dt className="text-pencil">Chamber spread</dt><dd className="rl-num font-semibold" data-testid="chamber-spread">{f?.chamberSpread ? `${formatQuantity("volume", f.chamberSpread.spread, units)} (${f.chamberSpread.spreadPercent.toFixed(1)} %)` : "—"}</dd></div>
          <div className="flex justify-between border-b-hair border-rule py-1"><dt className="text-pencil">Geometric ratio spread</dt><dd className="rl-num font-semibold">{f?.ratioSpread ? f.ratioSpread.spread.toFixed(2) : "—"}</dd></div>
          <div className="flex justify-between border-b-hair border-rule py-1"><dt className="text-pencil">Squish spread</dt><dd className="rl-num font-semibold">{f?.squishSpread ? formatQuantity("squish", f.squishSpread.spread, units) : "—"}</dd></div>
          <div className="flex justify-between border-b-hair border-rule py-1"><dt className="text-pencil">Cranking spread</dt><dd className="rl-num font-semibold">{f?.crankingSpread ? `${formatQuantity("pressure", f.crankingSpread.spread, units)} (${f.crankingSpread.spreadPercent.toFixed(1)} %)` : "—"}</dd></div>
        </dl>
        {live.problem ? <p className="rl-error" role="alert">{live.problem}</p> : null}
        {f?.compliance && f.compliance.checks.some((c) => c.cylinderNo !== null && c.value !== null) ? <ComplianceList compliance={f.compliance} units={units} /> : null}
        <PhotoPicker engineId={engine.id} cylinderNo={null} photos={photos} onPhotos={setPhotos} />
        {errors.photos ? <p className="rl-error" role="alert">{errors.photos}</p> : null}
        <CautionList title="Before acting on these figures" cautions={COMPRESSION_CAUTIONS} testId="compression-cautions" />
      </section>

      <div className="fixed inset-x-0 bottom-0 z-10 border-t-hair border-rule bg-paper/95 px-4 py-3 sm:static sm:border-0 sm:bg-transparent sm:px-0" data-testid="save-bar">
        {unconfirmed.length ? (
          <p className="mb-2 text-sm font-semibold text-brass">Cylinder {unconfirmed.join(", ")}: the chamber readings do not agree yet; the set saves, but no volume is accepted.</p>
        ) : null}
        <button type="submit" className="rl-button w-full sm:w-auto" disabled={saving || uploading} data-testid="save-readings">
          {saving ? "Saving…" : uploading ? "Waiting for photos…" : "Save reading set"}
        </button>
      </div>
    </form>
  );
}
