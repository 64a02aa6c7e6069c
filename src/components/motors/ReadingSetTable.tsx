import type { JSX } from "react";
import { formatQuantity, type UnitChoice } from "../../lib/domain/units.ts";
import type { Compliance } from "../../lib/motors/reading-figures.ts";
import type { ReadingSet } from "../../lib/motors/types.ts";
import Ring from "../ui/Ring.tsx";
import { describeCompliance, describeReadingRows, describeSpread } from "./reading-rows.ts";

// One reading set as a table: quantities down, cylinders across, the typed readings and the
// figures worked out from them. Rendered on the server (engine file, build sheet); no script.

export function ComplianceList({ compliance, units }: { compliance: Compliance; units: UnitChoice }): JSX.Element {
  const words = describeCompliance(compliance, units);
  return (
    <div className="text-sm" data-testid="compliance">
      <p className="flex items-center gap-2 font-semibold">
        <Ring level={compliance.compliant === false ? "act" : compliance.compliant === true ? "fine" : "watch"} size={16} />
        <span>{words.verdict}</span>
      </p>
      <ul className="mt-1 space-y-0.5 pl-6">
        {words.checks.map((c, i) => (
          <li key={i} className={c.pass === false ? "font-semibold text-oxide" : ""}>{c.text}</li>
        ))}
      </ul>
      {compliance.squishWireNote ? <p className="mt-1 pl-6 text-pencil">How the class reads squish: {compliance.squishWireNote}</p> : null}
    </div>
  );
}

export function SpreadLine({ set, units }: { set: ReadingSet; units: UnitChoice }): JSX.Element | null {
  const text = describeSpread(set, units);
  if (!text) return null;
  return <p className="text-sm"><span className="font-semibold">Spread between cylinders:</span> <span className="rl-num">{text}</span></p>;
}

/** The burette readings with the agreeing pair in bold and any that stand apart struck through. */
function ChamberReadings({ set, cylinderNo, units }: { set: ReadingSet; cylinderNo: number; units: UnitChoice }): JSX.Element {
  const c = set.cylinders.find((x) => x.cylinderNo === cylinderNo);
  const f = set.figures.cylinders.find((x) => x.cylinderNo === cylinderNo);
  if (!c || c.chamberReadingsCc.length === 0) return <>—</>;
  const agreeing = new Set(f?.chamber.agreeingIndexes ?? []);
  return (
    <span>
      {c.chamberReadingsCc.map((v, i) => (
        <span key={i}>
          {i > 0 ? ", " : ""}
          <span className={`whitespace-nowrap ${agreeing.has(i) ? "font-semibold" : "text-pencil line-through decoration-rule"}`}>{formatQuantity("volume", v, units)}</span>
        </span>
      ))}
      {f?.chamber.status === "unconfirmed" ? <span className="block text-xs font-semibold text-oxide">no two agree</span> : null}
    </span>
  );
}

interface Props {
  set: ReadingSet;
  units: UnitChoice;
}

export default function ReadingSetTable({ set, units }: Props): JSX.Element {
  const rows = describeReadingRows(set, units);
  const cylinders = [...set.cylinders].map((c) => c.cylinderNo).sort((a, b) => a - b);
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[18rem] border-collapse text-sm" data-testid="reading-set-table">
        <thead>
          <tr className="border-b-hair border-ink">
            <th scope="col" className="py-1.5 pr-3 text-left font-semibold text-pencil">Cylinder</th>
            {cylinders.map((n) => <th key={n} scope="col" className="px-2 py-1.5 text-right font-semibold">{n}</th>)}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="border-b-hair border-rule align-top" data-row={r.key}>
              <th scope="row" className="py-1.5 pr-3 text-left font-normal text-pencil">
                {r.label}
                {r.computed ? <span className="sr-only"> (worked out)</span> : null}
              </th>
              {cylinders.map((n, i) => (
                <td key={n} className={`rl-num px-2 py-1.5 text-right ${r.strong ? "font-semibold" : ""}`}>
                  {r.key === "chamberReadings" ? <ChamberReadings set={set} cylinderNo={n} units={units} /> : r.cells[i]}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
