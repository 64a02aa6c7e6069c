import type { JSX } from "react";
import type { FuelCheckResult, RiskFlag } from "../../lib/domain/calc-api.ts";
import { formatQuantity, type UnitChoice } from "../../lib/domain/units.ts";
import Ring, { type SignalLevel } from "../ui/Ring.tsx";
import Figure from "./Figure.tsx";

const FLAG_LEVEL: Record<RiskFlag["code"], SignalLevel> = {
  "built-for-altitude-at-low-event": "act",
  "fuel-below-build-minimum": "act",
  "above-fuel-table": "act",
  "margin-within-gauge-scatter": "watch",
  "estimate-from-geometric-ratio": "watch",
};

/** The domain's flag text in the person's units where it quotes a number. */
function describeFlag(flag: RiskFlag, result: FuelCheckResult, units: UnitChoice, builtForMinElevationM?: number): string {
  const elevation = (m: number): string => formatQuantity("elevation", m, units);
  if (flag.code === "built-for-altitude-at-low-event" && builtForMinElevationM !== undefined) {
    return `Built for ${elevation(builtForMinElevationM)} and above, checked at ${elevation(result.densityAltitudeM)} density altitude: the air is denser than the engine was built for and cylinder pressure will be higher.`;
  }
  if (flag.code === "above-fuel-table") {
    return `The estimated cranking pressure of ${formatQuantity("pressure", result.crankingKpaEstimate, units)} is above every row of the fuel table: no row applies.`;
  }
  return flag.message;
}

interface Props {
  title: string;
  result: FuelCheckResult;
  units: UnitChoice;
  builtForMinElevationM?: number;
  testId: string;
}

/** One fuel check: the estimate, the table row it falls in, the margin and the risk flags. */
export default function FuelResult({ title, result, units, builtForMinElevationM, testId }: Props): JSX.Element {
  const ratio = result.trappedRatio ?? result.geometricRatio;
  const aboveTable = result.fuelGrade === null;
  return (
    <div className="min-w-0 break-inside-avoid" data-testid={testId}>
      <h3 className="mb-1 text-lg font-semibold">{title}</h3>
      <dl>
        <Figure
          label="Estimated cranking pressure (gauge)"
          value={formatQuantity("pressure", result.crankingKpaEstimate, units)}
          testId={`${testId}-cranking`}
          strong
          note={`Ambient × ${result.ratioBasis} ratio ${formatQuantity("ratio", ratio, units)} to the power n = ${result.polytropicExponent}, less ambient.`}
        />
        <Figure label="Fuel table row" value={aboveTable ? "none: above every row" : result.fuelGrade} testId={`${testId}-grade`} wordy />
        <Figure
          label={aboveTable ? "Above the table's top row by" : "Margin below that row's bound"}
          value={formatQuantity("pressure", Math.abs(result.margin), units)}
          testId={`${testId}-margin`}
        />
        <Figure
          label="Density altitude"
          value={formatQuantity("elevation", result.densityAltitudeM, units)}
          testId={`${testId}-density-altitude`}
        />
        <Figure label="Ambient pressure (standard atmosphere)" value={formatQuantity("pressure", result.ambientKpa, units)} />
        <Figure label="Air temperature used" value={formatQuantity("temperature", result.airTempC, units)} />
      </dl>
      {result.riskFlags.length > 0 ? (
        <ul className="mt-3 space-y-2" data-testid={`${testId}-flags`}>
          {result.riskFlags.map((flag) => (
            <li key={flag.code} className="flex gap-2">
              <span className="mt-0.5 shrink-0">
                <Ring level={FLAG_LEVEL[flag.code]} size={18} />
              </span>
              <span>
                <span className="font-semibold">{FLAG_LEVEL[flag.code] === "act" ? "Act: " : "Watch: "}</span>
                {describeFlag(flag, result, units, builtForMinElevationM)}
              </span>
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-3 flex items-center gap-2">
          <Ring level="fine" size={18} /> No risk flags for these figures.
        </p>
      )}
    </div>
  );
}
