import { DomainInputError } from "./errors";
import { computeCcPerMm, computeGeometricRatio, computeSweptCc } from "./compression";
import { requireFinite, requirePositive, requireRodFitsStroke } from "./input-guards";
import {
  computeExhaustDurationDeg,
  computeExhaustOpensFromTravelDeg,
  computeExhaustTravelMm,
} from "./slider-crank";

// Machining and gasket changes as steps the Workbench chains: each takes an engine's geometry
// and returns a new one, never mutating its input. The volume a face cut or gasket change
// moves is the bore area times the depth (common practice: exact only where the cut face spans
// the bore).

export interface EngineGeometry {
  readonly boreMm: number;
  readonly strokeMm: number;
  /** Installed chamber volume at TDC, cc. */
  readonly chamberCc: number;
  readonly rodMm?: number;
  /** Head alone on a flat plate, cc; follows face cuts and bowl work, not gaskets. */
  readonly flatPlateCc?: number;
  /** Mean squish clearance, mm. */
  readonly squishMm?: number;
  /** Piston travel from TDC to the top edge of the exhaust port, mm. */
  readonly exhaustTravelMm?: number;
  /** Running totals of the plan, so a head's finite cut allowance stays visible. */
  readonly headCutTotalMm: number;
  readonly baseGasketChangeMm: number;
  readonly bowlAddedCc: number;
}

export interface EngineGeometryInput {
  boreMm: number;
  strokeMm: number;
  chamberCc: number;
  rodMm?: number;
  flatPlateCc?: number;
  squishMm?: number;
  exhaustTravelMm?: number;
  /** Used (with rodMm) when exhaustTravelMm is not given. */
  exhaustOpensDegAtdc?: number;
}

function requireTravelWithinStroke(field: string, travelMm: number, strokeMm: number): number {
  if (!(travelMm > 0) || travelMm > strokeMm) {
    throw new DomainInputError(field, "the exhaust port edge must lie between TDC and BDC");
  }
  return travelMm;
}

export function createEngineGeometry(input: EngineGeometryInput): EngineGeometry {
  const boreMm = requirePositive("boreMm", input.boreMm);
  const strokeMm = requirePositive("strokeMm", input.strokeMm);
  const chamberCc = requirePositive("chamberCc", input.chamberCc);
  const geometry: {
    -readonly [K in keyof EngineGeometry]: EngineGeometry[K];
  } = { boreMm, strokeMm, chamberCc, headCutTotalMm: 0, baseGasketChangeMm: 0, bowlAddedCc: 0 };
  if (input.rodMm !== undefined) geometry.rodMm = requireRodFitsStroke(input.rodMm, strokeMm);
  if (input.flatPlateCc !== undefined) geometry.flatPlateCc = requirePositive("flatPlateCc", input.flatPlateCc);
  if (input.squishMm !== undefined) geometry.squishMm = requirePositive("squishMm", input.squishMm);
  if (input.exhaustTravelMm !== undefined) {
    const travel = requireFinite("exhaustTravelMm", input.exhaustTravelMm);
    geometry.exhaustTravelMm = requireTravelWithinStroke("exhaustTravelMm", travel, strokeMm);
  } else if (input.exhaustOpensDegAtdc !== undefined) {
    if (input.rodMm === undefined) {
      throw new DomainInputError("rodMm", "rodMm is needed to place the port from its opening angle");
    }
    const travel = computeExhaustTravelMm(strokeMm, input.rodMm, input.exhaustOpensDegAtdc);
    geometry.exhaustTravelMm = requireTravelWithinStroke("exhaustOpensDegAtdc", travel, strokeMm);
  }
  return Object.freeze(geometry);
}

function requireChamberLeft(field: string, chamberCc: number): number {
  if (!(chamberCc > 0)) throw new DomainInputError(field, "this change leaves no chamber volume");
  return chamberCc;
}

function requireSquishLeft(field: string, squishMm: number | undefined): number | undefined {
  if (squishMm !== undefined && !(squishMm > 0)) {
    throw new DomainInputError(field, "this change closes the squish gap: the piston would hit the head");
  }
  return squishMm;
}

/**
 * Cut the head face by `cutMm` (negative: a thicker head gasket). Volume −A·t, squish −t;
 * the ports are in the cylinder, so port timing is unchanged.
 */
export function cutHeadFace(geometry: EngineGeometry, cutMm: number): EngineGeometry {
  const cut = requireFinite("cutMm", cutMm);
  const movedCc = computeCcPerMm(geometry.boreMm) * cut;
  const flatPlateCc = geometry.flatPlateCc === undefined ? undefined : geometry.flatPlateCc - movedCc;
  if (flatPlateCc !== undefined) requireChamberLeft("cutMm", flatPlateCc);
  return Object.freeze({
    ...geometry,
    chamberCc: requireChamberLeft("cutMm", geometry.chamberCc - movedCc),
    flatPlateCc,
    squishMm: requireSquishLeft("cutMm", geometry.squishMm === undefined ? undefined : geometry.squishMm - cut),
    headCutTotalMm: geometry.headCutTotalMm + cut,
  });
}

/**
 * Change the base gasket by `deltaMm` (positive: thicker). The cylinder rises with the gasket,
 * so volume +A·t and squish +t, and the exhaust port edge rises too: the piston uncovers it
 * t sooner, the port opens earlier and the trapped ratio falls. The head is untouched, so its
 * flat-plate volume is unchanged (the chamber offset changes).
 */
export function changeBaseGasket(geometry: EngineGeometry, deltaMm: number): EngineGeometry {
  const delta = requireFinite("deltaMm", deltaMm);
  const movedCc = computeCcPerMm(geometry.boreMm) * delta;
  const exhaustTravelMm =
    geometry.exhaustTravelMm === undefined
      ? undefined
      : requireTravelWithinStroke("deltaMm", geometry.exhaustTravelMm - delta, geometry.strokeMm);
  return Object.freeze({
    ...geometry,
    chamberCc: requireChamberLeft("deltaMm", geometry.chamberCc + movedCc),
    squishMm: requireSquishLeft("deltaMm", geometry.squishMm === undefined ? undefined : geometry.squishMm + delta),
    exhaustTravelMm,
    baseGasketChangeMm: geometry.baseGasketChangeMm + delta,
  });
}

/** Open the bowl by `addedCc` (negative: a filled bowl or smaller insert); squish unchanged. */
export function openBowl(geometry: EngineGeometry, addedCc: number): EngineGeometry {
  const added = requireFinite("addedCc", addedCc);
  const flatPlateCc = geometry.flatPlateCc === undefined ? undefined : geometry.flatPlateCc + added;
  if (flatPlateCc !== undefined) requireChamberLeft("addedCc", flatPlateCc);
  return Object.freeze({
    ...geometry,
    chamberCc: requireChamberLeft("addedCc", geometry.chamberCc + added),
    flatPlateCc,
    bowlAddedCc: geometry.bowlAddedCc + added,
  });
}

export interface KeepRatioPlan {
  /** Volume to re-open in the bowl after the cut, cc. */
  bowlCc: number;
  geometry: EngineGeometry;
}

/**
 * Cut the face by `cutMm` (to tighten squish) and re-open the bowl so the ratio stays: the
 * ratio depends only on the installed volume, so the bowl must take back exactly A·t. Neither
 * step moves the ports, so the trapped ratio stays too.
 */
export function solveBowlToKeepRatio(geometry: EngineGeometry, cutMm: number): KeepRatioPlan {
  const cut = cutHeadFace(geometry, cutMm);
  const bowlCc = geometry.chamberCc - cut.chamberCc;
  return { bowlCc, geometry: openBowl(cut, bowlCc) };
}

export type MachiningStep =
  | { kind: "cut-head"; mm: number }
  | { kind: "base-gasket"; mm: number }
  | { kind: "open-bowl"; cc: number };

export function applyMachiningSteps(geometry: EngineGeometry, steps: readonly MachiningStep[]): EngineGeometry {
  return steps.reduce((g, step) => {
    switch (step.kind) {
      case "cut-head":
        return cutHeadFace(g, step.mm);
      case "base-gasket":
        return changeBaseGasket(g, step.mm);
      case "open-bowl":
        return openBowl(g, step.cc);
      default:
        throw new DomainInputError("steps", "unknown machining step");
    }
  }, geometry);
}

export interface GeometryFigures {
  sweptCc: number;
  chamberCc: number;
  geometricRatio: number;
  flatPlateCc?: number;
  chamberOffsetCc?: number;
  squishMm?: number;
  exhaustTravelMm?: number;
  trappedSweptCc?: number;
  trappedRatio?: number;
  /** Need the rod length as well as the port position. */
  exhaustOpensDegAtdc?: number;
  exhaustDurationDeg?: number;
}

/** The figures the Workbench shows for one state, before or after a plan. */
export function describeGeometry(geometry: EngineGeometry): GeometryFigures {
  const sweptCc = computeSweptCc(geometry.boreMm, geometry.strokeMm);
  const figures: GeometryFigures = {
    sweptCc,
    chamberCc: geometry.chamberCc,
    geometricRatio: computeGeometricRatio(sweptCc, geometry.chamberCc),
  };
  if (geometry.flatPlateCc !== undefined) {
    figures.flatPlateCc = geometry.flatPlateCc;
    figures.chamberOffsetCc = geometry.chamberCc - geometry.flatPlateCc;
  }
  if (geometry.squishMm !== undefined) figures.squishMm = geometry.squishMm;
  if (geometry.exhaustTravelMm !== undefined) {
    const trappedSweptCc = computeCcPerMm(geometry.boreMm) * geometry.exhaustTravelMm;
    figures.exhaustTravelMm = geometry.exhaustTravelMm;
    figures.trappedSweptCc = trappedSweptCc;
    figures.trappedRatio = (trappedSweptCc + geometry.chamberCc) / geometry.chamberCc;
    if (geometry.rodMm !== undefined) {
      const opens = computeExhaustOpensFromTravelDeg(geometry.strokeMm, geometry.rodMm, geometry.exhaustTravelMm);
      figures.exhaustOpensDegAtdc = opens;
      figures.exhaustDurationDeg = computeExhaustDurationDeg(opens);
    }
  }
  return figures;
}
