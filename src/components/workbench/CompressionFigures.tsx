import type { JSX } from "react";
import { COMPRESSION_CAUTIONS } from "../../lib/domain/cautions.ts";
import { formatQuantity } from "../../lib/domain/units.ts";
import CautionList from "./CautionList.tsx";
import Figure from "./Figure.tsx";
import type { SectionProps } from "./section-props.ts";

/** Swept volume, displacement, both ratios and the chamber offset, as the measurements are typed. */
export default function CompressionFigures({ state, figures }: Pick<SectionProps, "state" | "figures">): JSX.Element {
  const u = state.units;
  const c = figures.compression;
  const cylinders = figures.compressionInput?.cylinders ?? 1;
  return (
    <section aria-labelledby="figures-h" aria-live="polite" className="space-y-4 lg:sticky lg:top-4 lg:self-start print:static">
      <h2 id="figures-h">Compression</h2>
      {!c ? (
        <p className="rl-notice" data-testid="figures-missing">
          {figures.missing.length > 0
            ? `Enter ${figures.missing.join(", ").toLowerCase()} to see the figures.`
            : "Correct the marked fields to see the figures."}
        </p>
      ) : (
        <>
          <dl data-testid="compression-figures">
            <Figure
              label="Geometric compression ratio"
              value={formatQuantity("ratio", c.geometricRatio, u)}
              testId="geometric-ratio"
              strong
            />
            <Figure
              label="Trapped compression ratio"
              value={c.trappedRatio === undefined ? "—" : formatQuantity("ratio", c.trappedRatio, u)}
              testId="trapped-ratio"
              strong
              note={
                c.trappedRatio === undefined
                  ? "Enter the exhaust timing (an angle also needs the rod length) to see it."
                  : "Counted from the moment the piston closes the exhaust port."
              }
            />
            <Figure label="Swept volume, one cylinder" value={formatQuantity("volume", c.sweptCc, u)} testId="swept-volume" />
            <Figure
              label={`Displacement, ${cylinders} cylinder${cylinders === 1 ? "" : "s"}`}
              value={formatQuantity("volume", c.displacementCc, u)}
              testId="displacement"
            />
            <Figure
              label="Installed chamber volume"
              value={formatQuantity("volume", figures.chamberCc ?? 0, u)}
              testId="installed-chamber"
            />
            {c.chamberOffsetCc !== undefined ? (
              <Figure
                label="Chamber offset (installed − flat plate)"
                value={formatQuantity("volume", c.chamberOffsetCc, u)}
                testId="chamber-offset"
              />
            ) : null}
            {c.exhaustTravelMm !== undefined ? (
              <Figure
                label="Exhaust port"
                testId="exhaust-port"
                value={
                  c.exhaustOpensDegAtdc === undefined
                    ? `${formatQuantity("length", c.exhaustTravelMm, u)} from TDC`
                    : `opens ${formatQuantity("angle", c.exhaustOpensDegAtdc, u)} ATDC`
                }
                note={
                  c.exhaustOpensDegAtdc === undefined
                    ? "Add the rod length to see the opening angle and duration."
                    : `Duration ${formatQuantity("angle", c.exhaustDurationDeg ?? 0, u)}; the piston travels ${formatQuantity("length", c.exhaustTravelMm, u)} from TDC to the port edge.`
                }
              />
            ) : null}
          </dl>
          <CautionList title="Read before you act on a ratio" cautions={COMPRESSION_CAUTIONS} testId="compression-cautions" />
        </>
      )}
    </section>
  );
}
