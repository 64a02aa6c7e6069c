// The rebuild planner's public surface: plan a season, check any plan, bound the rebuilds,
// and generate invented fleets for tests and the bench.

export { planRebuilds } from "./plan-rebuilds";
export { checkPlan, type CheckablePlan, type Violation, type ViolationRule } from "./check-plan";
export { computeRebuildLowerBound, type RebuildLowerBound } from "./lower-bound";
export { generateFleet, createSeededRandom, type FleetOptions } from "./generate-fleet";
export * from "./types";
