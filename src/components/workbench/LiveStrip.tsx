import type { JSX } from "react";
import { formatQuantity, type UnitChoice } from "../../lib/domain/units.ts";
import type { WorkbenchFigures } from "./compute-workbench.ts";

/**
 * On a phone the figures sit below the inputs; this strip keeps both ratios in sight while the
 * measurements are typed. Wide screens keep the figures beside the inputs instead.
 */
export default function LiveStrip({ figures, units }: { figures: WorkbenchFigures; units: UnitChoice }): JSX.Element | null {
  const c = figures.compression;
  if (!c) return null;
  return (
    <div
      className="sticky top-0 z-10 -mx-4 flex flex-wrap gap-x-4 border-b-hair border-rule bg-paper/95 px-4 py-2 text-sm lg:hidden print:hidden"
      data-testid="live-strip"
      aria-hidden="true"
    >
      <span>
        Geometric <strong className="rl-num">{formatQuantity("ratio", c.geometricRatio, units)}</strong>
      </span>
      <span>
        Trapped <strong className="rl-num">{c.trappedRatio === undefined ? "—" : formatQuantity("ratio", c.trappedRatio, units)}</strong>
      </span>
      <span>
        Swept <strong className="rl-num">{formatQuantity("volume", c.sweptCc, units)}</strong>
      </span>
    </div>
  );
}
