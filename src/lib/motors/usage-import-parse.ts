// Reading the cells of an imported usage file: pure, so a form can check a file before sending it.

export type DateFormat = "iso" | "mdy" | "dmy";

export interface ImportMapping {
  engine: string;
  date: string;
  amount: string;
  session?: string | null;
  event?: string | null;
  notes?: string | null;
}

const GUESSES: Record<keyof ImportMapping, string[]> = {
  engine: ["engine", "motor", "engine name", "engine serial", "serial"],
  date: ["date", "day", "occurred on", "occurred_on", "when"],
  amount: ["hours", "amount", "usage", "duration", "km", "kilometres", "laps", "litres", "fuel"],
  session: ["session", "session label"],
  event: ["event", "venue", "event label"],
  notes: ["notes", "note", "comment", "comments"],
};

export function guessMapping(columns: string[]): ImportMapping | null {
  const find = (names: string[]): string | null => columns.find((c) => names.includes(c.trim().toLowerCase())) ?? null;
  const engine = find(GUESSES.engine);
  const date = find(GUESSES.date);
  const amount = find(GUESSES.amount);
  if (!engine || !date || !amount) return null;
  return { engine, date, amount, session: find(GUESSES.session), event: find(GUESSES.event), notes: find(GUESSES.notes) };
}

function isRealDate(y: number, m: number, d: number): boolean {
  const dt = new Date(Date.UTC(y, m - 1, d));
  return y >= 1900 && y <= 2200 && dt.getUTCFullYear() === y && dt.getUTCMonth() === m - 1 && dt.getUTCDate() === d;
}

/** A date cell in the chosen format, as YYYY-MM-DD; null when it is not a real date. */
export function parseDateCell(raw: string, format: DateFormat): string | null {
  const s = raw.trim();
  let y: number, m: number, d: number;
  if (format === "iso") {
    const match = /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})$/.exec(s);
    if (!match) return null;
    [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  } else {
    const match = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})$/.exec(s);
    if (!match) return null;
    const [a, b] = [Number(match[1]), Number(match[2])];
    [y, m, d] = format === "mdy" ? [Number(match[3]), a, b] : [Number(match[3]), b, a];
  }
  if (!isRealDate(y, m, d)) return null;
  return `${y}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
}

/** "1.5", "1,5" and " 1.50 " are all one and a half. */
export function parseAmountCell(raw: string): number | null {
  const s = raw.trim().replace(/\s+/g, "");
  const normal = /^\d+,\d+$/.test(s) ? s.replace(",", ".") : s;
  if (!/^\d+(\.\d+)?$/.test(normal)) return null;
  return Number(normal);
}

export function normaliseLabel(value: string | null): string {
  return (value ?? "").trim().replace(/\s+/g, " ").toLowerCase();
}

