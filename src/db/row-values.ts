// Small conversions between MariaDB rows and API values, shared by the motors repositories.

/** DATETIME/TIMESTAMP → ISO string in UTC; null stays null. */
export function toIso(value: Date | string | null | undefined): string | null {
  if (value === null || value === undefined) return null;
  const d = value instanceof Date ? value : new Date(value);
  return Number.isNaN(d.getTime()) ? null : d.toISOString();
}

/** DECIMAL columns arrive as numbers (decimalNumbers), but a raw aggregate may still be a string. */
export function toNumber(value: unknown): number {
  if (typeof value === "number") return value;
  if (typeof value === "string" && value.trim() !== "") return Number(value);
  return 0;
}

export function toNumberOrNull(value: unknown): number | null {
  if (value === null || value === undefined) return null;
  const n = toNumber(value);
  return Number.isFinite(n) ? n : null;
}

/** JSON columns are LONGTEXT in MariaDB and come back as text. */
export function parseJsonArray(value: unknown): number[] {
  const parsed = typeof value === "string" ? (JSON.parse(value) as unknown) : value;
  return Array.isArray(parsed) ? parsed.filter((v): v is number => typeof v === "number" && Number.isFinite(v)) : [];
}

/** Rounds to the scale of a DECIMAL column so the database never truncates silently. */
export function roundTo(value: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(value * f) / f;
}

export function roundOrNull(value: number | null | undefined, decimals: number): number | null {
  return value === null || value === undefined ? null : roundTo(value, decimals);
}

/** Escapes LIKE wildcards in a search term. */
export function likeTerm(search: string): string {
  return `%${search.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

export function isDuplicateKey(err: unknown): boolean {
  return (err as { code?: string } | null)?.code === "ER_DUP_ENTRY";
}
