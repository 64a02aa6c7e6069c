import fc from "fast-check";
import { readFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { z, type ZodType } from "zod";
import { expect } from "vitest";
import type { Knex } from "knex";
import type { RouteEntry } from "../../scripts/lib/route-table.ts";

// Generators and checks for the bad-input sweep: bodies that JSON.stringify cannot write (raw
// tokens such as -0 and 1e309), the schema each route parses with (read from the route's own
// source, so the sweep follows the code), and the rules every answer must keep.

/** Text placed into a body as is: numbers JSON.stringify would rewrite, or tokens that are not JSON. */
export class Raw {
  constructor(readonly text: string) {}
}

export function toJsonText(v: unknown): string {
  if (v instanceof Raw) return v.text;
  if (Array.isArray(v)) return `[${v.map(toJsonText).join(",")}]`;
  if (v !== null && typeof v === "object") {
    return `{${Object.entries(v as Record<string, unknown>).map(([k, x]) => `${JSON.stringify(k)}:${toJsonText(x)}`).join(",")}}`;
  }
  return JSON.stringify(v) ?? "null";
}

const deepObject = (depth: number): Raw => new Raw('{"a":'.repeat(depth) + "1" + "}".repeat(depth));
const deepArray = (depth: number): Raw => new Raw("[".repeat(depth) + "]".repeat(depth));
const MEGABYTE_ASCII = new Raw(JSON.stringify("x".repeat(1024 * 1024)));
const MEGABYTE_WIDE = new Raw(JSON.stringify("é🔧".repeat(180_000))); // about 1 MB of 2- and 4-byte characters

/** Numbers at the edges: −0, overflow to ±Infinity when parsed, underflow, past 2^53, past INT columns. */
const edgeNumber = fc.constantFrom<unknown>(
  new Raw("-0"),
  new Raw("-0.0"),
  new Raw("1e309"),
  new Raw("-1e309"),
  new Raw("1e-400"),
  new Raw("123456789012345678901234567890"),
  1e308,
  -1e308,
  Number.MAX_SAFE_INTEGER,
  Number.MAX_SAFE_INTEGER + 2,
  2 ** 31,
  2 ** 32 + 1,
  -(2 ** 31) - 1,
  5e-324,
  0.1 + 0.2,
  -1,
  0,
  1,
);

const edgeText = fc.constantFrom<unknown>(
  "NaN",
  "Infinity",
  "-Infinity",
  "-0",
  "1e309",
  "",
  "   ",
  "0x1F",
  "１２",
  "null",
  "true",
  "2027-02-30",
  "0000-00-00",
  "9999-12-31",
  "2026-13-01T25:61:00Z",
  "\u0000",
  "\ud800",
  "😀".repeat(300),
  "a".repeat(5000),
  "<script>alert(1)</script>",
  "' OR 1=1 --",
  "../../etc/passwd",
);

/** Text that is not JSON at all, placed where a value goes: the whole body becomes unreadable. */
const notJson = fc.constantFrom(new Raw("NaN"), new Raw("Infinity"), new Raw("-Infinity"), new Raw("undefined"), new Raw("01"), new Raw(".5"), new Raw("+1"), new Raw("'x'"));

const leaf: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 4, arbitrary: edgeNumber },
  { weight: 4, arbitrary: edgeText },
  { weight: 2, arbitrary: fc.double({ noNaN: true, noDefaultInfinity: true }) },
  { weight: 1, arbitrary: fc.integer() },
  { weight: 2, arbitrary: fc.boolean() },
  { weight: 2, arbitrary: fc.constant(null) },
  { weight: 2, arbitrary: fc.string({ unit: "binary", maxLength: 30 }) },
);

/** Any value a malformed field might carry, from plain wrong types to 1 MB strings and depth-50 objects. */
export const wildValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 12, arbitrary: leaf },
  { weight: 2, arbitrary: fc.array(leaf, { maxLength: 4 }) },
  { weight: 2, arbitrary: fc.dictionary(fc.string({ maxLength: 8 }), leaf, { maxKeys: 3 }) },
  { weight: 1, arbitrary: fc.constant(deepObject(50)) },
  { weight: 1, arbitrary: fc.constant(deepArray(50)) },
  { weight: 1, arbitrary: fc.constantFrom(MEGABYTE_ASCII, MEGABYTE_WIDE) },
  { weight: 1, arbitrary: notJson },
);

const UNKNOWN_KEYS = ["zzUnknown", "__proto__", "constructor", "", " engineId", "ENGINEID", "a.b", "cylinders[0]"];

/** Whole bodies: objects of the route's own field names (and strangers) with wild values, or no object at all. */
export function bodyArbitrary(fieldNames: string[]): fc.Arbitrary<unknown> {
  const keys = fieldNames.length ? fieldNames : ["name"];
  const member = fc.tuple(fc.oneof({ weight: 6, arbitrary: fc.constantFrom(...keys) }, { weight: 1, arbitrary: fc.constantFrom(...UNKNOWN_KEYS) }), wildValue);
  const object = fc.array(member, { minLength: 1, maxLength: 6 }).map((pairs) => {
    const o: Record<string, unknown> = {};
    for (const [k, v] of pairs) Object.defineProperty(o, k, { value: v, enumerable: true, writable: true, configurable: true });
    return o;
  });
  return fc.oneof(
    { weight: 8, arbitrary: object },
    { weight: 1, arbitrary: leaf },
    { weight: 1, arbitrary: fc.array(object, { minLength: 1, maxLength: 2 }) },
    { weight: 1, arbitrary: fc.constantFrom(deepObject(50), deepArray(50), deepArray(5000), MEGABYTE_ASCII) },
    { weight: 1, arbitrary: fc.constantFrom(new Raw("{"), new Raw('{"a":}'), new Raw("{'a':1}"), new Raw('{"a":1}{"b":2}'), new Raw("[1,]"), new Raw('{"a":1,}'), new Raw("\u0000")) },
  );
}

/** Query strings for routes that read their input from the URL. */
export function queryArbitrary(fieldNames: string[]): fc.Arbitrary<Record<string, string>> {
  const text = fc.oneof(
    edgeText.map(String),
    edgeNumber.map((n) => (n instanceof Raw ? n.text : String(n))),
    fc.string({ unit: "binary", maxLength: 20 }),
    fc.constant("9".repeat(400)),
  );
  return fc.dictionary(fc.constantFrom(...fieldNames, "zzUnknown"), text, { minKeys: 1, maxKeys: 3 });
}

// ---- the schema a route parses with -------------------------------------------------------------

function balancedCall(src: string, from: number): string {
  let depth = 0;
  for (let i = from; i < src.length; i += 1) {
    if (src[i] === "(") depth += 1;
    if (src[i] === ")") {
      depth -= 1;
      if (depth === 0) return src.slice(from, i + 1);
    }
  }
  throw new Error("unbalanced input expression");
}

/**
 * The zod schema of `input:` in a route's `defineApi` for one method, or null when it has none.
 * A named schema is imported from where the route imports it; an inline `z.…` one, or one the
 * route file defines itself from z alone, is rebuilt.
 */
export async function schemaOfRoute(root: string, e: RouteEntry): Promise<ZodType | null> {
  const file = join(root, e.file);
  const src = readFileSync(file, "utf8");
  const start = src.indexOf(`export const ${e.method} = defineApi(`);
  if (start < 0) return null;
  const next = src.indexOf("export const ", start + 10);
  const block = src.slice(start, next < 0 ? undefined : next);
  const inputAt = block.search(/\binput:\s*/);
  if (inputAt < 0) return null;
  const expr = block.slice(inputAt).replace(/^input:\s*/, "");
  if (expr.startsWith("z.")) {
    const open = expr.indexOf("(");
    const call = expr.slice(0, open) + balancedCall(expr, open);
    return new Function("z", `return ${call};`)(z) as ZodType;
  }
  const name = /^[A-Za-z_][A-Za-z0-9_]*/.exec(expr)![0];
  const local = new RegExp(`\\nconst ${name} = (z\\.[A-Za-z]+)\\(`).exec(src);
  if (local) {
    const open = local.index + local[0].length - 1;
    return new Function("z", `return ${local[1]}${balancedCall(src, open)};`)(z) as ZodType;
  }
  const imp = new RegExp(`import\\s*\\{[^}]*\\b${name}\\b[^}]*\\}\\s*from\\s*"([^"]+)"`).exec(src);
  if (!imp) throw new Error(`${e.file}: cannot find where ${name} comes from`);
  const mod = (await import(pathToFileURL(resolve(dirname(file), imp[1])).href)) as Record<string, ZodType>;
  return mod[name];
}

/** The top-level field names a schema knows (objects, unions, pipes, refinements). */
export function fieldNamesOf(schema: ZodType): string[] {
  const def = (schema as unknown as { _zod: { def: Record<string, unknown> } })._zod.def;
  if (def.shape) return Object.keys(def.shape as object);
  const names = new Set<string>();
  for (const key of ["options", "in", "out", "innerType", "schema", "left", "right"]) {
    const inner = def[key];
    for (const s of Array.isArray(inner) ? inner : inner ? [inner] : []) {
      if ((s as { _zod?: unknown })._zod) for (const n of fieldNamesOf(s as ZodType)) names.add(n);
    }
  }
  return [...names];
}

/** What the server's JSON.parse would make of a body text (undefined: not JSON). */
export function parseLikeServer(text: string): unknown {
  if (text.trim() === "") return {};
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

// ---- the rules of every answer -------------------------------------------------------------------

const BARE_TOKEN = /[:[,]\s*-?(NaN|Infinity)\b/;

function walkNumbers(v: unknown, path: string, out: string[]): void {
  if (typeof v === "number" && !Number.isFinite(v)) out.push(path);
  else if (typeof v === "string" && /^-?(NaN|Infinity)$|\bNaN\b/.test(v)) out.push(`${path} = ${JSON.stringify(v.slice(0, 40))}`);
  else if (Array.isArray(v)) v.forEach((x, i) => walkNumbers(x, `${path}[${i}]`, out));
  else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) walkNumbers(x, `${path}.${k}`, out);
}

export interface Answer {
  status: number;
  type: string;
  text: string;
}

const tally = { sent: 0, refused: 0 };
/** How many requests this file sent, and how many were refused with a 4xx. */
export function sentSoFar(): { sent: number; refused: number } {
  return { ...tally };
}

export async function send(base: string, cookie: string, method: string, path: string, body?: string, contentType = "application/json"): Promise<Answer> {
  tally.sent += 1;
  const headers: Record<string, string> = { origin: new URL(base).origin };
  if (cookie) headers.cookie = cookie;
  if (body !== undefined) headers["content-type"] = contentType;
  const res = await fetch(base + path, { method, headers, body, redirect: "manual" });
  if (res.status >= 400 && res.status < 500) tally.refused += 1;
  return { status: res.status, type: res.headers.get("content-type") ?? "", text: await res.text() };
}

/** Never a 5xx; an error always in the one shape; never NaN or Infinity anywhere in JSON. */
export function expectWellFormed(a: Answer, what: string): void {
  expect(a.status, `${what}: ${a.text.slice(0, 300)}`).toBeLessThan(500);
  if (!a.type.includes("json")) {
    expect(a.status, `${what}: a non-JSON answer must be a success`).toBeLessThan(400);
    return;
  }
  expect(BARE_TOKEN.test(a.text), `${what}: bare NaN/Infinity in ${a.text.slice(0, 300)}`).toBe(false);
  const body = JSON.parse(a.text) as { error?: { code?: unknown; message?: unknown } };
  const bad: string[] = [];
  walkNumbers(body, "$", bad);
  expect(bad, `${what}: NaN/Infinity in the answer`).toEqual([]);
  if (a.status >= 400) {
    expect(typeof body.error?.code, `${what}: error shape of ${a.text.slice(0, 200)}`).toBe("string");
    expect(typeof body.error?.message, `${what}: error shape of ${a.text.slice(0, 200)}`).toBe("string");
  }
}

// ---- rows ------------------------------------------------------------------------------------------

/** Tables every request may touch: sessions slide, sign-in failures are counted. */
export const VOLATILE_TABLES = new Set(["sessions", "sign_in_attempts"]);

export async function checksumAll(k: Knex): Promise<Map<string, string>> {
  const [rows] = (await k.raw("SHOW TABLES")) as [Record<string, string>[]];
  const names = rows.map((r) => Object.values(r)[0]).filter((t) => !VOLATILE_TABLES.has(t));
  const [sums] = (await k.raw(`CHECKSUM TABLE ${names.map((n) => `\`${n}\``).join(", ")}`)) as [{ Table: string; Checksum: string | number }[]];
  return new Map(sums.map((s) => [s.Table.split(".").pop()!, String(s.Checksum)]));
}

export function changedTables(before: Map<string, string>, after: Map<string, string>): string[] {
  return [...after].filter(([t, sum]) => before.get(t) !== sum).map(([t]) => t);
}
