import type { JSX } from "react";
import { MEASURING_CAUTIONS } from "../../lib/domain/cautions.ts";
import { getUnitLabel } from "../../lib/domain/units.ts";
import CautionList from "./CautionList.tsx";
import Choice from "./Choice.tsx";
import { FIELD_LABEL } from "./compute-workbench.ts";
import NumberField from "./NumberField.tsx";
import type { SectionProps } from "./section-props.ts";
import type { ChamberMode, ExhaustMode, TextField } from "./workbench-state.ts";

const CHAMBER_MODES: { value: ChamberMode; label: string }[] = [
  { value: "installed", label: "Installed volume" },
  { value: "plate", label: "Flat plate + offset" },
];

const EXHAUST_MODES: { value: ExhaustMode; label: string }[] = [
  { value: "opens", label: "Opens ATDC" },
  { value: "duration", label: "Duration" },
  { value: "travel", label: "Travel to port edge" },
];

/** The measurements: bore, stroke, rod, the chamber and the exhaust port. */
export default function EngineSection({ state, figures, setField, update }: SectionProps): JSX.Element {
  const length = getUnitLabel("length", state.units);
  const volume = getUnitLabel("volume", state.units);
  const field = (f: TextField, extra: { unit?: string; hint?: string; placeholder?: string; signed?: boolean } = {}): JSX.Element => (
    <NumberField
      id={`wb-${f}`}
      label={FIELD_LABEL[f]}
      value={state[f]}
      onChange={(v) => setField(f, v)}
      error={figures.errors[f]}
      {...extra}
    />
  );

  return (
    <section aria-labelledby="engine-h" className="space-y-5">
      <h2 id="engine-h">Measurements</h2>
      <div className="grid grid-cols-2 gap-4">
        {field("bore", { unit: length })}
        {field("stroke", { unit: length })}
        {field("rod", { unit: length, hint: "Centre to centre; places the port from an angle." })}
        {field("cylinders", { hint: "Same bore and stroke each." })}
      </div>

      <div className="space-y-4 border-t-hair border-rule pt-4">
        <Choice
          name="chamber-mode"
          legend="Chamber volume from"
          value={state.chamberMode}
          options={CHAMBER_MODES}
          onChange={(v) => update({ chamberMode: v })}
        />
        {state.chamberMode === "installed" ? (
          <div className="grid grid-cols-2 gap-4">
            {field("chamber", { unit: volume, hint: "Piston at TDC: everything above the crown." })}
            {field("plate", { unit: volume, hint: "Optional: gives the chamber offset." })}
          </div>
        ) : (
          <div className="grid grid-cols-2 gap-4">
            {field("plate", { unit: volume, hint: "The head alone, sealed on a flat plate." })}
            {field("offset", { unit: volume, signed: true, hint: "Installed − flat plate; usually negative." })}
          </div>
        )}
        <CautionList tone="notice" title="Before you measure with the burette" cautions={MEASURING_CAUTIONS} testId="measuring-reminders" />
        <div className="grid grid-cols-2 gap-4">
          <div className="col-span-2 sm:col-span-1">
            {field("squish", {
              unit: length,
              hint: "Optional: the mean of the solder readings on both sides of the pin axis, for planning a change.",
            })}
          </div>
        </div>
      </div>

      <div className="space-y-4 border-t-hair border-rule pt-4">
        <Choice
          name="exhaust-mode"
          legend="Exhaust port timing as"
          value={state.exhaustMode}
          options={EXHAUST_MODES}
          onChange={(v) => update({ exhaustMode: v })}
        />
        <div className="sm:max-w-[calc(50%-0.5rem)]">
          {state.exhaustMode === "opens"
            ? field("exhaustOpens", { unit: "° ATDC", hint: "Crank angle after TDC at which the port opens; needs the rod length." })
            : state.exhaustMode === "duration"
              ? field("exhaustDuration", {
                  unit: "°",
                  hint: "Degrees of crank the port is open, symmetric about BDC; needs the rod length.",
                })
              : field("exhaustTravel", { unit: length, hint: "Piston travel from TDC to the top edge of the exhaust port." })}
        </div>
      </div>
    </section>
  );
}
