import type { JSX } from "react";
import { formatQuantity } from "../../lib/domain/units.ts";
import { FIELD_LABEL } from "./compute-workbench.ts";
import Figure from "./Figure.tsx";
import NumberField from "./NumberField.tsx";
import type { SectionProps } from "./section-props.ts";
import { formatForUnits, nextStepId, parseTypedNumber } from "./workbench-state.ts";

/** A target geometric ratio: the chamber and flat-plate volumes it needs, and the cut to get there. */
export default function TargetSection({ state, figures, setField, update }: SectionProps): JSX.Element {
  const u = state.units;
  const c = figures.compression;
  const squishMm = figures.plan?.before.squishMm;
  const cutMm = c?.headCutMm;

  function addCutToPlan(): void {
    if (cutMm === undefined) return;
    const value = formatForUnits("squish", Number(cutMm.toFixed(3)), u);
    update({ plan: [...state.plan, { id: nextStepId(state.plan), kind: "cut", value }] });
  }

  return (
    <section aria-labelledby="target-h" className="space-y-3">
      <h3 id="target-h" className="text-lg font-semibold">
        Aim for a ratio
      </h3>
      <div className="max-w-[14rem]">
        <NumberField
          id="wb-target"
          label={FIELD_LABEL.target}
          value={state.target}
          onChange={(v) => setField("target", v)}
          unit=":1"
          error={figures.errors.target}
        />
      </div>
      {c && c.targetChamberCc !== undefined && cutMm !== undefined && parseTypedNumber(state.target) !== undefined ? (
        <>
          <dl data-testid="target-figures">
            <Figure
              label="Installed chamber volume needed"
              value={formatQuantity("volume", c.targetChamberCc, u)}
              testId="target-chamber"
            />
            {c.targetFlatPlateCc !== undefined ? (
              <Figure
                label="Flat-plate head volume needed"
                value={formatQuantity("volume", c.targetFlatPlateCc, u)}
                testId="target-flat-plate"
                note="With this engine's chamber offset: what to measure the head to on the plate."
              />
            ) : null}
            <Figure
              label={cutMm >= 0 ? "Cut the head face (or base gasket) by" : "Add under the head (or a thicker base gasket)"}
              value={formatQuantity("squish", Math.abs(cutMm), u)}
              testId="target-cut"
              note={
                squishMm === undefined
                  ? "The squish clearance changes by the same amount."
                  : `A head cut takes the squish from ${formatQuantity("squish", squishMm, u)} to ${formatQuantity("squish", squishMm - cutMm, u)}; a base gasket change also moves the exhaust port.`
              }
            />
          </dl>
          <button type="button" className="rl-button-quiet print:hidden" onClick={addCutToPlan}>
            Plan this as a head cut ({formatQuantity("squish", cutMm, u)})
          </button>
        </>
      ) : null}
    </section>
  );
}
