import type { JSX } from "react";
import { formatQuantity, getUnitLabel, type UnitChoice } from "../../lib/domain/units.ts";
import type { CylinderFigures } from "../../lib/motors/reading-figures.ts";
import NumberField from "../workbench/NumberField.tsx";
import PhotoPicker, { type Photo } from "./PhotoPicker.tsx";
import { CHAMBER_FIELDS_MAX, type CylinderDraft, type FormErrors } from "./reading-form-state.ts";

// One cylinder of a new reading set: the repeated burette readings with their agreement, flat
// plate, squish both sides, cranking and leak-down, and the figures worked out as they are typed.

interface Props {
  draft: CylinderDraft;
  figures: CylinderFigures | undefined;
  units: UnitChoice;
  toleranceCc: number;
  errors: FormErrors;
  timed: boolean;
  onChange: (next: CylinderDraft) => void;
  engineId: number;
  photos: Photo[];
  onPhotos: (update: (photos: Photo[]) => Photo[]) => void;
}

function AgreementNote({ draft, figures, units, toleranceCc }: { draft: CylinderDraft; figures: CylinderFigures | undefined; units: UnitChoice; toleranceCc: number }): JSX.Element {
  const typed = draft.chamber.filter((v) => v.trim() !== "").length;
  const c = figures?.chamber;
  const tol = formatQuantity("volume", toleranceCc, units);
  let text: string;
  let tone = "text-pencil";
  if (typed === 0) text = `Fill the chamber until two readings agree within ${tol}.`;
  else if (typed === 1) text = `Take a second reading: the volume is accepted when two agree within ${tol}.`;
  else if (c?.status === "confirmed" && c.agreeingIndexes && c.valueCc !== null) {
    const [a, b] = c.agreeingIndexes;
    text = `Readings ${a + 1} and ${b + 1} agree: ${formatQuantity("volume", c.valueCc, units)} accepted.${c.disagreeingIndexes.length ? ` Reading ${c.disagreeingIndexes.map((i) => i + 1).join(", ")} stands apart.` : ""}`;
    tone = "text-spruce font-semibold";
  } else {
    text = `No two readings agree within ${tol}: check the seal and for bubbles, then take another reading.`;
    tone = "text-brass font-semibold";
  }
  return <p className={`text-sm ${tone}`} role="status" data-testid={`agreement-${draft.cylinderNo}`}>{text}</p>;
}

function LiveFigures({ figures, units, timed }: { figures: CylinderFigures | undefined; units: UnitChoice; timed: boolean }): JSX.Element {
  const f = figures;
  const row = (label: string, value: string | null, testId: string, note?: string): JSX.Element => (
    <div className="flex items-baseline justify-between gap-3 border-b-hair border-rule py-1 last:border-b-0">
      <dt className="text-pencil">{label}{note ? <span className="block text-xs">{note}</span> : null}</dt>
      <dd className="rl-num text-lg font-semibold" data-testid={testId}>{value ?? "—"}</dd>
    </div>
  );
  const n = f?.cylinderNo ?? 0;
  return (
    <dl className="rounded-sm border-hair border-rule bg-sheet px-3 py-1 text-sm" aria-live="polite" data-testid={`live-${n}`}>
      {row("Geometric ratio", f?.geometricRatio != null ? formatQuantity("ratio", f.geometricRatio, units) : null, `geometric-${n}`, "swept + chamber over chamber")}
      {row(
        "Trapped ratio",
        f?.trappedRatio != null ? formatQuantity("ratio", f.trappedRatio, units) : null,
        `trapped-${n}`,
        timed ? "from exhaust port closing" : "needs the rod length and exhaust timing in the spec",
      )}
      {row("Chamber offset", f?.chamberOffsetCc != null ? formatQuantity("volume", f.chamberOffsetCc, units) : null, `offset-${n}`, "installed minus flat plate")}
      {row(
        "Squish, mean",
        f?.squishMeanMm != null ? formatQuantity("squish", f.squishMeanMm, units) : null,
        `squish-${n}`,
        f?.squishSideDifferenceMm != null ? `sides differ by ${formatQuantity("squish", f.squishSideDifferenceMm, units)}` : undefined,
      )}
      {row("Cranking at shop elevation", f?.crankingAtReferenceKpa != null ? formatQuantity("pressure", f.crankingAtReferenceKpa, units) : null, `cranking-ref-${n}`)}
    </dl>
  );
}

export default function CylinderBlock({ draft, figures, units, toleranceCc, errors, timed, onChange, engineId, photos, onPhotos }: Props): JSX.Element {
  const n = draft.cylinderNo;
  const key = (f: string): string => `cyl-${n}-${f}`;
  const set = (patch: Partial<CylinderDraft>): void => onChange({ ...draft, ...patch });
  const apart = new Set(figures?.chamber.status === "confirmed" ? figures.chamber.disagreeingIndexes : []);
  const vol = getUnitLabel("volume", units);
  const len = getUnitLabel("squish", units);
  return (
    <fieldset className="border-t-2 border-ink pt-3" data-testid={`cylinder-${n}`} id={`cylinder-${n}`}>
      <legend className="pr-2 text-xl font-semibold">Cylinder {n}</legend>
      {errors[key("block")] ? <p className="rl-error" role="alert">{errors[key("block")]}</p> : null}
      <div className="grid gap-5 lg:grid-cols-[1fr_18rem]">
        <div className="space-y-4">
          <div>
            <p className="rl-label">Chamber volume at TDC, by burette</p>
            <div className="grid grid-cols-2 gap-3 sm:grid-cols-3">
              {draft.chamber.map((v, i) => (
                <NumberField
                  key={i}
                  id={key(`chamber-${i}`)}
                  label={`Reading ${i + 1}`}
                  value={v}
                  unit={vol}
                  error={errors[key(`chamber-${i}`)] ?? (apart.has(i) ? "stands apart" : undefined)}
                  onChange={(text) => set({ chamber: draft.chamber.map((x, j) => (j === i ? text : x)) })}
                />
              ))}
            </div>
            <div className="mt-2 flex flex-wrap items-center gap-3">
              {draft.chamber.length < CHAMBER_FIELDS_MAX ? (
                <button type="button" className="rl-button-quiet !min-h-0 !py-1.5 text-sm" onClick={() => set({ chamber: [...draft.chamber, ""] })}>
                  + Another reading
                </button>
              ) : null}
              <AgreementNote draft={draft} figures={figures} units={units} toleranceCc={toleranceCc} />
            </div>
            {figures?.geometricRatio != null ? (
              <p className="rl-num mt-1 text-sm lg:hidden" aria-hidden="true">
                Geometric <strong>{formatQuantity("ratio", figures.geometricRatio, units)}</strong>
                {figures.trappedRatio != null ? <> · trapped <strong>{formatQuantity("ratio", figures.trappedRatio, units)}</strong></> : null}
              </p>
            ) : null}
          </div>
          <div className="grid grid-cols-2 gap-3 sm:grid-cols-3">
            <NumberField id={key("flat")} label="Flat-plate head volume" value={draft.flat} unit={vol} error={errors[key("flat")]} onChange={(t) => set({ flat: t })} />
            <NumberField id={key("squishA")} label="Squish, side A" value={draft.squishA} unit={len} error={errors[key("squishA")]} onChange={(t) => set({ squishA: t })} hint="one end of the pin axis" />
            <NumberField id={key("squishB")} label="Squish, side B" value={draft.squishB} unit={len} error={errors[key("squishB")]} onChange={(t) => set({ squishB: t })} hint="the other end" />
            <NumberField id={key("cranking")} label="Cranking compression" value={draft.cranking} unit={getUnitLabel("pressure", units)} error={errors[key("cranking")]} onChange={(t) => set({ cranking: t })} hint="gauge, throttle open" />
            <NumberField id={key("leak")} label="Leak-down" value={draft.leak} unit="%" error={errors[key("leak")]} onChange={(t) => set({ leak: t })} />
          </div>
          <div>
            <label className="rl-label" htmlFor={key("notes")}>Notes on this cylinder</label>
            <input id={key("notes")} className="rl-field" value={draft.notes} maxLength={500} onChange={(e) => set({ notes: e.target.value })} />
            {errors[key("notes")] ? <p className="rl-error" role="alert">{errors[key("notes")]}</p> : null}
          </div>
          <PhotoPicker engineId={engineId} cylinderNo={n} photos={photos} onPhotos={onPhotos} />
        </div>
        <div>
          <p className="rl-label">Worked out as you type</p>
          <LiveFigures figures={figures} units={units} timed={timed} />
        </div>
      </div>
    </fieldset>
  );
}
