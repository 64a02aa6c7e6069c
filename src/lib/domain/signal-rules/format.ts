import { KPA_PER_PSI } from "../units";
import type { Severity, Signal, SignalKind } from "./types";

// Readings are decimals typed by people: 1.50 − 1.45 is 0.05000000000000004 in doubles and
// 23.5 − 23.2 is 0.3000000000000007. Thresholds are compared with this much slack so a value
// typed exactly on a threshold behaves as written ("at 0.05" reaches it, "above 0.3" does not).
const EDGE_EPSILON = 1e-9;

/** value ≥ threshold, for thresholds written "at" or "±". */
export function reaches(value: number, threshold: number): boolean {
  return value >= threshold - EDGE_EPSILON;
}

/** value > threshold, for thresholds written "above" or ">". */
export function exceeds(value: number, threshold: number): boolean {
  return value > threshold + EDGE_EPSILON;
}

export function higherSeverity(a: Severity | null, b: Severity | null): Severity | null {
  if (a === "act" || b === "act") return "act";
  return a ?? b;
}

export function buildSignalKey(engineId: string, kind: SignalKind, cylinder?: number, metric?: string): string {
  return [engineId, kind, cylinder === undefined ? "engine" : String(cylinder), metric ?? "all"]
    .map((part) => encodeURIComponent(part))
    .join("|");
}

export function buildSignal(fields: Omit<Signal, "key">): Signal {
  return { key: buildSignalKey(fields.engineId, fields.kind, fields.cylinder, fields.metric), ...fields };
}

// Trailing zeros dropped: "1.5 %", "3 %", "0.05 mm".
function trim(value: number, decimals: number): string {
  const fixed = value.toFixed(decimals);
  const trimmed = fixed.includes(".") ? fixed.replace(/0+$/, "").replace(/\.$/, "") : fixed;
  return trimmed === "-0" ? "0" : trimmed;
}

export function formatCc(cc: number, decimals = 1): string {
  return `${cc.toFixed(decimals)} cc`;
}

export function formatMm(mm: number, decimals = 2): string {
  return `${mm.toFixed(decimals)} mm`;
}

export function formatPct(pct: number, decimals = 1): string {
  return `${trim(pct, decimals)} %`;
}

export function formatSignedPct(pct: number, decimals = 1): string {
  return `${pct >= 0 ? "+" : "−"}${formatPct(Math.abs(pct), decimals)}`;
}

export function formatLimitPct(pct: number): string {
  return `${trim(pct, 2)} %`;
}

export function formatLimitMm(mm: number): string {
  return `${trim(mm, 3)} mm`;
}

/** Cranking pressures go to crews who think in psi: both units. */
export function formatKpaWithPsi(kpa: number): string {
  return `${kpa.toFixed(0)} kPa (${(kpa / KPA_PER_PSI).toFixed(0)} psi)`;
}

export function formatUsage(amount: number, unit: "h" | "L" | "km" | "laps"): string {
  return `${trim(amount, 1)} ${unit}`;
}

export function formatElevation(elevationM: number): string {
  return `${elevationM.toFixed(0)} m`;
}
