import { DomainInputError } from "./errors";
import { computeCcPerMm, computeGeometricRatio, computeSweptCc } from "./compression";
import { requireFinite, requireNonNegative, requirePositive } from "./input-guards";

// A four-stroke's clearance volume is built from its parts, because its chamber is usually
// measured in the head alone: chamber + gasket + deck + piston.

export interface FourStrokeParts {
  boreMm: number;
  strokeMm: number;
  /** Head chamber volume, cc. */
  chamberCc: number;
  /** Bore of the head gasket (often larger than the cylinder bore), mm. */
  gasketBoreMm: number;
  /** Compressed thickness of the head gasket, mm. */
  gasketThicknessMm: number;
  /** Piston crown below the deck at TDC, mm; negative when it stands out of the bore. */
  deckClearanceMm: number;
  /** Dish or valve reliefs positive, dome negative, cc. */
  pistonVolumeCc: number;
}

export interface FourStrokeClearance {
  sweptCc: number;
  gasketCc: number;
  deckCc: number;
  clearanceCc: number;
  geometricRatio: number;
}

type NonChamberParts = Omit<FourStrokeParts, "chamberCc">;

function sumNonChamberParts(parts: NonChamberParts): { sweptCc: number; gasketCc: number; deckCc: number; pistonCc: number } {
  const sweptCc = computeSweptCc(parts.boreMm, parts.strokeMm);
  const gasketCc =
    computeCcPerMm(requirePositive("gasketBoreMm", parts.gasketBoreMm)) *
    requireNonNegative("gasketThicknessMm", parts.gasketThicknessMm);
  const deckCc = computeCcPerMm(parts.boreMm) * requireFinite("deckClearanceMm", parts.deckClearanceMm);
  const pistonCc = requireFinite("pistonVolumeCc", parts.pistonVolumeCc);
  return { sweptCc, gasketCc, deckCc, pistonCc };
}

export function computeFourStrokeClearance(parts: FourStrokeParts): FourStrokeClearance {
  const { sweptCc, gasketCc, deckCc, pistonCc } = sumNonChamberParts(parts);
  const chamberCc = requirePositive("chamberCc", parts.chamberCc);
  const clearanceCc = chamberCc + gasketCc + deckCc + pistonCc;
  if (!(clearanceCc > 0)) {
    throw new DomainInputError("pistonVolumeCc", "these parts leave no clearance volume: the piston would hit the head");
  }
  return { sweptCc, gasketCc, deckCc, clearanceCc, geometricRatio: computeGeometricRatio(sweptCc, clearanceCc) };
}

/** The head chamber volume that reaches `targetRatio` with the other parts unchanged. */
export function computeFourStrokeChamberForRatioCc(parts: NonChamberParts, targetRatio: number): number {
  const ratio = requireFinite("targetRatio", targetRatio);
  if (ratio <= 1) throw new DomainInputError("targetRatio", "targetRatio must be greater than 1");
  const { sweptCc, gasketCc, deckCc, pistonCc } = sumNonChamberParts(parts);
  const chamberCc = sweptCc / (ratio - 1) - (gasketCc + deckCc + pistonCc);
  if (!(chamberCc > 0)) {
    throw new DomainInputError("targetRatio", "no head chamber reaches this ratio with these parts");
  }
  return chamberCc;
}
