import { convertToSi, type QuantityKind, type UnitChoice } from "../../lib/domain/units.ts";
import type { FigureCylinder } from "../../lib/motors/reading-figures.ts";
import { convertTypedValue, formatForUnits, parseTypedNumber } from "../workbench/workbench-state.ts";

// The new-reading-set form as plain data: what was typed (text, in the person's units), how it
// converts to the API's SI values, and where the server's field names land on the form.

export const SET_KINDS = ["teardown", "between_events", "build"] as const;
export type SetKind = (typeof SET_KINDS)[number];
export const FIRST_CHAMBER_FIELDS = 2;
export const CHAMBER_FIELDS_MAX = 10;

export interface CylinderDraft {
  cylinderNo: number;
  chamber: string[];
  flat: string;
  squishA: string;
  squishB: string;
  cranking: string;
  leak: string;
  notes: string;
}

export interface ReadingDraft {
  takenOn: string;
  setKind: SetKind;
  elevation: string;
  airTemp: string;
  methodNotes: string;
  isBaseline: boolean;
  cylinders: CylinderDraft[];
}

/** Form keys: "takenOn", "elevation", "cyl-1-chamber-0", "cyl-2-squishA"… */
export type FormErrors = Record<string, string>;

type CylinderText = "flat" | "squishA" | "squishB" | "cranking" | "leak";
const CYLINDER_KIND: Record<CylinderText, QuantityKind> = { flat: "volume", squishA: "squish", squishB: "squish", cranking: "pressure", leak: "percent" };

export function createDraft(opts: { cylinders: number; today: string; shopElevationM: number | null; units: UnitChoice; baseline: boolean }): ReadingDraft {
  return {
    takenOn: opts.today,
    setKind: opts.baseline ? "build" : "between_events",
    elevation: opts.shopElevationM === null ? "" : formatForUnits("elevation", opts.shopElevationM, opts.units),
    airTemp: "",
    methodNotes: "",
    isBaseline: opts.baseline,
    cylinders: Array.from({ length: opts.cylinders }, (_, i) => ({
      cylinderNo: i + 1,
      chamber: Array.from({ length: FIRST_CHAMBER_FIELDS }, () => ""),
      flat: "",
      squishA: "",
      squishB: "",
      cranking: "",
      leak: "",
      notes: "",
    })),
  };
}

/** True once anything was typed that the first draft did not hold. */
export function isDraftChanged(draft: ReadingDraft, first: ReadingDraft): boolean {
  const strip = (d: ReadingDraft): string =>
    JSON.stringify({ ...d, cylinders: d.cylinders.map((c) => ({ ...c, chamber: c.chamber.filter((v) => v.trim() !== "") })) });
  return strip(draft) !== strip(first);
}

export function hasCylinderInput(c: CylinderDraft): boolean {
  return c.chamber.some((v) => v.trim() !== "") || [c.flat, c.squishA, c.squishB, c.cranking, c.leak].some((v) => v.trim() !== "");
}

function readNumber(text: string, kind: QuantityKind, units: UnitChoice, key: string, errors: FormErrors): number | null {
  const value = parseTypedNumber(text);
  if (value === undefined) return null;
  if (!Number.isFinite(value)) {
    errors[key] = "Enter a number, such as 23.6.";
    return null;
  }
  const si = convertToSi(kind, value, units);
  // A dead cylinder reads 0 on the gauge, and a perfect seal 0 % leak-down; volumes and gaps cannot.
  const allowZero = kind === "pressure" || kind === "percent";
  if (allowZero ? si < 0 : si <= 0) {
    errors[key] = allowZero ? "Enter zero or more." : "Enter a value greater than zero.";
    return null;
  }
  return si;
}

/** One cylinder's typed readings in SI; fields that do not read as numbers are named in `errors`. */
export function readCylinder(c: CylinderDraft, units: UnitChoice, errors: FormErrors): FigureCylinder {
  const key = (f: string): string => `cyl-${c.cylinderNo}-${f}`;
  const chamber: number[] = [];
  c.chamber.forEach((text, i) => {
    const v = readNumber(text, "volume", units, key(`chamber-${i}`), errors);
    if (v !== null) chamber.push(v);
  });
  const read = (f: CylinderText): number | null => readNumber(c[f], CYLINDER_KIND[f], units, key(f), errors);
  const out: FigureCylinder = {
    cylinderNo: c.cylinderNo,
    chamberReadingsCc: chamber,
    flatPlateCc: read("flat"),
    squishAMm: read("squishA"),
    squishBMm: read("squishB"),
    crankingKpa: read("cranking"),
    leakdownPct: read("leak"),
  };
  if (out.leakdownPct !== null && out.leakdownPct > 100) errors[key("leak")] = "Leak-down is at most 100 %.";
  if ((out.squishAMm === null) !== (out.squishBMm === null) && !errors[key("squishA")] && !errors[key("squishB")]) {
    errors[key(out.squishAMm === null ? "squishA" : "squishB")] = "Read squish on both sides of the pin axis.";
  }
  return out;
}

export interface ReadingRequest {
  body: Record<string, unknown>;
  /** For each cylinder sent, its number: the server names fields by their place in the list. */
  sentCylinders: number[];
}

/** The one POST body of the set, or the errors that keep it from being sent. */
export function buildRequest(draft: ReadingDraft, units: UnitChoice, engineId: number, uploadIds: number[]): { request: ReadingRequest | null; errors: FormErrors } {
  const errors: FormErrors = {};
  if (!/^\d{4}-\d{2}-\d{2}$/.test(draft.takenOn)) errors.takenOn = "Enter the day the readings were taken.";
  const elevation = readSigned(draft.elevation, "elevation", units, "elevation", errors);
  const airTemp = readSigned(draft.airTemp, "temperature", units, "airTemp", errors);
  const entered = draft.cylinders.filter(hasCylinderInput);
  const cylinders = entered.map((c) => ({ draft: c, read: readCylinder(c, units, errors) }));
  if (entered.length === 0) errors.form = "Enter the readings of at least one cylinder.";
  if (Object.keys(errors).length) return { request: null, errors };
  const body: Record<string, unknown> = {
    engineId,
    takenOn: draft.takenOn,
    setKind: draft.setKind,
    ...(elevation !== null ? { elevationM: Math.round(elevation) } : {}),
    airTempC: airTemp === null ? null : Math.round(airTemp * 10) / 10,
    methodNotes: draft.methodNotes.trim() || null,
    isBaseline: draft.isBaseline,
    cylinders: cylinders.map(({ draft: d, read: r }) => ({
      cylinderNo: r.cylinderNo,
      chamberReadingsCc: r.chamberReadingsCc,
      flatPlateCc: r.flatPlateCc,
      squishAMm: r.squishAMm,
      squishBMm: r.squishBMm,
      crankingKpa: r.crankingKpa,
      leakdownPct: r.leakdownPct,
      notes: d.notes.trim() || null,
    })),
    ...(uploadIds.length ? { uploadIds } : {}),
  };
  return { request: { body, sentCylinders: cylinders.map((c) => c.read.cylinderNo) }, errors };
}

function readSigned(text: string, kind: QuantityKind, units: UnitChoice, key: string, errors: FormErrors): number | null {
  const value = parseTypedNumber(text);
  if (value === undefined) return null;
  if (!Number.isFinite(value)) {
    errors[key] = "Enter a number.";
    return null;
  }
  return convertToSi(kind, value, units);
}

const SERVER_FIELD: Record<string, string> = {
  chamberReadingsCc: "chamber",
  flatPlateCc: "flat",
  squishAMm: "squishA",
  squishBMm: "squishB",
  crankingKpa: "cranking",
  leakdownPct: "leak",
  notes: "notes",
  cylinderNo: "block",
};

/** Server field names ("cylinders.1.squishAMm", "elevationM") onto the form's keys. */
export function mapServerFields(fields: Record<string, string>, sentCylinders: number[]): FormErrors {
  const out: FormErrors = {};
  for (const [name, message] of Object.entries(fields)) {
    const m = /^cylinders\.(\d+)\.(\w+)(?:\.(\d+))?$/.exec(name);
    if (m) {
      const cyl = sentCylinders[Number(m[1])];
      const field = SERVER_FIELD[m[2]] ?? "block";
      out[cyl === undefined ? "form" : `cyl-${cyl}-${field}${field === "chamber" ? `-${m[3] ?? 0}` : ""}`] = message;
      continue;
    }
    const key = name === "elevationM" ? "elevation" : name === "airTempC" ? "airTemp" : name === "uploadIds" ? "photos" : ["takenOn", "setKind", "methodNotes", "isBaseline"].includes(name) ? name : "form";
    out[key] = out[key] ? `${out[key]} ${message}` : message;
  }
  return out;
}

/** The typed text follows a change of units, so 23.6 cc becomes 1.44015 in³ and back. */
export function changeDraftUnits(draft: ReadingDraft, from: UnitChoice, to: UnitChoice): ReadingDraft {
  const conv = (text: string, kind: QuantityKind): string => convertTypedValue(text, kind, from, to);
  return {
    ...draft,
    elevation: conv(draft.elevation, "elevation"),
    airTemp: conv(draft.airTemp, "temperature"),
    cylinders: draft.cylinders.map((c) => ({
      ...c,
      chamber: c.chamber.map((v) => conv(v, "volume")),
      flat: conv(c.flat, "volume"),
      squishA: conv(c.squishA, "squish"),
      squishB: conv(c.squishB, "squish"),
      cranking: conv(c.cranking, "pressure"),
    })),
  };
}
