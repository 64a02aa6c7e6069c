import { DomainInputError } from "../../lib/domain/errors.ts";
import type { CompressionInput } from "../../lib/domain/calc-api.ts";
import {
  applyMachiningSteps,
  createEngineGeometry,
  describeGeometry,
  solveBowlToKeepRatio,
  type EngineGeometry,
  type GeometryFigures,
  type MachiningStep,
} from "../../lib/domain/machining.ts";
import { convertToSi } from "../../lib/domain/units.ts";
import { addDomainErrors, readField, type FieldErrors } from "./field-reading.ts";
import { getStepQuantity, parseTypedNumber, type WorkbenchState } from "./workbench-state.ts";

// The planned chain of machining and gasket steps, applied one by one to the engine as
// measured; the first step that cannot be made stops the chain and says why.

export interface PlanOutcome {
  before: GeometryFigures;
  after: GeometryFigures;
  /** Running totals after the whole plan. */
  totals: Pick<EngineGeometry, "headCutTotalMm" | "baseGasketChangeMm" | "bowlAddedCc">;
  /** Per step: the bowl volume a "keep the ratio" step re-opens, cc. */
  keepBowlCc: Record<number, number>;
  /** Per step id: why it cannot be applied. Steps after a refused one are not applied. */
  stepErrors: Record<number, string>;
  appliedSteps: number;
}

function stepToMachining(kind: "cut" | "gasket" | "bowl", si: number): MachiningStep {
  if (kind === "cut") return { kind: "cut-head", mm: si };
  if (kind === "gasket") return { kind: "base-gasket", mm: si };
  return { kind: "open-bowl", cc: si };
}

function createGeometry(state: WorkbenchState, input: CompressionInput, squishMm: number | undefined, errors: FieldErrors): EngineGeometry {
  try {
    return createEngineGeometry({ ...input, squishMm });
  } catch (error) {
    // A port edge exactly at TDC gives a trapped ratio of 1 but no port to move: plan without it.
    if (!(error instanceof DomainInputError)) throw error;
    addDomainErrors(state, { [error.field]: error.message }, errors);
    const { exhaustOpensDegAtdc: _opens, exhaustTravelMm: _travel, ...rest } = input;
    return createEngineGeometry({ ...rest, squishMm });
  }
}

export function planChange(state: WorkbenchState, input: CompressionInput, errors: FieldErrors): PlanOutcome {
  let squishMm = readField(state, "squish", errors);
  if (squishMm !== undefined && !(squishMm > 0)) {
    errors.squish = "Squish clearance must be greater than zero.";
    squishMm = undefined;
  }
  const geometry = createGeometry(state, input, squishMm, errors);
  const outcome: PlanOutcome = {
    before: describeGeometry(geometry),
    after: describeGeometry(geometry),
    totals: { headCutTotalMm: 0, baseGasketChangeMm: 0, bowlAddedCc: 0 },
    keepBowlCc: {},
    stepErrors: {},
    appliedSteps: 0,
  };
  let current = geometry;
  for (const step of state.plan) {
    const typed = parseTypedNumber(step.value);
    if (typed === undefined) continue;
    if (!Number.isFinite(typed)) {
      outcome.stepErrors[step.id] = "Enter a number.";
      break;
    }
    const si = convertToSi(getStepQuantity(step.kind), typed, state.units);
    try {
      if (step.kind === "keep") {
        const kept = solveBowlToKeepRatio(current, si);
        outcome.keepBowlCc[step.id] = kept.bowlCc;
        current = kept.geometry;
      } else {
        current = applyMachiningSteps(current, [stepToMachining(step.kind, si)]);
      }
      outcome.appliedSteps += 1;
    } catch (error) {
      if (!(error instanceof DomainInputError)) throw error;
      const text = error.message.replace(/^(cutMm|deltaMm|addedCc) /, "");
      outcome.stepErrors[step.id] = text.charAt(0).toUpperCase() + text.slice(1);
      break;
    }
  }
  outcome.after = describeGeometry(current);
  outcome.totals = {
    headCutTotalMm: current.headCutTotalMm,
    baseGasketChangeMm: current.baseGasketChangeMm,
    bowlAddedCc: current.bowlAddedCc,
  };
  return outcome;
}
