import { DomainInputError } from "./errors";
import { requirePositive } from "./input-guards";

// Squish is read with solder on both sides of the pin axis (across it the piston rocks and
// the reading misleads); the two sides are averaged, and their difference is watched on its own.

export function computeSquishMeanMm(sideAMm: number, sideBMm: number): number {
  const a = requirePositive("squishSideAMm", sideAMm);
  const b = requirePositive("squishSideBMm", sideBMm);
  return (a + b) / 2;
}

/** Absolute difference between the two sides, mm. */
export function computeSquishSideDifferenceMm(sideAMm: number, sideBMm: number): number {
  const a = requirePositive("squishSideAMm", sideAMm);
  const b = requirePositive("squishSideBMm", sideBMm);
  return Math.abs(a - b);
}

export interface SquishSummary {
  meanMm: number;
  sideDifferenceMm: number;
}

export function summarizeSquish(sideAMm: number, sideBMm: number): SquishSummary {
  return {
    meanMm: computeSquishMeanMm(sideAMm, sideBMm),
    sideDifferenceMm: computeSquishSideDifferenceMm(sideAMm, sideBMm),
  };
}

/**
 * Share of the bore covered by a flat squish band around a central bowl: 1 − (d / B)².
 * A bowl as wide as the bore leaves no band (0).
 */
export function computeSquishAreaRatio(bowlDiameterMm: number, boreMm: number): number {
  const bowl = requirePositive("bowlDiameterMm", bowlDiameterMm);
  const bore = requirePositive("boreMm", boreMm);
  if (bowl > bore) {
    throw new DomainInputError("bowlDiameterMm", "bowlDiameterMm must not exceed the bore");
  }
  const share = bowl / bore;
  return 1 - share * share;
}

/** The bowl diameter that leaves a given squish area ratio (0 ≤ ratio < 1). */
export function computeBowlDiameterForSquishAreaMm(squishAreaRatio: number, boreMm: number): number {
  const bore = requirePositive("boreMm", boreMm);
  if (!Number.isFinite(squishAreaRatio) || squishAreaRatio < 0 || squishAreaRatio >= 1) {
    throw new DomainInputError("squishAreaRatio", "squishAreaRatio must be at least 0 and below 1");
  }
  return bore * Math.sqrt(1 - squishAreaRatio);
}
