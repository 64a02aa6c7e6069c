import { computeCompression } from "../domain/calc-api.ts";
import { computeDisplacementCc, computeSpread, type Spread } from "../domain/compression.ts";
import { convertCrankingToElevation } from "../domain/cranking.ts";
import { confirmChamberReadings, type ReadingStatus } from "../domain/readings.ts";
import { summarizeSquish } from "../domain/squish.ts";

// The figures of a reading set, worked out from the readings as typed and the engine's spec.
// Never stored: a corrected spec or tolerance changes every figure the next time it is read.
// Pure (no server imports), so a form can show the same figures live while a mechanic types.

export interface FigureEngine {
  cycle: "two_stroke" | "four_stroke";
  cylinders: number;
  boreMm: number;
  strokeMm: number;
  rodMm: number | null;
  exhaustOpensDegAtdc: number | null;
}

export interface FigureCylinder {
  cylinderNo: number;
  chamberReadingsCc: number[];
  flatPlateCc: number | null;
  squishAMm: number | null;
  squishBMm: number | null;
  crankingKpa: number | null;
  leakdownPct: number | null;
}

export interface ClassRules {
  id: number;
  name: string;
  minSquishMm: number | null;
  minChamberCc: number | null;
  minFlatPlateCc: number | null;
  maxDisplacementCc: number | null;
  squishWireNote: string | null;
}

export interface FigureOptions {
  /** Agreement for repeated chamber readings, cc. */
  toleranceCc: number;
  /** Where the set was taken. */
  elevationM: number;
  /** The organisation's reference (shop) elevation; cranking is also shown as if read there. */
  referenceElevationM: number | null;
  rules: ClassRules | null;
}

export interface CylinderFigures {
  cylinderNo: number;
  chamber: {
    status: ReadingStatus;
    /** The accepted volume (mean of the agreeing pair); null unless confirmed. */
    valueCc: number | null;
    agreeingIndexes: [number, number] | null;
    disagreeingIndexes: number[];
  };
  geometricRatio: number | null;
  exhaustTravelMm: number | null;
  trappedRatio: number | null;
  chamberOffsetCc: number | null;
  squishMeanMm: number | null;
  squishSideDifferenceMm: number | null;
  crankingAtReferenceKpa: number | null;
}

export type ComplianceRule = "minSquishMm" | "minChamberCc" | "minFlatPlateCc" | "maxDisplacementCc";

export interface ComplianceCheck {
  rule: ComplianceRule;
  cylinderNo: number | null;
  limit: number;
  /** null: not measured in this set. */
  value: number | null;
  pass: boolean | null;
}

export interface Compliance {
  racingClassId: number;
  className: string;
  squishWireNote: string | null;
  /** false when any rule fails; true when every measured rule passes; null when nothing could be checked. */
  compliant: boolean | null;
  checks: ComplianceCheck[];
}

export interface SetFigures {
  sweptCc: number;
  displacementCc: number;
  toleranceCc: number;
  referenceElevationM: number | null;
  cylinders: CylinderFigures[];
  chamberSpread: Spread | null;
  ratioSpread: Spread | null;
  squishSpread: Spread | null;
  crankingSpread: Spread | null;
  compliance: Compliance | null;
}

/** Figures go out to 4 decimals: far below any gauge's resolution, free of binary round-off (1.5150000000000001). */
function tidy(value: number): number;
function tidy(value: number | null | undefined): number | null;
function tidy(value: number | null | undefined): number | null {
  return value === null || value === undefined ? null : Math.round(value * 1e4) / 1e4;
}

function spreadOf(field: string, values: number[]): Spread | null {
  if (values.length < 2) return null;
  let s: Spread;
  if (values.every((v) => v > 0)) s = computeSpread(field, values);
  else {
    // A dead cylinder reads 0 on the gauge; the spread is still meaningful (and alarming).
    const min = Math.min(...values);
    const max = Math.max(...values);
    s = { min, max, spread: max - min, spreadPercent: max > 0 ? ((max - min) / max) * 100 : 0 };
  }
  return { min: tidy(s.min), max: tidy(s.max), spread: tidy(s.spread), spreadPercent: tidy(s.spreadPercent) };
}

function figuresForCylinder(engine: FigureEngine, c: FigureCylinder, opts: FigureOptions): CylinderFigures {
  const agreement = confirmChamberReadings(c.chamberReadingsCc, opts.toleranceCc);
  const chamberCc = agreement.status === "confirmed" ? (agreement.value as number) : null;
  const out: CylinderFigures = {
    cylinderNo: c.cylinderNo,
    chamber: {
      status: agreement.status,
      valueCc: chamberCc,
      agreeingIndexes: agreement.agreeingIndexes ?? null,
      disagreeingIndexes: agreement.disagreeingIndexes,
    },
    geometricRatio: null,
    exhaustTravelMm: null,
    trappedRatio: null,
    chamberOffsetCc: null,
    squishMeanMm: null,
    squishSideDifferenceMm: null,
    crankingAtReferenceKpa: null,
  };
  if (chamberCc !== null) {
    const timed = engine.cycle === "two_stroke" && engine.rodMm !== null && engine.exhaustOpensDegAtdc !== null;
    const result = computeCompression({
      boreMm: engine.boreMm,
      strokeMm: engine.strokeMm,
      chamberCc,
      ...(timed ? { rodMm: engine.rodMm as number, exhaustOpensDegAtdc: engine.exhaustOpensDegAtdc as number } : {}),
      ...(c.flatPlateCc !== null ? { flatPlateCc: c.flatPlateCc } : {}),
    });
    out.chamber.valueCc = tidy(chamberCc);
    out.geometricRatio = tidy(result.geometricRatio);
    out.exhaustTravelMm = tidy(result.exhaustTravelMm);
    out.trappedRatio = tidy(result.trappedRatio);
    out.chamberOffsetCc = tidy(result.chamberOffsetCc);
  }
  if (c.squishAMm !== null && c.squishBMm !== null) {
    const squish = summarizeSquish(c.squishAMm, c.squishBMm);
    out.squishMeanMm = tidy(squish.meanMm);
    out.squishSideDifferenceMm = tidy(squish.sideDifferenceMm);
  }
  if (c.crankingKpa !== null && opts.referenceElevationM !== null) {
    out.crankingAtReferenceKpa = tidy(convertCrankingToElevation(c.crankingKpa, opts.elevationM, opts.referenceElevationM));
  }
  return out;
}

function checkCompliance(
  rules: ClassRules,
  displacementCc: number,
  cylinders: FigureCylinder[],
  figures: CylinderFigures[],
): Compliance {
  const checks: ComplianceCheck[] = [];
  const perCylinder = (rule: ComplianceRule, limit: number | null, pick: (i: number) => number | null, atLeast: boolean): void => {
    if (limit === null) return;
    figures.forEach((f, i) => {
      const value = pick(i);
      const pass = value === null ? null : atLeast ? value >= limit - 1e-9 : value <= limit + 1e-9;
      checks.push({ rule, cylinderNo: f.cylinderNo, limit, value, pass });
    });
  };
  // The class counts the mean of the two squish sides (TRADE.md "Class rules").
  perCylinder("minSquishMm", rules.minSquishMm, (i) => figures[i].squishMeanMm, true);
  perCylinder("minChamberCc", rules.minChamberCc, (i) => figures[i].chamber.valueCc, true);
  perCylinder("minFlatPlateCc", rules.minFlatPlateCc, (i) => cylinders[i].flatPlateCc, true);
  if (rules.maxDisplacementCc !== null) {
    checks.push({
      rule: "maxDisplacementCc",
      cylinderNo: null,
      limit: rules.maxDisplacementCc,
      value: displacementCc,
      pass: displacementCc <= rules.maxDisplacementCc + 1e-9,
    });
  }
  const evaluated = checks.filter((c) => c.pass !== null);
  const compliant = evaluated.some((c) => c.pass === false) ? false : evaluated.length > 0 ? true : null;
  return { racingClassId: rules.id, className: rules.name, squishWireNote: rules.squishWireNote, compliant, checks };
}

/** Every computed figure of one reading set. Throws DomainInputError naming a bad field. */
export function computeSetFigures(engine: FigureEngine, cylinders: FigureCylinder[], opts: FigureOptions): SetFigures {
  const displacementCc = computeDisplacementCc(engine.boreMm, engine.strokeMm, engine.cylinders);
  const sorted = [...cylinders].sort((a, b) => a.cylinderNo - b.cylinderNo);
  const figures = sorted.map((c) => figuresForCylinder(engine, c, opts));
  const pick = (f: (c: CylinderFigures) => number | null): number[] => figures.flatMap((c) => (f(c) === null ? [] : [f(c) as number]));
  return {
    sweptCc: tidy(displacementCc / engine.cylinders),
    displacementCc: tidy(displacementCc),
    toleranceCc: opts.toleranceCc,
    referenceElevationM: opts.referenceElevationM,
    cylinders: figures,
    chamberSpread: spreadOf("chamberCc", pick((c) => c.chamber.valueCc)),
    ratioSpread: spreadOf("geometricRatio", pick((c) => c.geometricRatio)),
    squishSpread: spreadOf("squishMm", pick((c) => c.squishMeanMm)),
    crankingSpread: spreadOf("crankingKpa", sorted.flatMap((c) => (c.crankingKpa === null ? [] : [c.crankingKpa]))),
    compliance: opts.rules ? checkCompliance(opts.rules, displacementCc, sorted, figures) : null,
  };
}
