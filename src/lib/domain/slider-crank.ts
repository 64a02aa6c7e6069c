import { DomainInputError } from "./errors";
import {
  requireFinite,
  requireHalfTurnDeg,
  requireInRange,
  requirePositive,
  requireRodFitsStroke,
} from "./input-guards";

// Slider-crank kinematics. Pin distance from the crank centre at crank angle A after TDC:
//   x(A) = r·cos A + √(l² − r²·sin² A), r = S/2, l = rod length (centre to centre),
// and the piston's travel from TDC is s(A) = r + l − x(A).

const RAD_PER_DEG = Math.PI / 180;

function requireCrank(strokeMm: number, rodMm: number): { radiusMm: number; rodMm: number } {
  const stroke = requirePositive("strokeMm", strokeMm);
  const rod = requireRodFitsStroke(rodMm, stroke);
  return { radiusMm: stroke / 2, rodMm: rod };
}

// Written as r·(1 − cos A) + (l − √(l² − r² sin² A)) with both differences rearranged so that
// nothing cancels: s(0) is exactly 0 and s(180°) exactly the stroke.
function travelFromRadians(radiusMm: number, rodMm: number, angleRad: number): number {
  const halfSin = Math.sin(angleRad / 2);
  const sin = Math.sin(angleRad);
  const crankPart = 2 * radiusMm * halfSin * halfSin;
  const offAxis = radiusMm * radiusMm * sin * sin;
  const rodPart = offAxis / (rodMm + Math.sqrt(rodMm * rodMm - offAxis));
  return crankPart + rodPart;
}

/** Piston travel from TDC (mm) at a crank angle of 0–180° after TDC. */
export function computePistonTravelMm(strokeMm: number, rodMm: number, crankAngleDeg: number): number {
  const crank = requireCrank(strokeMm, rodMm);
  const angle = requireHalfTurnDeg("crankAngleDeg", crankAngleDeg);
  return travelFromRadians(crank.radiusMm, crank.rodMm, angle * RAD_PER_DEG);
}

/**
 * Piston travel from TDC over a whole turn, 0–360° after TDC (the way down and the way back
 * up), for plotting the piston curve.
 */
export function computePistonTravelOverTurnMm(
  strokeMm: number,
  rodMm: number,
  crankAngleDeg: number,
): number {
  const crank = requireCrank(strokeMm, rodMm);
  const angle = requireInRange("crankAngleDeg", crankAngleDeg, 0, 360);
  return travelFromRadians(crank.radiusMm, crank.rodMm, angle * RAD_PER_DEG);
}

/**
 * The crank angle after TDC (0–180°) at which the piston has travelled `travelMm` from TDC.
 * From the law of cosines in the crank–rod triangle, in its half-angle form
 *   tan²(A/2) = s·(2l − s) / ((S − s)·(S + 2l − s)),
 * which, unlike acos, keeps full precision near TDC and BDC.
 */
export function computeCrankAngleForTravelDeg(
  strokeMm: number,
  rodMm: number,
  travelMm: number,
): number {
  const crank = requireCrank(strokeMm, rodMm);
  const travel = requireInRange("travelMm", travelMm, 0, strokeMm);
  const l = crank.rodMm;
  const rise = Math.sqrt(travel * (2 * l - travel));
  const run = Math.sqrt((strokeMm - travel) * (strokeMm + 2 * l - travel));
  return (2 * Math.atan2(rise, run)) / RAD_PER_DEG;
}

/**
 * Exhaust port opening angle after TDC from the exhaust duration: the port is open
 * symmetrically about BDC, so it opens at 180° − D/2. Duration runs 0–360°.
 */
export function computeExhaustOpensDegAtdc(exhaustDurationDeg: number): number {
  const duration = requireInRange("exhaustDurationDeg", exhaustDurationDeg, 0, 360);
  return 180 - duration / 2;
}

/** Exhaust duration from the opening angle after TDC (0–180°): D = 360° − 2·A. */
export function computeExhaustDurationDeg(exhaustOpensDegAtdc: number): number {
  const opens = requireHalfTurnDeg("exhaustOpensDegAtdc", exhaustOpensDegAtdc);
  return 360 - 2 * opens;
}

/** Piston travel from TDC to the top edge of the exhaust port, from its opening angle. */
export function computeExhaustTravelMm(
  strokeMm: number,
  rodMm: number,
  exhaustOpensDegAtdc: number,
): number {
  const opens = requireHalfTurnDeg("exhaustOpensDegAtdc", exhaustOpensDegAtdc);
  return computePistonTravelMm(strokeMm, rodMm, opens);
}

/** The port's opening angle after TDC from the piston travel to its top edge. */
export function computeExhaustOpensFromTravelDeg(
  strokeMm: number,
  rodMm: number,
  exhaustTravelMm: number,
): number {
  const stroke = requirePositive("strokeMm", strokeMm);
  const travel = requireFinite("exhaustTravelMm", exhaustTravelMm);
  if (travel < 0 || travel > stroke) {
    throw new DomainInputError("exhaustTravelMm", "exhaustTravelMm must lie between 0 and the stroke");
  }
  return computeCrankAngleForTravelDeg(stroke, rodMm, travel);
}
