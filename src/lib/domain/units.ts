import { DomainInputError } from "./errors";
import { requireFinite } from "./input-guards";

// Exact definitions: the international yard and pound (1959), 16 CFR 500.19, NIST SP 811
// appendix B. Everything on the wire and in the domain is SI-style (mm, cc, kPa, m, °C);
// the user's units exist only at input and display.

export const MM_PER_INCH = 25.4;
export const MM_PER_THOU = 0.0254;
export const M_PER_FOOT = 0.3048;
export const CC_PER_CUBIC_INCH = 16.387064;
export const KG_PER_POUND = 0.45359237;
export const STANDARD_GRAVITY_M_S2 = 9.80665;
/** pound-force = pound × standard gravity = 4.4482216152605 N (exact). */
export const N_PER_POUND_FORCE = 4.4482216152605;
/** psi = lbf / in² = 4.4482216152605 N / 0.00064516 m² = 6894.757293168361… Pa. */
export const PA_PER_PSI = 6894.757293168361;
export const KPA_PER_PSI = PA_PER_PSI / 1000;
export const KPA_PER_BAR = 100;

export function inchesToMm(inches: number): number {
  return inches * MM_PER_INCH;
}
export function mmToInches(mm: number): number {
  return mm / MM_PER_INCH;
}
export function thouToMm(thou: number): number {
  return thou * MM_PER_THOU;
}
export function mmToThou(mm: number): number {
  return mm / MM_PER_THOU;
}
export function cubicInchesToCc(cubicInches: number): number {
  return cubicInches * CC_PER_CUBIC_INCH;
}
export function ccToCubicInches(cc: number): number {
  return cc / CC_PER_CUBIC_INCH;
}
export function psiToKpa(psi: number): number {
  return psi * KPA_PER_PSI;
}
export function kpaToPsi(kpa: number): number {
  return kpa / KPA_PER_PSI;
}
export function barToKpa(bar: number): number {
  return bar * KPA_PER_BAR;
}
export function kpaToBar(kpa: number): number {
  return kpa / KPA_PER_BAR;
}
export function feetToMetres(feet: number): number {
  return feet * M_PER_FOOT;
}
export function metresToFeet(metres: number): number {
  return metres / M_PER_FOOT;
}
export function fahrenheitToCelsius(fahrenheit: number): number {
  return ((fahrenheit - 32) * 5) / 9;
}
export function celsiusToFahrenheit(celsius: number): number {
  return (celsius * 9) / 5 + 32;
}

export type LengthUnit = "mm" | "in";
export type VolumeUnit = "cc" | "in3";
export type PressureUnit = "kPa" | "bar" | "psi";
export type ElevationUnit = "m" | "ft";
export type TemperatureUnit = "C" | "F";

/** The units one user reads and types in; each quantity can be chosen on its own. */
export interface UnitChoice {
  length: LengthUnit;
  volume: VolumeUnit;
  pressure: PressureUnit;
  elevation: ElevationUnit;
  temperature: TemperatureUnit;
}

export const METRIC_UNITS: UnitChoice = Object.freeze({
  length: "mm",
  volume: "cc",
  pressure: "kPa",
  elevation: "m",
  temperature: "C",
});

export const IMPERIAL_UNITS: UnitChoice = Object.freeze({
  length: "in",
  volume: "in3",
  pressure: "psi",
  elevation: "ft",
  temperature: "F",
});

export type UnitSystem = "metric" | "imperial" | UnitChoice;

/** `squish` is a length shown finer than bore or stroke; `angle` is crank degrees. */
export type QuantityKind =
  | "length"
  | "squish"
  | "volume"
  | "ratio"
  | "pressure"
  | "elevation"
  | "temperature"
  | "angle"
  | "percent";

export function resolveUnitChoice(system: UnitSystem): UnitChoice {
  if (system === "metric") return METRIC_UNITS;
  if (system === "imperial") return IMPERIAL_UNITS;
  return system;
}

/** Converts a value typed in the user's unit to the domain's unit (mm, cc, kPa, m, °C). */
export function convertToSi(kind: QuantityKind, value: number, system: UnitSystem): number {
  const v = requireFinite("value", value);
  const units = resolveUnitChoice(system);
  switch (kind) {
    case "length":
    case "squish":
      return units.length === "in" ? inchesToMm(v) : v;
    case "volume":
      return units.volume === "in3" ? cubicInchesToCc(v) : v;
    case "pressure":
      if (units.pressure === "psi") return psiToKpa(v);
      return units.pressure === "bar" ? barToKpa(v) : v;
    case "elevation":
      return units.elevation === "ft" ? feetToMetres(v) : v;
    case "temperature":
      return units.temperature === "F" ? fahrenheitToCelsius(v) : v;
    default:
      return v;
  }
}

/** Converts a domain value (mm, cc, kPa, m, °C) to the user's unit. */
export function convertFromSi(kind: QuantityKind, siValue: number, system: UnitSystem): number {
  const v = requireFinite("value", siValue);
  const units = resolveUnitChoice(system);
  switch (kind) {
    case "length":
    case "squish":
      return units.length === "in" ? mmToInches(v) : v;
    case "volume":
      return units.volume === "in3" ? ccToCubicInches(v) : v;
    case "pressure":
      if (units.pressure === "psi") return kpaToPsi(v);
      return units.pressure === "bar" ? kpaToBar(v) : v;
    case "elevation":
      return units.elevation === "ft" ? metresToFeet(v) : v;
    case "temperature":
      return units.temperature === "F" ? celsiusToFahrenheit(v) : v;
    default:
      return v;
  }
}

interface DisplayRule {
  label: string;
  decimals: number;
}

// Precision follows what the shop can measure: a burette reads tenths of a cc, solder squish
// hundredths of a mm (thousandths of an inch), a cranking gauge whole psi at best.
function pickDisplayRule(kind: QuantityKind, units: UnitChoice): DisplayRule {
  switch (kind) {
    case "squish":
      return units.length === "in" ? { label: "in", decimals: 3 } : { label: "mm", decimals: 2 };
    case "length":
      return units.length === "in" ? { label: "in", decimals: 3 } : { label: "mm", decimals: 2 };
    case "volume":
      return units.volume === "in3" ? { label: "in³", decimals: 3 } : { label: "cc", decimals: 1 };
    case "ratio":
      return { label: ":1", decimals: 2 };
    case "pressure":
      if (units.pressure === "psi") return { label: "psi", decimals: 1 };
      return units.pressure === "bar" ? { label: "bar", decimals: 2 } : { label: "kPa", decimals: 1 };
    case "elevation":
      return units.elevation === "ft" ? { label: "ft", decimals: 0 } : { label: "m", decimals: 0 };
    case "temperature":
      return units.temperature === "F" ? { label: "°F", decimals: 1 } : { label: "°C", decimals: 1 };
    case "angle":
      return { label: "°", decimals: 1 };
    case "percent":
      return { label: "%", decimals: 1 };
    default:
      throw new DomainInputError("kind", `unknown quantity kind ${String(kind)}`);
  }
}

export function getUnitLabel(kind: QuantityKind, system: UnitSystem): string {
  return pickDisplayRule(kind, resolveUnitChoice(system)).label;
}

export function getDisplayDecimals(kind: QuantityKind, system: UnitSystem): number {
  return pickDisplayRule(kind, resolveUnitChoice(system)).decimals;
}

/** Rounds to the display precision without ever printing "-0.00". */
export function formatNumber(value: number, decimals: number): string {
  const text = requireFinite("value", value).toFixed(decimals);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/**
 * Formats a domain value (mm, cc, kPa, m, °C, ratio, degrees, percent) in the user's units
 * with its unit: "1.20 mm", "0.047 in", "23.6 cc", "13.73:1", "97.0 kPa", "2408 m".
 */
export function formatQuantity(kind: QuantityKind, value: number, system: UnitSystem): string {
  const units = resolveUnitChoice(system);
  const rule = pickDisplayRule(kind, units);
  const text = formatNumber(convertFromSi(kind, value, units), rule.decimals);
  if (kind === "ratio") return `${text}:1`;
  if (kind === "angle" || kind === "percent") return `${text}${rule.label}`;
  return `${text} ${rule.label}`;
}
