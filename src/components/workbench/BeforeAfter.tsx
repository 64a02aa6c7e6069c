import type { JSX } from "react";
import type { GeometryFigures } from "../../lib/domain/machining.ts";
import { formatQuantity, type QuantityKind, type UnitChoice } from "../../lib/domain/units.ts";
import type { PlanOutcome } from "./compute-workbench.ts";

interface Row {
  label: string;
  kind: QuantityKind;
  pick: (g: GeometryFigures) => number | undefined;
  suffix?: string;
}

const ROWS: Row[] = [
  { label: "Installed chamber volume", kind: "volume", pick: (g) => g.chamberCc },
  { label: "Flat-plate head volume", kind: "volume", pick: (g) => g.flatPlateCc },
  { label: "Chamber offset", kind: "volume", pick: (g) => g.chamberOffsetCc },
  { label: "Geometric compression ratio", kind: "ratio", pick: (g) => g.geometricRatio },
  { label: "Trapped compression ratio", kind: "ratio", pick: (g) => g.trappedRatio },
  { label: "Squish clearance", kind: "squish", pick: (g) => g.squishMm },
  { label: "Exhaust opens", kind: "angle", pick: (g) => g.exhaustOpensDegAtdc, suffix: " ATDC" },
  { label: "Exhaust duration", kind: "angle", pick: (g) => g.exhaustDurationDeg },
  { label: "Travel to exhaust port edge", kind: "length", pick: (g) => g.exhaustTravelMm },
];

function signed(text: string, value: number): string {
  return value > 0 && !text.startsWith("+") ? `+${text}` : text;
}

/** The engine as measured and after the plan, side by side. */
export default function BeforeAfter({ plan, units }: { plan: PlanOutcome; units: UnitChoice }): JSX.Element {
  const rows = ROWS.filter((r) => r.pick(plan.before) !== undefined);
  const { headCutTotalMm, baseGasketChangeMm, bowlAddedCc } = plan.totals;
  return (
    <div className="break-inside-avoid">
      <table className="w-full border-collapse text-left text-[0.95rem] sm:text-base" data-testid="before-after">
        <caption className="sr-only">The engine as measured and after the planned change</caption>
        <thead>
          <tr className="border-b-hair border-ink text-sm text-pencil">
            <th scope="col" className="py-2 pr-2 font-semibold">
              Figure
            </th>
            <th scope="col" className="py-2 pl-2 text-right font-semibold">
              As measured
            </th>
            <th scope="col" className="py-2 pl-3 text-right font-semibold">
              After the plan
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => {
            const before = r.pick(plan.before) as number;
            const after = r.pick(plan.after);
            const beforeText = formatQuantity(r.kind, before, units) + (r.suffix ?? "");
            const afterText = after === undefined ? "—" : formatQuantity(r.kind, after, units) + (r.suffix ?? "");
            const changed = afterText !== beforeText;
            return (
              <tr key={r.label} className="border-b-hair border-rule">
                <th scope="row" className="py-2 pr-2 font-normal text-pencil">
                  {r.label}
                </th>
                <td className="rl-num whitespace-nowrap py-2 pl-2 text-right">{beforeText}</td>
                <td
                  className={`rl-num whitespace-nowrap py-2 pl-3 text-right ${changed ? "font-bold" : ""}`}
                  data-testid={`after-${r.label.toLowerCase().replace(/[^a-z]+/g, "-")}`}
                >
                  {afterText}
                  {changed ? <span className="sr-only"> (changed)</span> : null}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="mt-2 text-sm text-pencil" data-testid="plan-totals">
        In total: head face cut {formatQuantity("squish", headCutTotalMm, units)}, base gasket{" "}
        {signed(formatQuantity("squish", baseGasketChangeMm, units), baseGasketChangeMm)}, bowl opened{" "}
        {signed(formatQuantity("volume", bowlAddedCc, units), bowlAddedCc)}.
      </p>
    </div>
  );
}
