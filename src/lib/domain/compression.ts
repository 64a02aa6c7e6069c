import { DomainInputError } from "./errors";
import {
  requireFinite,
  requirePositive,
  requirePositiveInteger,
  requireRodFitsStroke,
} from "./input-guards";
import { computeExhaustTravelMm } from "./slider-crank";
import { computeSquishMeanMm } from "./squish";

// Volumes are cc, lengths mm: a bore area in mm² times a depth in mm is mm³, /1000 is cc.
const MM3_PER_CC = 1000;
export const MAX_CYLINDERS = 24;

export function computeBoreAreaMm2(boreMm: number): number {
  const bore = requirePositive("boreMm", boreMm);
  return (Math.PI / 4) * bore * bore;
}

/** Volume of a bore-sized disc 1 mm deep: what a head cut or gasket change moves per mm. */
export function computeCcPerMm(boreMm: number): number {
  return computeBoreAreaMm2(boreMm) / MM3_PER_CC;
}

/** Swept volume of one cylinder, π/4 · B² · S. */
export function computeSweptCc(boreMm: number, strokeMm: number): number {
  const stroke = requirePositive("strokeMm", strokeMm);
  return computeCcPerMm(boreMm) * stroke;
}

export function computeDisplacementCc(boreMm: number, strokeMm: number, cylinders: number): number {
  const count = requirePositiveInteger("cylinders", cylinders, MAX_CYLINDERS);
  return computeSweptCc(boreMm, strokeMm) * count;
}

/** (swept + clearance) / clearance, the clearance being everything above the piston at TDC. */
export function computeGeometricRatio(sweptCc: number, chamberCc: number): number {
  const swept = requirePositive("sweptCc", sweptCc);
  const chamber = requirePositive("chamberCc", chamberCc);
  return (swept + chamber) / chamber;
}

export interface TrappedFromTravelInput {
  boreMm: number;
  strokeMm: number;
  chamberCc: number;
  exhaustTravelMm: number;
}

export interface TrappedFromAngleInput {
  boreMm: number;
  strokeMm: number;
  rodMm: number;
  chamberCc: number;
  exhaustOpensDegAtdc: number;
}

export interface TrappedRatio {
  exhaustTravelMm: number;
  trappedSweptCc: number;
  trappedRatio: number;
}

function requireExhaustTravel(exhaustTravelMm: number, strokeMm: number): number {
  const travel = requireFinite("exhaustTravelMm", exhaustTravelMm);
  if (travel < 0 || travel > strokeMm) {
    throw new DomainInputError("exhaustTravelMm", "exhaustTravelMm must lie between 0 and the stroke");
  }
  return travel;
}

/** Compression starts when the piston closes the exhaust port, `h` below TDC. */
export function computeTrappedRatioFromTravel(input: TrappedFromTravelInput): TrappedRatio {
  const stroke = requirePositive("strokeMm", input.strokeMm);
  const travel = requireExhaustTravel(input.exhaustTravelMm, stroke);
  const chamber = requirePositive("chamberCc", input.chamberCc);
  const trappedSweptCc = computeCcPerMm(input.boreMm) * travel;
  return { exhaustTravelMm: travel, trappedSweptCc, trappedRatio: (trappedSweptCc + chamber) / chamber };
}

export function computeTrappedRatioFromAngle(input: TrappedFromAngleInput): TrappedRatio {
  const stroke = requirePositive("strokeMm", input.strokeMm);
  requireRodFitsStroke(input.rodMm, stroke);
  const travel = computeExhaustTravelMm(stroke, input.rodMm, input.exhaustOpensDegAtdc);
  return computeTrappedRatioFromTravel({
    boreMm: input.boreMm,
    strokeMm: stroke,
    chamberCc: input.chamberCc,
    exhaustTravelMm: travel,
  });
}

/**
 * Chamber offset = installed − flat plate. Usually negative on a two-stroke: the piston crown
 * and the squish gap hold less than the plate the head was measured on.
 */
export function computeChamberOffsetCc(installedCc: number, flatPlateCc: number): number {
  const installed = requirePositive("chamberCc", installedCc);
  const flatPlate = requirePositive("flatPlateCc", flatPlateCc);
  return installed - flatPlate;
}

function requireInstalledPositive(installedCc: number): number {
  if (!(installedCc > 0)) {
    throw new DomainInputError("chamberOffsetCc", "this head and offset leave no chamber volume");
  }
  return installedCc;
}

/** The installed volume another head will give on the same cylinder, piston and gasket. */
export function computeInstalledCcForHead(flatPlateCc: number, chamberOffsetCc: number): number {
  const flatPlate = requirePositive("flatPlateCc", flatPlateCc);
  const offset = requireFinite("chamberOffsetCc", chamberOffsetCc);
  return requireInstalledPositive(flatPlate + offset);
}

/**
 * The installed volume of a head after its face is cut by `headCutMm` (negative: a thicker
 * head gasket). The cut removes a bore-sized disc (common practice: exact only where the cut
 * face spans the bore), so the offset is unchanged.
 */
export function computeInstalledCcForCutHead(
  flatPlateCc: number,
  chamberOffsetCc: number,
  boreMm: number,
  headCutMm: number,
): number {
  const cut = requireFinite("headCutMm", headCutMm);
  const cutHeadPlateCc = requirePositive("flatPlateCc", flatPlateCc) - computeCcPerMm(boreMm) * cut;
  if (!(cutHeadPlateCc > 0)) {
    throw new DomainInputError("headCutMm", "this cut leaves no chamber volume");
  }
  return computeInstalledCcForHead(cutHeadPlateCc, chamberOffsetCc);
}

function requireTargetRatio(targetRatio: number): number {
  const ratio = requireFinite("targetRatio", targetRatio);
  if (ratio <= 1) throw new DomainInputError("targetRatio", "targetRatio must be greater than 1");
  return ratio;
}

/** The installed chamber volume that gives `targetRatio`: Vc = Vs / (rc − 1). */
export function computeChamberCcForRatio(sweptCc: number, targetRatio: number): number {
  const swept = requirePositive("sweptCc", sweptCc);
  return swept / (requireTargetRatio(targetRatio) - 1);
}

/** The flat-plate head volume that gives `targetRatio` with this engine's chamber offset. */
export function computeFlatPlateCcForRatio(
  sweptCc: number,
  targetRatio: number,
  chamberOffsetCc: number,
): number {
  const offset = requireFinite("chamberOffsetCc", chamberOffsetCc);
  const flatPlate = computeChamberCcForRatio(sweptCc, targetRatio) - offset;
  if (!(flatPlate > 0)) {
    throw new DomainInputError("targetRatio", "no head volume reaches this ratio with this offset");
  }
  return flatPlate;
}

/**
 * Material to take off the head face (or out of the base gasket) to go from one installed
 * volume to another; negative means add (thicker gasket).
 */
export function computeHeadCutMm(boreMm: number, fromChamberCc: number, toChamberCc: number): number {
  const from = requirePositive("chamberCc", fromChamberCc);
  const to = requirePositive("targetChamberCc", toChamberCc);
  return (from - to) / computeCcPerMm(boreMm);
}

export interface Spread {
  min: number;
  max: number;
  /** max − min, in the values' own unit. */
  spread: number;
  /** (max − min) / max × 100: "the lowest within x % of the highest", as cylinders are compared. */
  spreadPercent: number;
}

export function computeSpread(field: string, values: readonly number[]): Spread {
  if (values.length === 0) throw new DomainInputError(field, `${field} needs at least one value`);
  values.forEach((v) => requirePositive(field, v));
  const min = Math.min(...values);
  const max = Math.max(...values);
  return { min, max, spread: max - min, spreadPercent: ((max - min) / max) * 100 };
}

export interface CylinderMeasure {
  chamberCc: number;
  /** Squish read on both sides of the pin axis, mm. */
  squishSidesMm?: readonly [number, number];
}

export interface CylinderFigures {
  chamberCc: number;
  geometricRatio: number;
  squishMeanMm?: number;
}

export interface CylinderSummary {
  cylinders: CylinderFigures[];
  chamber: Spread;
  ratio: Spread;
  /** Over the cylinders whose squish was read; absent when none was. */
  squish?: Spread;
}

/** Per-cylinder ratios and the spread of chamber, ratio and mean squish across cylinders. */
export function summarizeCylinders(
  boreMm: number,
  strokeMm: number,
  measures: readonly CylinderMeasure[],
): CylinderSummary {
  const sweptCc = computeSweptCc(boreMm, strokeMm);
  if (measures.length === 0) throw new DomainInputError("cylinders", "cylinders needs at least one cylinder");
  const cylinders = measures.map((m): CylinderFigures => {
    const figures: CylinderFigures = {
      chamberCc: m.chamberCc,
      geometricRatio: computeGeometricRatio(sweptCc, m.chamberCc),
    };
    if (m.squishSidesMm) {
      figures.squishMeanMm = computeSquishMeanMm(m.squishSidesMm[0], m.squishSidesMm[1]);
    }
    return figures;
  });
  const squishMeans = cylinders.flatMap((c) => (c.squishMeanMm === undefined ? [] : [c.squishMeanMm]));
  const summary: CylinderSummary = {
    cylinders,
    chamber: computeSpread("chamberCc", cylinders.map((c) => c.chamberCc)),
    ratio: computeSpread("geometricRatio", cylinders.map((c) => c.geometricRatio)),
  };
  if (squishMeans.length > 0) summary.squish = computeSpread("squishMm", squishMeans);
  return summary;
}
