import { DomainInputError } from "./errors";
import { evaluateCylinderRules } from "./signal-rules/cylinder-rules";
import { evaluateDrift } from "./signal-rules/drift-rules";
import { higherSeverity } from "./signal-rules/format";
import { mergeThresholds } from "./signal-rules/thresholds";
import { evaluateUsage } from "./signal-rules/usage-rules";
import type {
  EngineSignalInput,
  ReconcileResult,
  ReadingSet,
  Severity,
  Signal,
  SignalThresholdOverrides,
} from "./signal-rules/types";
import { validateEngineSignalInput } from "./signal-rules/validate-signal-input";

// What raises a signal for one engine, and how today's conditions meet the signals already
// open. Pure: the job feeds it rows and acts on the answer (open, mail, auto-resolve).

export { DEFAULT_THRESHOLDS, DEFAULT_THRESHOLDS_PROVENANCE, mergeThresholds } from "./signal-rules/thresholds";
export { buildSignalKey } from "./signal-rules/format";
export type {
  ClassLimits,
  CylinderReading,
  DriftMetric,
  EngineSignalInput,
  PlannedEventUsage,
  ReadingSet,
  ReconcileResult,
  Severity,
  Signal,
  SignalKind,
  SignalThresholdOverrides,
  SignalThresholds,
  SpreadMetric,
  UsageCounter,
  UsageUnit,
} from "./signal-rules/types";

/**
 * Every condition that holds for the engine now, one signal per condition (unique keys):
 *  - due-soon / overdue for each usage counter (planning fraction, limit, next planned event);
 *  - drift per cylinder and metric against the baseline, by fixed tolerance and by EWMA
 *    (cranking converted to the baseline's elevation first);
 *  - spread between cylinders, squish side to side, unconfirmed chamber readings, class minimums.
 * `thresholds` are edits laid over DEFAULT_THRESHOLDS (organisation, then engine).
 * Throws DomainInputError naming the field on bad input.
 */
export function evaluateEngineSignals(input: EngineSignalInput, thresholds?: SignalThresholdOverrides | null): Signal[] {
  validateEngineSignalInput(input);
  const t = mergeThresholds(thresholds);
  const planningFraction = input.planningFraction ?? t.usage.planningFraction;
  const readings = input.readings ?? [];
  const sets: ReadingSet[] = input.baseline ? [input.baseline, ...readings] : readings;

  const signals = [
    ...evaluateUsage(input.engineId, input.engineName, input.usage ?? [], planningFraction, input.nextEvent),
    ...(input.baseline
      ? evaluateDrift(input.engineId, input.engineName, input.cylinderCount, input.baseline, readings, t)
      : []),
    ...evaluateCylinderRules(input.engineId, input.engineName, input.cylinderCount, sets, t, input.classLimits),
  ];
  for (const s of signals) {
    for (const [name, value] of Object.entries(s.numbers)) {
      // Only readings far outside any engine's range (a baseline of 1e-300 cc) can get here.
      if (!Number.isFinite(value)) {
        throw new DomainInputError("readings", `readings give ${s.key} a non-finite ${name}: check the values`);
      }
    }
  }
  return signals;
}

function keepWorst(signals: Signal[]): Map<string, Signal> {
  const byKey = new Map<string, Signal>();
  for (const s of signals) {
    const seen = byKey.get(s.key);
    if (!seen || (seen.severity === "watch" && s.severity === "act")) byKey.set(s.key, s);
  }
  return byKey;
}

/**
 * Meets today's conditions with the signals already open (same scope: pass the open signals
 * of the engines that `current` was evaluated for). A persisting condition raises nothing new;
 * one that has cleared is auto-resolved, so if it returns later it opens again. A persisting
 * condition that rose from watch to act is listed in `escalated` when the open signal's
 * severity is given.
 */
export function reconcileSignals(
  open: ReadonlyArray<{ key: string; severity?: Severity }>,
  current: Signal[],
): ReconcileResult {
  if (!Array.isArray(open)) throw new DomainInputError("open", "open must be a list");
  if (!Array.isArray(current)) throw new DomainInputError("current", "current must be a list");
  const openSeverity = new Map<string, Severity | null>();
  open.forEach((o, i) => {
    if (!o || typeof o.key !== "string" || o.key === "") {
      throw new DomainInputError(`open[${i}].key`, `open[${i}].key must be a non-empty string`);
    }
    openSeverity.set(o.key, higherSeverity(openSeverity.get(o.key) ?? null, o.severity ?? null));
  });
  current.forEach((s, i) => {
    if (!s || typeof s.key !== "string" || s.key === "") {
      throw new DomainInputError(`current[${i}].key`, `current[${i}].key must be a non-empty string`);
    }
  });
  const now = keepWorst(current);

  const toOpen: Signal[] = [];
  const unchanged: string[] = [];
  const escalated: Signal[] = [];
  for (const [key, signal] of now) {
    if (!openSeverity.has(key)) {
      toOpen.push(signal);
      continue;
    }
    unchanged.push(key);
    if (openSeverity.get(key) === "watch" && signal.severity === "act") escalated.push(signal);
  }
  const toAutoResolve = [...openSeverity.keys()].filter((key) => !now.has(key));
  return { toOpen, toAutoResolve, unchanged, escalated };
}
