import type { JSX } from "react";
import { DEFAULT_FUEL_TABLE } from "../../lib/domain/calc-api.ts";
import { normalizeFuelTable, type FuelTable } from "../../lib/domain/fuel.ts";
import { DEFAULT_POLYTROPIC_EXPONENT } from "../../lib/domain/cranking.ts";
import { convertToSi, formatQuantity, getUnitLabel } from "../../lib/domain/units.ts";
import CautionList from "./CautionList.tsx";
import { FIELD_LABEL } from "./compute-workbench.ts";
import FuelResult from "./FuelResult.tsx";
import NumberField from "./NumberField.tsx";
import type { SectionProps } from "./section-props.ts";
import { parseTypedNumber, type TextField } from "./workbench-state.ts";

interface Props extends SectionProps {
  /** Set while the elevation is still the organisation's shop elevation. */
  elevationHint?: string;
  /** The organisation's own table; null: the seed defaults. */
  fuelTable: FuelTable | null;
}

/** Elevation and air temperature in; the estimate set against the fuel table out, with its cautions. */
export default function FuelSection({ state, figures, setField, elevationHint, fuelTable }: Props): JSX.Element {
  const u = state.units;
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
  const before = figures.fuelBefore;
  const after = figures.fuelAfter;
  const builtFor = before && figures.compression ? readBuiltFor(state) : undefined;
  const rowBound = (kpa: number): string => `up to ${formatQuantity("pressure", kpa, u)}`;
  const rows = normalizeFuelTable(fuelTable ?? DEFAULT_FUEL_TABLE).rows;
  // The row that applies is the one whose bound the margin was measured to.
  const appliedBound = before && before.fuelGrade !== null ? before.crankingKpaEstimate + before.margin : null;

  return (
    <section aria-labelledby="fuel-h" className="space-y-5">
      <h2 id="fuel-h">Fuel check</h2>
      <div className="grid grid-cols-2 gap-4 lg:grid-cols-3">
        {field("elevation", {
          unit: getUnitLabel("elevation", u),
          signed: true,
          hint: elevationHint ?? "Of the event, above sea level (geometric).",
        })}
        {field("airTemp", {
          unit: getUnitLabel("temperature", u),
          signed: true,
          placeholder: "standard day",
          hint: "Blank: the standard-atmosphere temperature there.",
        })}
        {field("exponent", {
          placeholder: `${DEFAULT_POLYTROPIC_EXPONENT} if blank`,
          hint: `Blank: n = ${DEFAULT_POLYTROPIC_EXPONENT}, the exponent of a published worked example; your team's own fit replaces it.`,
        })}
      </div>
      <details
        className="border-y-hair border-rule py-2"
        open={Boolean(state.builtForMinElevation || state.buildMinOctane || state.fuelOctane)}
      >
        <summary className="cursor-pointer font-semibold">From the build sheet (optional)</summary>
        <div className="mt-3 grid grid-cols-2 gap-4 lg:grid-cols-3">
          {field("builtForMinElevation", {
            unit: getUnitLabel("elevation", u),
            signed: true,
            hint: "Altitude heads or inserts: the lowest elevation they suit.",
          })}
          {field("buildMinOctane", { unit: "(R+M)/2" })}
          {field("fuelOctane", { unit: "(R+M)/2", hint: "Blank: the table row's fuel." })}
        </div>
      </details>

      {!figures.compression ? (
        <p className="text-pencil">The fuel check opens once the measurements give a compression ratio.</p>
      ) : !before ? (
        <p className="rl-notice">{figures.fuelMissing ?? "Correct the marked fields to see the fuel check."}</p>
      ) : (
        <>
          <div className={`grid gap-6 ${after ? "md:grid-cols-2" : ""}`} aria-live="polite">
            <FuelResult
              title={after ? "As measured" : "Estimate"}
              result={before}
              units={u}
              builtForMinElevationM={builtFor}
              testId="fuel-before"
            />
            {after ? (
              <FuelResult title="After the plan" result={after} units={u} builtForMinElevationM={builtFor} testId="fuel-after" />
            ) : null}
          </div>
          <div className="break-inside-avoid">
            <h3 className="text-lg font-semibold">Fuel table</h3>
            <p className="mb-2 text-sm text-pencil" data-testid="fuel-table-label">
              {before.fuelTableLabel}
            </p>
            <table className="w-full border-collapse text-left" data-testid="fuel-table">
              <thead>
                <tr className="border-b-hair border-ink text-sm text-pencil">
                  <th scope="col" className="py-1 pr-3 font-semibold">
                    Estimated cranking (gauge)
                  </th>
                  <th scope="col" className="py-1 font-semibold">
                    Fuel the team runs
                  </th>
                </tr>
              </thead>
              <tbody>
                {rows.map((row) => {
                  const applies = appliedBound !== null && Math.abs(row.upToCrankingKpa - appliedBound) < 1e-6 * row.upToCrankingKpa;
                  return (
                    <tr key={`${row.upToCrankingKpa}-${row.grade}`} className={`border-b-hair border-rule ${applies ? "font-bold" : ""}`}>
                      <td className="rl-num whitespace-nowrap py-1.5 pr-3 align-top">{rowBound(row.upToCrankingKpa)}</td>
                      <td className="py-1.5">
                        {row.grade}
                        {applies ? (
                          <span className="ml-2 whitespace-nowrap rounded-sm border-hair border-ink px-1.5 text-sm">applies</span>
                        ) : null}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          <CautionList title="Read before you choose a fuel" cautions={before.cautions} testId="fuel-cautions" />
        </>
      )}
    </section>
  );
}

function readBuiltFor(state: SectionProps["state"]): number | undefined {
  const value = parseTypedNumber(state.builtForMinElevation);
  return value === undefined || !Number.isFinite(value) ? undefined : convertToSi("elevation", value, state.units);
}
