import { formatQuantity, type QuantityKind, type UnitChoice } from "../../lib/domain/units.ts";
import type { ComplianceRule, Compliance } from "../../lib/motors/reading-figures.ts";
import type { ReadingSet } from "../../lib/motors/types.ts";

// A reading set worded as rows of text (quantities down, cylinders across), shared by the
// engine file's table, the printable build sheet and the PDF so all three say the same.

export type RowKey =
  | "chamberReadings"
  | "chamber"
  | "flat"
  | "offset"
  | "geometric"
  | "trapped"
  | "squishSides"
  | "squishMean"
  | "cranking"
  | "crankingRef"
  | "leakdown";

export interface ReadingRow {
  key: RowKey;
  label: string;
  /** Worked out from the readings, not typed. */
  computed: boolean;
  strong: boolean;
  /** One per cylinder, in cylinder order; "—" where nothing was measured. */
  cells: string[];
}

const LABEL: Record<RowKey, string> = {
  chamberReadings: "Chamber readings (burette)",
  chamber: "Accepted chamber volume",
  flat: "Flat-plate head volume",
  offset: "Chamber offset",
  geometric: "Geometric compression ratio",
  trapped: "Trapped compression ratio",
  squishSides: "Squish, side A / side B",
  squishMean: "Squish, mean",
  cranking: "Cranking compression, as read",
  crankingRef: "Cranking at the shop's elevation",
  leakdown: "Leak-down",
};

export const DASH = "—";

/** The rows that hold at least one value, in reading order. */
export function describeReadingRows(set: ReadingSet, units: UnitChoice): ReadingRow[] {
  const q = (kind: QuantityKind, v: number | null | undefined): string => (v === null || v === undefined ? DASH : formatQuantity(kind, v, units));
  const cylinders = [...set.cylinders].sort((a, b) => a.cylinderNo - b.cylinderNo);
  const figures = new Map(set.figures.cylinders.map((f) => [f.cylinderNo, f]));
  const cell = (key: RowKey, n: number): string => {
    const c = cylinders.find((x) => x.cylinderNo === n);
    const f = figures.get(n);
    if (!c) return DASH;
    switch (key) {
      case "chamberReadings":
        return c.chamberReadingsCc.length ? c.chamberReadingsCc.map((v) => formatQuantity("volume", v, units)).join(", ") + (f?.chamber.status === "unconfirmed" ? " (no two agree)" : "") : DASH;
      case "chamber":
        return q("volume", f?.chamber.valueCc);
      case "flat":
        return q("volume", c.flatPlateCc);
      case "offset":
        return q("volume", f?.chamberOffsetCc);
      case "geometric":
        return q("ratio", f?.geometricRatio);
      case "trapped":
        return q("ratio", f?.trappedRatio);
      case "squishSides":
        return c.squishAMm === null ? DASH : `${q("squish", c.squishAMm)} / ${q("squish", c.squishBMm)}`;
      case "squishMean":
        return q("squish", f?.squishMeanMm);
      case "cranking":
        return q("pressure", c.crankingKpa);
      case "crankingRef":
        return q("pressure", f?.crankingAtReferenceKpa);
      case "leakdown":
        return q("percent", c.leakdownPct);
    }
  };
  const computed = new Set<RowKey>(["chamber", "offset", "geometric", "trapped", "squishMean", "crankingRef"]);
  const strong = new Set<RowKey>(["chamber", "geometric", "squishMean"]);
  return (Object.keys(LABEL) as RowKey[])
    .map((key) => ({ key, label: LABEL[key], computed: computed.has(key), strong: strong.has(key), cells: cylinders.map((c) => cell(key, c.cylinderNo)) }))
    .filter((r) => r.cells.some((v) => v !== DASH));
}

export function describeSpread(set: ReadingSet, units: UnitChoice): string | null {
  const f = set.figures;
  const parts: string[] = [];
  if (f.chamberSpread) parts.push(`chamber ${formatQuantity("volume", f.chamberSpread.spread, units)} (${f.chamberSpread.spreadPercent.toFixed(1)} %)`);
  if (f.ratioSpread) parts.push(`geometric ratio ${f.ratioSpread.spread.toFixed(2)}`);
  if (f.squishSpread) parts.push(`squish ${formatQuantity("squish", f.squishSpread.spread, units)}`);
  if (f.crankingSpread) parts.push(`cranking ${formatQuantity("pressure", f.crankingSpread.spread, units)} (${f.crankingSpread.spreadPercent.toFixed(1)} %)`);
  return parts.length ? parts.join(" · ") : null;
}

const RULE_LABEL: Record<ComplianceRule, string> = {
  minSquishMm: "Squish (mean) at least",
  minChamberCc: "Installed chamber at least",
  minFlatPlateCc: "Flat-plate volume at least",
  maxDisplacementCc: "Displacement at most",
};
const RULE_KIND: Record<ComplianceRule, QuantityKind> = { minSquishMm: "squish", minChamberCc: "volume", minFlatPlateCc: "volume", maxDisplacementCc: "volume" };

export interface ComplianceWords {
  verdict: string;
  checks: { text: string; pass: boolean | null }[];
}

export function describeCompliance(c: Compliance, units: UnitChoice): ComplianceWords {
  const verdict = c.compliant === true ? "meets" : c.compliant === false ? "does not meet" : "cannot yet be checked against";
  return {
    verdict: `This set ${verdict} the rules of ${c.className}.`,
    checks: c.checks.map((k) => ({
      text: `${RULE_LABEL[k.rule]} ${formatQuantity(RULE_KIND[k.rule], k.limit, units)}${k.cylinderNo ? `, cylinder ${k.cylinderNo}` : ""}: ${k.value === null ? "not measured" : formatQuantity(RULE_KIND[k.rule], k.value, units)} — ${k.pass === null ? "not checked" : k.pass ? "passes" : "fails"}`,
      pass: k.pass,
    })),
  };
}
